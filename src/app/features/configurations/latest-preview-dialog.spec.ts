import { TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA } from '@angular/material/dialog';
import type { LatestPreviewAnswer } from './configurations-api';
import { LatestPreviewDialog } from './latest-preview-dialog';

const REFS = { vehicleId: 'v', vehicleRevision: 1, frontDesignId: 'f', frontDesignRevision: 1, rearDesignId: 'r', rearDesignRevision: 3, trackProfile: 'smooth-circuit' as const };

function open(preview: LatestPreviewAnswer) {
  TestBed.configureTestingModule({ providers: [{ provide: MAT_DIALOG_DATA, useValue: { configurationName: 'Ember baseline', preview } }] });
  const fixture = TestBed.createComponent(LatestPreviewDialog);
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}
const cells = (root: HTMLElement, id: string) => [...root.querySelectorAll(`[data-testid="${id}"] tbody tr`)].map((r) => [...r.children].map((c) => c.textContent!.trim()));

describe('LatestPreviewDialog', () => {
  it('lists the revisions that move and each changed input and key result, old → new with its unit', () => {
    const root = open({
      engineVersion: '1.0.0',
      revision: 2,
      current: REFS,
      latest: { ...REFS, rearDesignRevision: 4 },
      changedRefs: [{ ref: 'rearDesignRevision', from: 3, to: 4 }],
      upToDate: false,
      inputs: [{ path: 'rearCorner.points.tieRodInner[2]', a: 141.5, b: 145.5, change: 4 }],
      results: [{ path: 'balance.understeerBudget.total', a: 0.2512, b: 0.2398, change: -0.0114 }],
    });
    expect(root.querySelector('[data-testid="changed-refs"]')!.textContent).toContain('Rear axle design: revision 3 → 4');
    expect(cells(root, 'changed-inputs')).toEqual([['Rear corner · tie rod inner · z', '141.5', '145.5', '+4', 'mm']]);
    expect(cells(root, 'changed-results')).toEqual([['Understeer gradient K', '0.2512', '0.2398', '−0.0114', 'deg/g']]);
    const buttons = [...root.querySelectorAll('button')].map((b) => b.textContent!.trim());
    expect(buttons).toEqual(['Keep the current revisions', 'Save with the latest revisions']);
  });

  it('says nothing would change when the revisions are already the latest, and offers no save', () => {
    const root = open({ engineVersion: '1.0.0', revision: 2, current: REFS, latest: REFS, changedRefs: [], upToDate: true, inputs: [], results: [] });
    expect(root.textContent).toContain('already at their latest revisions');
    expect([...root.querySelectorAll('button')].map((b) => b.textContent!.trim())).toEqual(['Keep the current revisions']);
  });
});
