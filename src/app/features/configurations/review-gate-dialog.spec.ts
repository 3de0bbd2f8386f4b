import { TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import type { GatesAnswer } from './configurations-api';
import { ReviewGateDialog, type ReviewGateDialogData } from './review-gate-dialog';

function gates(over: Partial<GatesAnswer> = {}): GatesAnswer {
  return {
    revision: 3,
    critical: [],
    rig: { tolerance: { toeDeg: 0.1, camberDeg: 0.25, isDefault: true }, axles: [] },
    acknowledgements: [],
    waivers: [],
    ...over,
  };
}

describe('ReviewGateDialog', () => {
  let close: ReturnType<typeof vi.fn>;

  function open(data: ReviewGateDialogData) {
    close = vi.fn();
    TestBed.configureTestingModule({ providers: [{ provide: MAT_DIALOG_DATA, useValue: data }, { provide: MatDialogRef, useValue: { close } }] });
    const fixture = TestBed.createComponent(ReviewGateDialog);
    fixture.detectChanges();
    const root = fixture.nativeElement as HTMLElement;
    const type = (index: number, text: string) => {
      const box = root.querySelectorAll('textarea')[index] as HTMLTextAreaElement;
      box.value = text;
      box.dispatchEvent(new Event('input'));
      fixture.detectChanges();
    };
    const confirm = () => [...root.querySelectorAll<HTMLButtonElement>('button[type="submit"]')][0]!;
    return { fixture, root, type, confirm };
  }

  it('sign-off: one reason field per Critical caution; the button waits until every reason is written', () => {
    const { root, type, confirm } = open({
      mode: 'sign-off',
      configurationName: 'Ember baseline',
      gates: gates({
        critical: [
          { axle: 'front', code: 'compliance-steer-rivals', message: 'Compliance steer is 1.4 times the roll steer', value: 1.4, threshold: 1, unit: 'ratio' },
          { axle: 'rear', code: 'cautions-unmeasured', message: 'The cautions could not be measured: pose unreachable at 64 mm', value: null, threshold: null, unit: null },
        ],
      }),
    });
    expect(root.querySelector('h2')!.textContent).toContain('Sign off Ember baseline');
    const items = [...root.querySelectorAll('.rw-gate-item')];
    expect(items.map((i) => i.getAttribute('data-code'))).toEqual(['compliance-steer-rivals', 'cautions-unmeasured']);
    expect(items[0]!.textContent).toContain('Front axle: Compliance steer is 1.4 times the roll steer');
    expect(items[0]!.textContent).toContain('Measured 1.4 ratio, Critical from 1 ratio');
    expect(root.querySelectorAll('textarea')).toHaveLength(2);
    expect(confirm().disabled).toBe(true);
    type(0, 'Bushes are the stiff race set; compliance measured on the bench');
    expect(confirm().disabled).toBe(true);
    type(1, '  ');
    expect(confirm().disabled).toBe(true);
    type(1, 'Rear geometry unchanged from the rig-checked car');
    expect(confirm().disabled).toBe(false);
    confirm().click();
    expect(close).toHaveBeenCalledWith({
      acknowledgements: [
        { axle: 'front', code: 'compliance-steer-rivals', reason: 'Bushes are the stiff race set; compliance measured on the bench' },
        { axle: 'rear', code: 'cautions-unmeasured', reason: 'Rear geometry unchanged from the rig-checked car' },
      ],
    });
  });

  it('validated: shows the rig evidence per axle and asks a waiver reason only for the axle without it', () => {
    const measurement = { id: 'm1', name: 'Front rig run', toeLargestDeg: 0.02, camberLargestDeg: null, within: true, authorName: 'Dana Quist', createdAt: '2026-12-01T10:00:00Z' };
    const { root, type, confirm } = open({
      mode: 'validate',
      configurationName: 'Ember baseline',
      gates: gates({
        rig: {
          tolerance: { toeDeg: 0.1, camberDeg: 0.25, isDefault: true },
          axles: [
            { axle: 'front', designRevision: 2, measurements: [measurement], satisfied: true },
            { axle: 'rear', designRevision: 4, measurements: [], satisfied: false },
          ],
        },
      }),
    });
    const evidence = root.querySelector('[data-testid="rig-evidence"]')!.textContent;
    expect(evidence).toContain('Front axle, design revision 2: rig evidence within tolerance (1 of 1 measurements)');
    expect(evidence).toContain('Rear axle, design revision 4: no rig measurement yet');
    expect([...root.querySelectorAll('.rw-gate-item')].map((i) => i.getAttribute('data-axle'))).toEqual(['rear']);
    expect(confirm().textContent.trim()).toBe('Mark validated');
    expect(confirm().disabled).toBe(true);
    type(0, 'Track test on 14 March showed the expected balance');
    confirm().click();
    expect(close).toHaveBeenCalledWith({ waivers: [{ axle: 'rear', reason: 'Track test on 14 March showed the expected balance' }] });
  });
});
