import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { Caution } from '../../../../shared/cautions/cautions';

const LEVEL_WORDS: Readonly<Record<Caution['level'], string>> = {
  info: 'Note',
  warning: 'Warning',
  critical: 'Critical',
};

/** Cautions beside the result they concern: level, message, measured value and threshold, basis. */
@Component({
  selector: 'rw-caution-list',
  template: `
    @if (cautions().length === 0) {
      <p class="rw-muted">No cautions for this result.</p>
    } @else {
      <ul class="rw-cautions" [attr.aria-label]="label()">
        @for (c of cautions(); track c.code + $index) {
          <li [class]="'rw-caution rw-caution-' + c.level" [attr.data-code]="c.code">
            <span class="rw-caution-level">{{ levelWords[c.level] }}</span>
            <span class="rw-caution-message">{{ c.message }}</span>
            @if (c.value !== null) {
              <span class="rw-caution-figures">
                Value {{ c.value.toPrecision(3) }} {{ c.unit }}@if (c.threshold !== null) {; threshold {{ c.threshold.toPrecision(3) }} {{ c.unit }}}.
              </span>
            }
            <span class="rw-caution-basis">Basis: {{ c.basis }}</span>
          </li>
        }
      </ul>
    }
  `,
  styles: `
    .rw-cautions { list-style: none; padding: 0; margin: 0.5rem 0; display: flex; flex-direction: column; gap: 0.4rem; }
    .rw-caution { display: flex; flex-wrap: wrap; gap: 0.25rem 0.6rem; padding: 0.4rem 0.6rem; border-left: 4px solid var(--mat-sys-outline); background: var(--mat-sys-surface-container-low); }
    .rw-caution-warning { border-left-color: var(--mat-sys-tertiary); }
    .rw-caution-critical { border-left-color: var(--mat-sys-error); background: var(--mat-sys-error-container); color: var(--mat-sys-on-error-container); }
    .rw-caution-level { font-weight: 700; }
    .rw-caution-figures, .rw-caution-basis { font: var(--mat-sys-body-small); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CautionList {
  readonly cautions = input.required<readonly Caution[]>();
  readonly label = input<string>('Cautions');
  protected readonly levelWords = LEVEL_WORDS;
}
