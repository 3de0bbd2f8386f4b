import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { apiProblem } from '../core/http/api-error';
import { loadState } from '../core/http/load-state';
import { TeamAccess } from '../core/teams/team-access';
import { ACTIVITY_PAGE_SIZE, ActivityApi } from './activity-api';
import { browserTimeZone, formatLocalTime } from '../core/time/local-time';

export const SUBJECT_WORDS: Readonly<Partial<Record<string, string>>> = {
  team: 'Team',
  member: 'Member',
  invitation: 'Invitation',
  vehicle: 'Vehicle',
  axle_design: 'Axle design',
  proposal: 'Proposal',
  configuration: 'Configuration',
  comment: 'Review comment',
};

/**
 * `/teams/:teamId/activity` and `/teams/:teamId/activity/axle-designs/:designId`:
 * who changed what, when. Times are stored in UTC and shown in this
 * browser's time zone (named on the page); the CSV carries both.
 */
@Component({
  selector: 'rw-activity-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    FormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressSpinnerModule,
    MatSelectModule,
  ],
  templateUrl: './activity-page.html',
  styleUrl: './activity-page.scss',
})
export class ActivityPage {
  readonly teamId = input.required<string>();
  /** Set on the per-design route. */
  readonly designId = input<string | undefined>(undefined);

  protected readonly access = inject(TeamAccess);
  protected readonly api = inject(ActivityApi);

  protected readonly timeZone = browserTimeZone();
  protected readonly subjectWords = SUBJECT_WORDS;
  /** The latest entries, and older ones appended as they are asked for ("Load older entries"). */
  private readonly entries = rxResource({
    params: () => ({ teamId: this.teamId(), designId: this.designId() ?? null }),
    stream: ({ params: p }) => this.api.list(p.teamId, p.designId),
  });
  protected readonly state = loadState(this.entries);
  /** More entries may be older than the last one shown: a full first page, then a full page of older ones. */
  protected readonly more = linkedSignal(() => {
    const s = this.state();
    return s.status === 'ready' && s.value.length === ACTIVITY_PAGE_SIZE;
  });
  protected readonly loadingOlder = signal(false);
  protected readonly olderFailure = signal<string | null>(null);

  /** Filters over the loaded entries. */
  protected readonly kind = signal<string>('');
  protected readonly text = signal('');

  protected readonly kinds = computed(() => {
    const s = this.state();
    const found = s.status === 'ready' ? new Set(s.value.map((e) => e.subjectType)) : new Set<string>();
    return [...found].sort().map((k) => ({ value: k, label: SUBJECT_WORDS[k] ?? k }));
  });

  protected readonly shown = computed(() => {
    const s = this.state();
    if (s.status !== 'ready') return [];
    const kind = this.kind();
    const words = this.text().trim().toLowerCase();
    return s.value.filter(
      (e) =>
        (!kind || e.subjectType === kind) &&
        (!words || `${e.actorName ?? ''} ${e.action} ${e.summary}`.toLowerCase().includes(words)),
    );
  });

  protected readonly csvUrl = computed(() => this.api.csvUrl(this.teamId(), this.designId() ?? null, this.timeZone));

  protected reload(): void {
    this.olderFailure.set(null);
    this.entries.reload();
  }

  protected local(iso: string): string {
    return formatLocalTime(iso, this.timeZone, true);
  }

  protected loadOlder(): void {
    const s = this.state();
    if (s.status !== 'ready' || s.value.length === 0) return;
    const last = s.value[s.value.length - 1]!;
    this.loadingOlder.set(true);
    this.olderFailure.set(null);
    this.api.list(this.teamId(), this.designId() ?? null, last).subscribe({
      next: (older) => {
        this.loadingOlder.set(false);
        const seen = new Set(s.value.map((e) => e.id));
        this.entries.set([...s.value, ...older.filter((e) => !seen.has(e.id))]);
        this.more.set(older.length === ACTIVITY_PAGE_SIZE);
      },
      error: (error: unknown) => {
        this.loadingOlder.set(false);
        this.olderFailure.set(apiProblem(error).message);
      },
    });
  }
}
