import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import type { LatestPreviewAnswer } from './configurations-api';
import { differenceGroups } from './review-words';
import { inputWords, resultWords } from '../../../../shared/io/result-words';

export interface LatestPreviewDialogData {
  readonly configurationName: string;
  readonly preview: LatestPreviewAnswer;
}

const REF_WORDS = { vehicleRevision: 'Vehicle', frontDesignRevision: 'Front axle design', rearDesignRevision: 'Rear axle design' } as const;

/**
 * "Use the latest revisions", before anything is saved: which revisions move,
 * each changed input and each changed result, old → new, labelled, rounded
 * and in the user's units, grouped by kind, computed by the server's engines. Closes with true when the user confirms.
 */
@Component({
  selector: 'rw-latest-preview-dialog',
  imports: [MatDialogModule, MatButtonModule],
  template: `
    <h2 mat-dialog-title>Use the latest revisions for {{ data.configurationName }}?</h2>
    <mat-dialog-content>
      @if (data.preview.upToDate) {
        <p>The vehicle and both axle designs are already at their latest revisions: nothing would change.</p>
      } @else {
        <ul class="rw-preview-refs" data-testid="changed-refs">
          @for (r of data.preview.changedRefs; track r.ref) { <li>{{ refWords[r.ref] }}: revision {{ r.from }} → {{ r.to }}</li> }
        </ul>
        @for (t of tables(); track t.testId) {
          <table class="rw-preview-table" [attr.data-testid]="t.testId">
            <caption>{{ t.caption }}</caption>
            <thead><tr><th scope="col">{{ t.head }}</th><th scope="col">Now</th><th scope="col">Latest</th><th scope="col">Change</th><th scope="col">Unit</th></tr></thead>
            @for (g of t.groups; track g.group) {
              <tbody>
                <tr class="rw-preview-group"><th scope="colgroup" colspan="5">{{ g.group }}</th></tr>
                @for (r of g.rows; track r.path) { <tr><th scope="row">{{ r.label }}</th><td>{{ r.a }}</td><td>{{ r.b }}</td><td>{{ r.change }}</td><td>{{ r.unit }}</td></tr> }
              </tbody>
            } @empty {
              <tbody><tr><td colspan="5">{{ t.none }}</td></tr></tbody>
            }
          </table>
        }
        <p class="rw-preview-note">Saving makes a new revision of the configuration and returns it to draft.</p>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" [mat-dialog-close]="false">Keep the current revisions</button>
      @if (!data.preview.upToDate) { <button mat-flat-button type="button" [mat-dialog-close]="true">Save with the latest revisions</button> }
    </mat-dialog-actions>
  `,
  styles: `
    .rw-preview-table { border-collapse: collapse; width: 100%; margin: 0.5rem 0 1rem; }
    .rw-preview-table caption { text-align: left; font-weight: 600; padding: 0.25rem 0; }
    .rw-preview-table th, .rw-preview-table td { text-align: left; padding: 0.2rem 0.5rem; border-bottom: 1px solid var(--mat-sys-outline-variant); }
    .rw-preview-table td { font-variant-numeric: tabular-nums; }
    .rw-preview-table .rw-preview-group th { font-weight: 600; padding-top: 0.5rem; border-bottom: none; }
    .rw-preview-note { color: var(--mat-sys-on-surface-variant); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LatestPreviewDialog {
  protected readonly data = inject<LatestPreviewDialogData>(MAT_DIALOG_DATA);
  protected readonly refWords = REF_WORDS;
  private readonly units = inject(DISPLAY_UNITS);
  protected readonly tables = computed(() => {
    const p = this.data.preview;
    const units = this.units();
    return [
      { testId: 'changed-inputs', caption: `Changed inputs (${p.inputs.length})`, head: 'Input', none: 'No input changes (only the revision numbers move).', groups: differenceGroups(p.inputs, inputWords, units) },
      { testId: 'changed-results', caption: `Changed results (${p.results.length}, engine ${p.engineVersion})`, head: 'Result', none: 'No result changes.', groups: differenceGroups(p.results, resultWords, units) },
    ];
  });
}
