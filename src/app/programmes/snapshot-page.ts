import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { RouterLink } from '@angular/router';
import { browserTimeZone, formatLocalTime } from '../core/time/local-time';
import { loadState } from '../core/http/load-state';
import { SafetyCaution } from '../features/safety-caution';
import { BoardTable } from './board-table';
import { ProgrammesApi } from './programmes-api';

/** `/programmes/:programmeId/snapshots/:snapshotId`: the board as it was frozen, and its CSV. */
@Component({
  selector: 'rw-snapshot-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, MatButtonModule, MatIconModule, MatProgressSpinnerModule, SafetyCaution, BoardTable],
  template: `
    <section class="rw-page">
      <p class="back"><a [routerLink]="['/programmes', programmeId()]">← Back to the programme</a></p>
      @let s = state();
      @if (s.status === 'loading') {
        <div class="rw-state" role="status">
          <mat-spinner diameter="24" aria-hidden="true" />
          Loading the snapshot…
        </div>
      } @else if (s.status === 'error') {
        <div class="rw-state rw-state-error" role="alert">
          <mat-icon aria-hidden="true">error</mat-icon>
          <span>The snapshot could not be loaded: {{ s.message }}</span>
          <button mat-button type="button" (click)="reload()">Try again</button>
        </div>
      } @else {
        @let snap = s.value;
        <div class="rw-page-header">
          <h1>{{ snap.label ?? 'Snapshot' }}</h1>
          <a mat-flat-button [href]="api.snapshotCsvUrl(programmeId(), snap.id)" download>
            <mat-icon aria-hidden="true">download</mat-icon>
            Download CSV
          </a>
        </div>
        <p class="rw-muted">
          Frozen {{ local(snap.takenAt) }} ({{ timeZone }}) with engine {{ snap.board.engineVersion }}. Later
          work in the teams does not change it.
        </p>
        <rw-safety-caution />
        @if (snap.board.rows.length === 0) {
          <div class="rw-state" role="status">The board was empty when this snapshot was taken.</div>
        } @else {
          <rw-board-table [board]="snap.board" [timeZone]="timeZone" [caption]="'Snapshot ' + (snap.label ?? '')" />
        }
      }
    </section>
  `,
  styles: `
    .back {
      margin: 0 0 0.5rem;
    }
  `,
})
export class SnapshotPage {
  readonly programmeId = input.required<string>();
  readonly snapshotId = input.required<string>();

  protected readonly api = inject(ProgrammesApi);
  protected readonly timeZone = browserTimeZone();
  private readonly snapshot = rxResource({
    params: () => ({ programmeId: this.programmeId(), snapshotId: this.snapshotId() }),
    stream: ({ params: p }) => this.api.snapshot(p.programmeId, p.snapshotId),
  });
  protected readonly state = loadState(this.snapshot);

  protected reload(): void {
    this.snapshot.reload();
  }

  protected local(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }
}
