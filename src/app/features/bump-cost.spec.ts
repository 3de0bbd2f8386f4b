import { TestBed } from '@angular/core/testing';
import { exampleCorners } from '../../../shared/kinematics/examples';
import { exampleVehicles } from '../../../shared/balance/examples';
import { resolveTrackProfile } from '../../../shared/tracks/profiles';
import { bumpCost } from '../../../shared/ride/cost';
import { BumpCostView } from './bump-cost';
import { signal } from '@angular/core';
import type { DisplayUnits } from '../core/api-types';
import { DISPLAY_UNITS } from '../core/format/num-pipe';

const units = signal<DisplayUnits>('si');

function render(cost: ReturnType<typeof bumpCost> | null, unavailable: string | null = null) {
  TestBed.configureTestingModule({ providers: [{ provide: DISPLAY_UNITS, useValue: units }] });
  const fixture = TestBed.createComponent(BumpCostView);
  fixture.componentRef.setInput('cost', cost);
  fixture.componentRef.setInput('unavailable', unavailable);
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}

describe('BumpCostView', () => {
  beforeEach(() => units.set('si'));

  it('writes the bump, the drift and the wheel travel in inch/pound units when the user reads inch/pound', () => {
    units.set('imperial');
    const cost = bumpCost(exampleVehicles.tur26Ember, 'front', exampleCorners.fsFrontWishbone, resolveTrackProfile('bumpy-circuit'));
    const el = render(cost);
    const heading = el.querySelector('[data-testid="bump-cost-heading"]')!.closest('div')!.textContent;
    // 1 in = 25.4 mm exactly; lengths to 4 significant figures (core/format/quantities.ts).
    expect(heading).toContain(`${Number((cost.bumpHeightMm / 25.4).toPrecision(4))} in ×`);
    expect(heading).toContain(`${Number(((1000 * cost.driftM!) / 25.4).toPrecision(4))} in of drift`);
    expect(el.textContent).toContain(`Wheel travel ${Number((cost.wheelTravelRmsMm / 25.4).toPrecision(4))} in RMS`);
    expect(el.textContent).not.toMatch(/\d mm\b/);
  });

  it('shows the real bump cost of the example front wishbone with the road class and speed in words', () => {
    // The shared engine's own figures (shared/ride): the view only lays them out.
    const cost = bumpCost(exampleVehicles.tur26Ember, 'front', exampleCorners.fsFrontWishbone, resolveTrackProfile('bumpy-circuit'));
    const el = render(cost);
    expect(el.querySelector('[data-testid="bump-cost-road"]')!.textContent).toContain('good road (ISO 8608 class B) at 80 km/h');
    const yaw = el.querySelector('[data-testid="bump-cost-yaw"]')!.textContent;
    expect(yaw).toContain(cost.yawRateRmsDegPerS!.toFixed(3));
    expect(yaw).toContain(`${cost.cornerRadiusM} m corner`);
    expect(el.querySelector('[data-testid="bump-cost-heading"]')!.textContent).toContain(cost.headingChangeDeg!.toFixed(3));
    expect(el.querySelector('[data-testid="bump-cost-landing"]')).toBeNull();
  });

  it('says what is missing when there is no bump cost', () => {
    const el = render(null, 'vehicle.front.tyre.verticalRateNPerMm: required by the ride model');
    // Named by the vehicle page's label, never by the document key.
    const text = el.querySelector('[data-testid="bump-cost-none"]')!.textContent;
    expect(text).toContain('tyre vertical rate');
    expect(text).not.toContain('verticalRateNPerMm');
  });
});
