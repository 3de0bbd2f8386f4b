import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA } from '@angular/material/dialog';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import type { LatestPreviewAnswer } from './configurations-api';
import { LatestPreviewDialog } from './latest-preview-dialog';

const REFS = { vehicleId: 'v', vehicleRevision: 1, frontDesignId: 'f', frontDesignRevision: 1, rearDesignId: 'r', rearDesignRevision: 3, trackProfile: 'smooth-circuit' as const };

function open(preview: LatestPreviewAnswer, units: DisplayUnits = 'si') {
  TestBed.configureTestingModule({
    providers: [
      { provide: MAT_DIALOG_DATA, useValue: { configurationName: 'Ember baseline', preview } },
      { provide: DISPLAY_UNITS, useValue: signal(units) },
    ],
  });
  const fixture = TestBed.createComponent(LatestPreviewDialog);
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}
const cells = (root: HTMLElement, id: string) => [...root.querySelectorAll(`[data-testid="${id}"] tbody tr`)].map((r) => [...r.children].map((c) => c.textContent.trim()));

const MOVED: LatestPreviewAnswer = {
  engineVersion: '1.0.0',
  revision: 2,
  current: REFS,
  latest: { ...REFS, rearDesignRevision: 4 },
  changedRefs: [{ ref: 'rearDesignRevision', from: 3, to: 4 }],
  upToDate: false,
  inputs: [{ path: 'rearCorner.points.tieRodInner[2]', a: 141.5, b: 145.5, change: 4 }],
  results: [
    { path: 'balance.understeerBudget.total', a: 0.2512, b: 0.2398, change: -0.0114 },
    { path: 'balance.rollMomentBalance.relativeError', a: 1.2e-9, b: 3.4e-9, change: 2.2e-9 },
    { path: 'bumpSteer.rear.bumpSteerDegPerM', a: 2.152274613638189, b: -13.082313992117802, change: -15.234588605755991 },
  ],
};

describe('LatestPreviewDialog', () => {
  it('lists the revisions that move and each changed input and result, labelled, rounded per quantity, grouped by kind, with units', () => {
    const root = open(MOVED);
    expect(root.querySelector('[data-testid="changed-refs"]')!.textContent).toContain('Rear axle design: revision 3 → 4');
    expect(cells(root, 'changed-inputs')).toEqual([['Rear corner'], ['Rear corner · tie rod inner · z', '141.5', '145.5', '+4', 'mm']]);
    // Understeer gradient to 3 significant figures, bump steer likewise (core/format/quantities.ts); a true minus sign.
    expect(cells(root, 'changed-results')).toEqual([
      ['Balance'],
      ['Understeer gradient K', '0.251', '0.24', '−0.0114', 'deg/g'],
      ['Roll'],
      ['Roll moment balance, relative error', '1.2e-9', '3.4e-9', '+2.2e-9', ''],
      ['Bump steer and camber over the profile'],
      ['Bump steer, rear', '2.15', '−13.1', '−15.2', 'deg/m'],
    ]);
    // No raw result key anywhere.
    expect(root.textContent).not.toMatch(/[a-z]+\.[a-z]+[A-Z]|relativeError|DegPerM/);
    const buttons = [...root.querySelectorAll('button')].map((b) => b.textContent.trim());
    expect(buttons).toEqual(['Keep the current revisions', 'Save with the latest revisions']);
  });

  it('writes the changes in inch/pound units when the user reads inch/pound', () => {
    const root = open(MOVED, 'imperial');
    // 1 in = 25.4 mm exactly: 141.5 mm = 5.571 in, 4 mm = 0.1575 in; deg/m × 0.0254 = deg/in.
    expect(cells(root, 'changed-inputs')[1]).toEqual(['Rear corner · tie rod inner · z', '5.571', '5.728', '+0.1575', 'in']);
    expect(cells(root, 'changed-results')[5]).toEqual(['Bump steer, rear', '0.0547', '−0.332', '−0.387', 'deg/in']);
  });

  it('says nothing would change when the revisions are already the latest, and offers no save', () => {
    const root = open({ engineVersion: '1.0.0', revision: 2, current: REFS, latest: REFS, changedRefs: [], upToDate: true, inputs: [], results: [] });
    expect(root.textContent).toContain('already at their latest revisions');
    expect([...root.querySelectorAll('button')].map((b) => b.textContent.trim())).toEqual(['Keep the current revisions']);
  });
});
