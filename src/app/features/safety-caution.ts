import { ChangeDetectionStrategy, Component } from '@angular/core';

/** The safety caution shown on every result screen (wording of issue 6 and domain.md). */
export const SAFETY_CAUTION_TEXT =
  'Design estimates from an idealised rigid-link model. Verify on a kinematics rig and in controlled testing, ' +
  "and follow your series' technical regulations and the engineering codes and licensed practice that apply.";

@Component({
  selector: 'rw-safety-caution',
  template: `<p class="rw-safety" role="note"><span class="material-symbols-outlined" aria-hidden="true">health_and_safety</span>{{ text }}</p>`,
  styles: `
    .rw-safety {
      display: flex;
      gap: 0.5rem;
      align-items: flex-start;
      margin: 0.75rem 0;
      padding: 0.5rem 0.75rem;
      border-left: 4px solid var(--mat-sys-tertiary);
      background: var(--mat-sys-surface-container-low);
      color: var(--mat-sys-on-surface);
      font: var(--mat-sys-body-medium);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SafetyCaution {
  protected readonly text = SAFETY_CAUTION_TEXT;
}
