import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../core/api-types';
import { DISPLAY_UNITS } from '../core/format/num-pipe';
import { exampleCorners } from '../../../shared/kinematics/examples';
import { exampleVehicles } from '../../../shared/balance/examples';
import { resolveTrackProfile } from '../../../shared/tracks/profiles';
import { bumpCost } from '../../../shared/ride/cost';
import { BumpCostView } from './bump-cost';

function render(cost: ReturnType<typeof bumpCost> | null, unavailable: string | null = null) {
  const fixture = TestBed.createComponent(BumpCostView);
  fixture.componentRef.setInput('cost', cost);
  fixture.componentRef.setInput('unavailable', unavailable);
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}

describe('BumpCostView', () => {
  it('shows the real bump cost of the example front wishbone with the road class and speed in words', () => {
    // The shared engine's own figures (shared/ride): the view only lays them out.
    const cost = bumpCost(exampleVehicles.tur26Ember, 'front', exampleCorners.fsFrontWishbone, resolveTrackProfile('bumpy-circuit'));
    const el = render(cost);
    expect(el.querySelector('[data-testid="bump-cost-road"]')!.textContent).toContain('good road (ISO 8608 class B) at 80 km/h');
    const yaw = el.querySelector('[data-testid="bump-cost-yaw"]')!.textContent!;
    expect(yaw).toContain(cost.yawRateRmsDegPerS!.toFixed(3));
    expect(yaw).toContain(`${cost.cornerRadiusM} m corner`);
    expect(el.querySelector('[data-testid="bump-cost-heading"]')!.textContent).toContain(cost.headingChangeDeg!.toFixed(3));
    expect(el.querySelector('[data-testid="bump-cost-landing"]')).toBeNull();
  });

  it('says what is missing when there is no bump cost', () => {
    const el = render(null, 'vehicle.front.tyre.verticalRateNPerMm: required by the ride model');
    const text = el.querySelector('[data-testid="bump-cost-none"]')!.textContent!;
    expect(text).toContain("the vehicle's front tyre vertical rate: required by the ride model");
    expect(text).not.toContain('verticalRateNPerMm');
  });

  it('writes lengths and distances in the user’s inch-pound units', () => {
    TestBed.overrideProvider(DISPLAY_UNITS, { useValue: signal<DisplayUnits>('imperial') });
    const cost = bumpCost(exampleVehicles.tur26Ember, 'front', exampleCorners.fsFrontWishbone, resolveTrackProfile('bumpy-circuit'));
    const el = render(cost);
    // 1 in = 25.4 mm, 1 ft = 0.3048 m exactly (NIST SP 811).
    const heading = el.querySelector('[data-testid="bump-cost-heading"]')!.closest('div')!.textContent!;
    expect(heading).toContain(`${Number((cost.bumpHeightMm / 25.4).toPrecision(4))} in ×`);
    expect(el.querySelector('[data-testid="bump-cost-yaw"]')!.textContent).toContain(`${Number((cost.cornerRadiusM / 0.3048).toPrecision(3))} ft corner`);
    expect(el.textContent).not.toMatch(/\d mm\b/);
  });
});
