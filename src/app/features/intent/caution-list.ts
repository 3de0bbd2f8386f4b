import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import type { Caution } from '../../../../shared/cautions/cautions';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { unitLabel, type QuantityKind } from '../../core/format/quantities';
import { UnitsTextPipe } from '../../core/format/units-text-pipe';

/** The quantity a caution's measured value is, by the unit its rule states it in (others are the same in either system). */
const CAUTION_UNIT_KINDS: Readonly<Record<string, QuantityKind>> = {
  mm: 'length',
  'deg/m': 'bumpSteer',
  'm of drift in 1 s': 'distance',
};

const LEVEL_WORDS: Readonly<Record<Caution['level'], string>> = {
  info: 'Note',
  warning: 'Warning',
  critical: 'Critical',
};

/** Cautions beside the result they concern: level, message, measured value and threshold (in the user's unit system), basis. */
@Component({
  selector: 'rw-caution-list',
  imports: [UnitsTextPipe],
  template: `
    @if (cautions().length === 0) {
      <p class="rw-muted">No cautions for this result.</p>
    } @else {
      <ul class="rw-cautions" [attr.aria-label]="label()">
        @for (c of cautions(); track c.code + $index) {
          <li [class]="'rw-caution rw-caution-' + c.level" [attr.data-code]="c.code">
            <span class="rw-caution-level">{{ levelWords[c.level] }}</span>
            <span class="rw-caution-message">{{ c.message | unitsText }}</span>
            @if (c.value !== null) {
              <span class="rw-caution-figures">
                Value {{ figure(c, c.value) }}@if (c.threshold !== null) {; threshold {{ figure(c, c.threshold) }}}.
              </span>
            }
            <span class="rw-caution-basis">Basis: {{ c.basis | unitsText }}</span>
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
  private readonly units = inject(DISPLAY_UNITS);

  /** A caution's value or threshold with its unit, in the user's unit system, to 3 significant figures. */
  protected figure(c: Caution, v: number): string {
    const kind = CAUTION_UNIT_KINDS[c.unit];
    if (!kind) return `${formatNum(v, { sig: 3 })}${c.unit ? ' ' + c.unit : ''}`;
    const unit = unitLabel(kind, this.units()) + (c.unit.startsWith('m of ') ? c.unit.slice(1) : '');
    return `${formatNum(v, { sig: 3, kind }, this.units())} ${unit}`;
  }
}
