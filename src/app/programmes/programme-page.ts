import { ProgrammeStudies } from '../features/studies/programme-studies';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { RouterLink } from '@angular/router';
import { browserTimeZone, formatLocalTime } from '../core/time/local-time';
import { apiProblem } from '../core/http/api-error';
import { loadState } from '../core/http/load-state';
import { Notifier } from '../core/layout/notifier';
import { SafetyCaution } from '../features/safety-caution';
import { BoardTable } from './board-table';
import { profileLabel } from './board-figures';
import { Board, ProgrammeDetail, ProgrammesApi, ProgrammeTeamStatus, SnapshotSummary } from './programmes-api';
import { PageSection, SectionNav } from '../core/layout/section-nav';

const TEAM_STATUS_WORDS: Readonly<Record<ProgrammeTeamStatus, string>> = {
  invited: 'Invited, waiting for the owner',
  accepted: 'Accepted',
  declined: 'Declined',
};

/**
 * `/programmes/:programmeId` (its instructor): the teams and their answers,
 * inviting a team by its address, the board of every accepted team's
 * configurations, and snapshots of the board with their CSV export. The
 * instructor only reads the teams: nothing here changes a team's data.
 */
@Component({
  selector: 'rw-programme-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressSpinnerModule,
    SafetyCaution,
    BoardTable,
    ProgrammeStudies,
    SectionNav,
  ],
  templateUrl: './programme-page.html',
  styleUrl: './programme-page.scss',
})
export class ProgrammePage {
  /** "On this page": the programme's sections, in order. */
  protected readonly sections: readonly PageSection[] = [
    { id: 'teams-heading', label: 'Teams' },
    { id: 'board-heading', label: 'Board' },
    { id: 'programme-studies-heading', label: 'Attached studies' },
    { id: 'snapshots-heading', label: 'Snapshots' },
  ];

  /** Bound from the route parameter. */
  readonly programmeId = input.required<string>();

  protected readonly api = inject(ProgrammesApi);
  private readonly notifier = inject(Notifier);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly timeZone = browserTimeZone();
  protected readonly profileLabel = profileLabel;
  protected readonly teamStatusWords = TEAM_STATUS_WORDS;

  // A reload keeps what is shown until the new answer arrives (the forms below it stay put).
  private readonly detailResource = rxResource({
    params: () => this.programmeId(),
    stream: ({ params: id }) => this.api.get(id),
  });
  private readonly boardResource = rxResource({
    params: () => this.programmeId(),
    stream: ({ params: id }) => this.api.board(id),
  });
  private readonly snapshotList = rxResource({
    params: () => this.programmeId(),
    stream: ({ params: id }) => this.api.snapshots(id),
  });
  protected readonly detail = loadState<ProgrammeDetail>(this.detailResource);
  protected readonly board = loadState<Board>(this.boardResource);
  protected readonly snapshots = loadState<SnapshotSummary[]>(this.snapshotList);

  /** Accepted teams that have no configuration on the board (yet). */
  protected readonly acceptedWithoutRows = computed(() => {
    const d = this.detail();
    const b = this.board();
    if (d.status !== 'ready' || b.status !== 'ready') return [];
    const onBoard = new Set(b.value.rows.map((r) => r.teamId));
    return d.value.teams.filter((t) => t.status === 'accepted' && !onBoard.has(t.teamId));
  });
  protected readonly acceptedWithoutRowsWords = computed(() =>
    this.acceptedWithoutRows()
      .map((t) => t.teamName)
      .join(', '),
  );
  protected readonly acceptedCount = computed(() => {
    const d = this.detail();
    return d.status === 'ready' ? d.value.teams.filter((t) => t.status === 'accepted').length : 0;
  });

  protected readonly inviteForm = this.fb.group({
    teamSlug: ['', [Validators.required, Validators.maxLength(60)]],
  });
  protected readonly inviting = signal(false);
  protected readonly inviteFailure = signal<string | null>(null);

  protected readonly snapshotForm = this.fb.group({ label: ['', [Validators.maxLength(120)]] });
  protected readonly snapping = signal(false);
  protected readonly snapshotFailure = signal<string | null>(null);

  protected reloadDetail(): void {
    this.detailResource.reload();
  }

  protected reloadBoard(): void {
    this.boardResource.reload();
    this.reloadDetail();
  }

  protected reloadSnapshots(): void {
    this.snapshotList.reload();
  }

  protected local(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }

  /** `form` resets the submitted state too, so the emptied field shows no error. */
  protected invite(form: FormGroupDirective): void {
    this.inviteFailure.set(null);
    const slug = this.inviteForm.controls.teamSlug.value.trim();
    if (!slug) this.inviteForm.controls.teamSlug.setValue('');
    if (this.inviteForm.invalid) {
      this.inviteForm.markAllAsTouched();
      return;
    }
    this.inviting.set(true);
    this.api.inviteTeam(this.programmeId(), slug).subscribe({
      next: (t) => {
        this.inviting.set(false);
        form.resetForm({ teamSlug: '' });
        void this.notifier.info(`${t.teamName} invited. The team's owner accepts or declines on the team's Programmes page.`);
        this.reloadDetail();
      },
      error: (error: unknown) => {
        this.inviting.set(false);
        this.inviteFailure.set(apiProblem(error).message);
      },
    });
  }

  protected takeSnapshot(form: FormGroupDirective): void {
    this.snapshotFailure.set(null);
    if (this.snapshotForm.invalid) {
      this.snapshotForm.markAllAsTouched();
      return;
    }
    const label = this.snapshotForm.controls.label.value.trim() || undefined;
    this.snapping.set(true);
    this.api.takeSnapshot(this.programmeId(), label).subscribe({
      next: (s) => {
        this.snapping.set(false);
        form.resetForm({ label: '' });
        void this.notifier.info(`Snapshot taken at ${this.local(s.takenAt)} (${this.timeZone}).`);
        this.reloadSnapshots();
      },
      error: (error: unknown) => {
        this.snapping.set(false);
        this.snapshotFailure.set(apiProblem(error).message);
      },
    });
  }
}
