import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';

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

/** The travel range of the editor's curves: three fields, checked together, emitted only when usable. */
@Component({
  selector: 'rw-sweep-settings',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <fieldset class="rw-sweep-settings">
      <legend>Travel range of the curves (mm)</legend>
      <label><span>From</span><input type="number" [value]="range().from" (change)="set('from', $event)" /></label>
      <label><span>To</span><input type="number" [value]="range().to" (change)="set('to', $event)" /></label>
      <label><span>Step</span><input type="number" min="0.1" [value]="range().step" (change)="set('step', $event)" /></label>
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
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--mat-sys-corner-small);

      label {
        display: flex;
        flex-direction: column;
        font: var(--mat-sys-body-small);
      }

      input {
        width: 5rem;
      }
    }

    .rw-cell-error {
      color: var(--mat-sys-error);
      font: var(--mat-sys-body-small);
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

  protected set(which: keyof TravelRange, event: Event): void {
    const next = { ...this.range(), [which]: Number((event.target as HTMLInputElement).value) };
    const problem = checkTravelRange(next);
    this.error.set(problem);
    if (!problem) this.rangeChange.emit(next);
  }
}
