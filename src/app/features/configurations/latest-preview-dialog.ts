import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { pathWords } from '../../../../shared/io/document-words';
import type { Difference, LatestPreviewAnswer } from './configurations-api';

export interface LatestPreviewDialogData {
  readonly configurationName: string;
  readonly preview: LatestPreviewAnswer;
}

const REF_WORDS = { vehicleRevision: 'Vehicle', frontDesignRevision: 'Front axle design', rearDesignRevision: 'Rear axle design' } as const;

interface Row {
  readonly path: string;
  readonly label: string;
  readonly unit: string;
  readonly from: string;
  readonly to: string;
  readonly change: string;
}

/** A value for the old → new table: numbers to six significant figures with a true minus, other values as text. */
function show(v: unknown): string {
  if (typeof v === 'number') return Number.isFinite(v) ? String(Number(v.toPrecision(6))).replace('-', '−') : '–';
  if (v === undefined) return '(none)';
  if (v === null) return '(empty)';
  return typeof v === 'string' ? v : JSON.stringify(v);
}

function rows(list: readonly Difference[]): Row[] {
  return list.map((d) => {
    const w = pathWords(d.path);
    const change = typeof d.change === 'number' ? `${d.change > 0 ? '+' : ''}${show(d.change)}` : '';
    return { path: d.path, label: w.label, unit: w.unit ?? '', from: show(d.a), to: show(d.b), change };
  });
}

/**
 * "Use the latest revisions", before anything is saved: which revisions move,
 * each changed input and each changed key result, old → new with its unit,
 * computed by the server's engines. Closes with true when the user confirms.
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
        <table class="rw-preview-table" data-testid="changed-inputs">
          <caption>Changed inputs ({{ inputs.length }})</caption>
          <thead><tr><th scope="col">Input</th><th scope="col">Now</th><th scope="col">Latest</th><th scope="col">Change</th><th scope="col">Unit</th></tr></thead>
          <tbody>
            @for (r of inputs; track r.path) { <tr><th scope="row">{{ r.label }}</th><td>{{ r.from }}</td><td>{{ r.to }}</td><td>{{ r.change }}</td><td>{{ r.unit }}</td></tr> }
            @empty { <tr><td colspan="5">No input changes (only the revision numbers move).</td></tr> }
          </tbody>
        </table>
        <table class="rw-preview-table" data-testid="changed-results">
          <caption>Changed key results ({{ results.length }}, engine {{ data.preview.engineVersion }})</caption>
          <thead><tr><th scope="col">Result</th><th scope="col">Now</th><th scope="col">Latest</th><th scope="col">Change</th><th scope="col">Unit</th></tr></thead>
          <tbody>
            @for (r of results; track r.path) { <tr><th scope="row">{{ r.label }}</th><td>{{ r.from }}</td><td>{{ r.to }}</td><td>{{ r.change }}</td><td>{{ r.unit }}</td></tr> }
            @empty { <tr><td colspan="5">No key result changes.</td></tr> }
          </tbody>
        </table>
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
    .rw-preview-note { color: var(--mat-sys-on-surface-variant); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LatestPreviewDialog {
  protected readonly data = inject<LatestPreviewDialogData>(MAT_DIALOG_DATA);
  protected readonly refWords = REF_WORDS;
  protected readonly inputs = rows(this.data.preview.inputs);
  protected readonly results = rows(this.data.preview.results);
}
