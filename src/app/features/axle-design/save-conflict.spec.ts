import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { AxleDesignStore, type SaveConflict as Conflict } from './axle-design-store';
import { renderComponent } from '../../../testing/render';
import { SaveConflict } from './save-conflict';

const CONFLICT: Conflict = {
  theirs: { id: 'd1', vehicleId: 'v1', axle: 'front', name: 'Front', revision: 5, status: 'draft', corner: exampleCorners.fsFrontWishbone, updatedAt: '', updatedByName: 'Oskar Brandt' },
  rows: [
    { key: 'points.tieRodInner', name: 'Tie rod, inner end (rack)', kind: 'length', theirs: [25.4, 254, 127], yours: [25.4, 254, 152.4] },
    { key: 'wheel.radius', name: 'Wheel, loaded radius', kind: 'length', theirs: [254], yours: [266.7] },
    { key: 'steering.rackAxis', name: 'Steering rack, axis (x, y, z)', kind: 'direction', theirs: [0, 1, 0], yours: [0.1, 1, 0] },
    { key: 'steered', name: 'Steering', kind: 'choice', theirs: 'steered', yours: 'fixed toe link' },
    // 1751.26835 N/mm is 10 000 lbf/in and 350.2536707 N/mm 2000 lbf/in (1 lbf = 4.4482216152605 N, 1 in = 25.4 mm; NIST SP 811).
    { key: 'bushings.lowerFront', name: 'Bushings, Lower arm, front pivot (radial, axial)', kind: 'rate', theirs: undefined, yours: [1751.26835, 350.2536707] },
  ],
};

function render(units: DisplayUnits): HTMLElement {
  TestBed.configureTestingModule({
    providers: [
      { provide: DISPLAY_UNITS, useValue: signal(units) },
      { provide: AxleDesignStore, useValue: { conflict: signal(CONFLICT), saving: signal(false), takeTheirs: () => undefined } },
    ],
  });
  return renderComponent(SaveConflict, { baseRevision: 4 }).nativeElement as HTMLElement;
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
      // A choice in words; a rate left out is rigid, a rate in lbf/in.
      ['Steering', 'steered', 'fixed toe link'],
      ['Bushings, Lower arm, front pivot (radial, axial)', 'rigid', '10000, 2000 lbf/in'],
    ]);
  });

  it('writes millimetres for an SI user', () => {
    const el = render('si');
    expect(el.querySelector('caption')!.textContent).toBe('Points and settings that differ (lengths in mm)');
    expect(cells(el)[1]).toEqual(['Wheel, loaded radius', '254', '266.7']);
    expect(cells(el)[4]).toEqual(['Bushings, Lower arm, front pivot (radial, axial)', 'rigid', '1751.2684, 350.25367 N/mm']);
  });
});
