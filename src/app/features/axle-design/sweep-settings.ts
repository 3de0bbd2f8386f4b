import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { formatNum } from '../../core/format/num';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { fromDisplayUnits, unitLabel } from '../../core/format/quantities';

/** The wheel-travel range the editor's curves are swept over (mm). */
export interface TravelRange {
  readonly from: number;
  readonly to: number;
  readonly step: number;
}

/** The travel range, or why it cannot be used (from below to, a positive step, at most 400 steps). */
export function checkTravelRange(r: TravelRange): string | null {
  const ok = [r.from, r.to, r.step].every(Number.isFinite) && r.from < r.to && r.step > 0 && (r.to - r.from) / r.step <= 400;
  return ok ? null : 'Travel range: "from" below "to", a positive step, and at most 400 steps.';
}

/**
 * The travel range of the editor's curves: three Material fields in the
 * user's length unit (stored in mm), checked together, emitted only when usable.
 */
@Component({
  selector: 'rw-sweep-settings',
  imports: [MatFormField, MatLabel, MatInput],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <fieldset class="rw-sweep-settings">
      <legend>Travel range of the curves ({{ unit() }})</legend>
      @for (f of fields; track f.key) {
        <mat-form-field subscriptSizing="dynamic" class="rw-sweep-field">
          <mat-label>{{ f.label }}</mat-label>
          <input matInput type="number" [attr.data-sweep]="f.key" [attr.min]="f.key === 'step' ? 0.1 : null" [value]="shown(range()[f.key])" (change)="set(f.key, $event)" />
        </mat-form-field>
      }
      @if (error(); as m) {
        <p class="rw-cell-error" role="alert">{{ m }}</p>
      }
    </fieldset>
  `,
  styles: `
    .rw-sweep-settings {
      display: flex;
      flex-wrap: wrap;
      gap: 0.5rem;
      align-items: flex-start;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--mat-sys-corner-small);
      margin: 0;
      font: var(--mat-sys-body-small);
    }

    .rw-sweep-field {
      width: 6.5rem;
    }

    .rw-cell-error {
      color: var(--mat-sys-error);
      font: var(--mat-sys-body-small);
      flex-basis: 100%;
    }

    @media print {
      .rw-sweep-settings {
        display: none;
      }
    }
  `,
})
export class SweepSettings {
  readonly range = input.required<TravelRange>();
  readonly rangeChange = output<TravelRange>();
  protected readonly error = signal<string | null>(null);
  protected readonly fields = [
    { key: 'from', label: 'From' },
    { key: 'to', label: 'To' },
    { key: 'step', label: 'Step' },
  ] as const;

  private readonly units = inject(DISPLAY_UNITS);
  protected readonly unit = computed(() => unitLabel('length', this.units()));

  /** A stored length (mm) as the field shows it: mm as stored, inches to the length's significant figures. */
  protected shown(mm: number): string {
    return this.units() === 'imperial' ? formatNum(mm, { kind: 'length' }, 'imperial') : String(mm);
  }

  protected set(which: keyof TravelRange, event: Event): void {
    const typed = Number((event.target as HTMLInputElement).value);
    // Typed in the user's unit; stored in mm (an inch is 25.4 mm).
    const mm = fromDisplayUnits(typed, 'length', this.units());
    const next = { ...this.range(), [which]: mm };
    const problem = checkTravelRange(next);
    this.error.set(problem);
    if (!problem) this.rangeChange.emit(next);
  }
}
