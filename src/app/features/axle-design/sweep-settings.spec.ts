import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { SweepSettings, type TravelRange } from './sweep-settings';

function setUp(units: DisplayUnits) {
  TestBed.configureTestingModule({ providers: [{ provide: DISPLAY_UNITS, useValue: signal(units) }] });
  const fixture = TestBed.createComponent(SweepSettings);
  fixture.componentRef.setInput('range', { from: -25, to: 25, step: 2.5 });
  fixture.detectChanges();
  const emitted: TravelRange[] = [];
  fixture.componentInstance.rangeChange.subscribe((r) => emitted.push(r));
  const el = fixture.nativeElement as HTMLElement;
  const field = (key: string) => el.querySelector<HTMLInputElement>(`input[data-sweep="${key}"]`)!;
  const type = (key: string, value: string) => {
    field(key).value = value;
    field(key).dispatchEvent(new Event('change'));
    fixture.detectChanges();
  };
  return { el, field, type, emitted };
}

describe('SweepSettings', () => {
  it('takes the range in mm for an SI user and emits it only when usable', () => {
    const { el, field, type, emitted } = setUp('si');
    expect(el.querySelector('legend')!.textContent).toBe('Travel range of the curves (mm)');
    expect(field('from').value).toBe('-25');
    type('to', '-30');
    expect(emitted).toEqual([]);
    expect(el.querySelector('[role="alert"]')!.textContent).toContain('"from" below "to"');
    type('to', '40');
    expect(emitted).toEqual([{ from: -25, to: 40, step: 2.5 }]);
  });

  it('shows and takes the range in inches for an inch-pound user, storing mm', () => {
    const { el, field, type, emitted } = setUp('imperial');
    expect(el.querySelector('legend')!.textContent).toBe('Travel range of the curves (in)');
    // 25 mm = 0.9843 in (1 in = 25.4 mm exactly, NIST SP 811), to the length's 4 significant figures.
    expect(field('from').value).toBe('-0.9843');
    type('to', '2');
    expect(emitted).toHaveLength(1);
    // The untouched ends keep their stored mm exactly; the typed one is 2 × 25.4 mm.
    expect(emitted[0]!.from).toBe(-25);
    expect(emitted[0]!.to).toBeCloseTo(50.8, 9);
  });
});
