import { ChangeDetectionStrategy, Component, computed, inject, input, output } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { AxleDesignStore, type ConflictRow } from './axle-design-store';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import { formatNum } from '../../core/format/num';
import { unitLabel } from '../../core/format/quantities';

/** Someone else saved first: both versions side by side, and the choice of which continues. */
@Component({
  selector: 'rw-save-conflict',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton],
  template: `
    @if (store.conflict(); as k) {
      <section class="rw-conflict" role="alert" aria-labelledby="rw-conflict-title">
        <h2 id="rw-conflict-title">Someone else saved first</h2>
        <p>
          Revision {{ k.theirs.revision }} was saved{{ k.theirs.updatedByName ? ' by ' + k.theirs.updatedByName : '' }} after you started
          from revision {{ baseRevision() }}. Both versions are kept here; choose which one continues.
        </p>
        <table>
          <caption>Points and settings that differ (lengths in {{ lengthUnit() }})</caption>
          <thead>
            <tr><th scope="col">Point</th><th scope="col">Theirs (revision {{ k.theirs.revision }})</th><th scope="col">Yours</th></tr>
          </thead>
          <tbody>
            @for (r of k.rows; track r.key) {
              <tr><th scope="row">{{ r.name }}</th><td>{{ numbers(r, r.theirs) }}</td><td>{{ numbers(r, r.yours) }}</td></tr>
            }
          </tbody>
        </table>
        <div class="rw-form-actions">
          <button mat-flat-button type="button" (click)="keepMine.emit()" [disabled]="store.saving()">Save mine as revision {{ k.theirs.revision + 1 }}</button>
          <button mat-stroked-button type="button" (click)="store.takeTheirs()">Take theirs (mine stays one undo back)</button>
        </div>
      </section>
    }
  `,
  styles: `
    .rw-conflict {
      border: 2px solid var(--mat-sys-error);
      border-radius: var(--mat-sys-corner-medium);
      padding: 0.5rem 1rem 1rem;
      margin-bottom: 1rem;

      table {
        border-collapse: collapse;
        font-variant-numeric: tabular-nums;
      }

      th,
      td {
        padding: 0.15rem 0.6rem;
        border-bottom: 1px solid var(--mat-sys-outline-variant);
        text-align: left;
      }
    }
  `,
})
export class SaveConflict {
  protected readonly store = inject(AxleDesignStore);
  /** The revision the edits started from. */
  readonly baseRevision = input.required<number>();
  /** "Save mine": the page saves with its revision note. */
  readonly keepMine = output<void>();
  private readonly units = inject(DISPLAY_UNITS);
  protected readonly lengthUnit = computed(() => unitLabel('length', this.units()));

  /**
   * A point's or setting's numbers as "x, y, z" (8 significant figures; lengths and rates in the user's unit, angles
   * with theirs), a choice in words, "rigid" for a rate left out, or "(none)".
   */
  protected numbers(row: ConflictRow, v: readonly number[] | string | undefined): string {
    if (typeof v === 'string') return v;
    if (!v) return row.kind === 'rate' ? 'rigid' : '(none)';
    const kind = row.kind === 'length' ? 'length' : row.kind === 'rate' ? 'linearRate' : null;
    const text = v.map((n) => formatNum(n, kind ? { kind, sig: 8 } : { sig: 8 }, this.units())).join(', ');
    return row.kind === 'angle' ? `${text} deg` : row.kind === 'rate' ? `${text} ${unitLabel('linearRate', this.units())}` : text;
  }
}
