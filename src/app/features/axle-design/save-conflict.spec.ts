import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { AxleDesignStore, type SaveConflict as Conflict } from './axle-design-store';
import { SaveConflict } from './save-conflict';

const CONFLICT: Conflict = {
  theirs: { id: 'd1', vehicleId: 'v1', axle: 'front', name: 'Front', revision: 5, status: 'draft', corner: exampleCorners.fsFrontWishbone, updatedAt: '', updatedByName: 'Oskar Brandt' },
  rows: [
    { key: 'points.tieRodInner', name: 'Tie rod, inner end (rack)', kind: 'length', theirs: [25.4, 254, 127], yours: [25.4, 254, 152.4] },
    { key: 'wheel.radius', name: 'Wheel, loaded radius', kind: 'length', theirs: [254], yours: [266.7] },
    { key: 'steering.rackAxis', name: 'Steering rack, axis (x, y, z)', kind: 'direction', theirs: [0, 1, 0], yours: [0.1, 1, 0] },
  ],
};

function render(units: DisplayUnits): HTMLElement {
  TestBed.configureTestingModule({
    providers: [
      { provide: DISPLAY_UNITS, useValue: signal(units) },
      { provide: AxleDesignStore, useValue: { conflict: signal(CONFLICT), saving: signal(false), takeTheirs: () => undefined } },
    ],
  });
  const fixture = TestBed.createComponent(SaveConflict);
  fixture.componentRef.setInput('baseRevision', 4);
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}

const cells = (el: HTMLElement) => [...el.querySelectorAll('tbody tr')].map((tr) => [...tr.children].map((c) => c.textContent.trim()));

describe('SaveConflict', () => {
  it('lists the points and the settings that differ, lengths in inches for an inch-pound user (1 in = 25.4 mm exactly, NIST SP 811)', () => {
    const el = render('imperial');
    expect(el.querySelector('caption')!.textContent).toBe('Points and settings that differ (lengths in in)');
    expect(cells(el)).toEqual([
      ['Tie rod, inner end (rack)', '1, 10, 5', '1, 10, 6'],
      ['Wheel, loaded radius', '10', '10.5'],
      // A direction has no unit: the same numbers in either system.
      ['Steering rack, axis (x, y, z)', '0, 1, 0', '0.1, 1, 0'],
    ]);
  });

  it('writes millimetres for an SI user', () => {
    const el = render('si');
    expect(el.querySelector('caption')!.textContent).toBe('Points and settings that differ (lengths in mm)');
    expect(cells(el)[1]).toEqual(['Wheel, loaded radius', '254', '266.7']);
  });
});
