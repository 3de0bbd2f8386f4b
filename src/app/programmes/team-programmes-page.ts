import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { browserTimeZone, formatLocalTime } from '../core/time/local-time';
import { loadState } from '../core/http/load-state';
import { confirmAction } from '../core/layout/confirm-dialog';
import { Notifier } from '../core/layout/notifier';
import { TeamAccess } from '../core/teams/team-access';
import { profileLabel } from './board-figures';
import { ProgrammesApi, TeamProgramme } from './programmes-api';

/**
 * `/teams/:teamId/programmes` (owners): the instructors' invitations to
 * programmes, to accept or decline, and the programmes the team takes part
 * in. Accepting lets that programme's instructor read the team (never write).
 */
@Component({
  selector: 'rw-team-programmes-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatIconModule, MatProgressSpinnerModule],
  templateUrl: './team-programmes-page.html',
  styleUrl: './team-programmes-page.scss',
})
export class TeamProgrammesPage {
  readonly teamId = input.required<string>();

  protected readonly access = inject(TeamAccess);
  private readonly api = inject(ProgrammesApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);

  protected readonly timeZone = browserTimeZone();
  protected readonly profileLabel = profileLabel;
  // A reload keeps the list shown until the new one arrives.
  private readonly programmes = rxResource({ params: () => this.teamId(), stream: ({ params: teamId }) => this.api.forTeam(teamId) });
  protected readonly state = loadState(this.programmes);
  /** The programme whose answer is being sent. */
  protected readonly busy = signal<string | null>(null);

  protected readonly invitations = computed(() => this.byStatus('invited'));
  protected readonly taking = computed(() => this.byStatus('accepted'));
  protected readonly declined = computed(() => this.byStatus('declined'));

  private byStatus(status: TeamProgramme['status']): TeamProgramme[] {
    const s = this.state();
    return s.status === 'ready' ? s.value.filter((p) => p.status === status) : [];
  }

  protected reload(): void {
    this.programmes.reload();
  }

  protected local(iso: string): string {
    return formatLocalTime(iso, this.timeZone);
  }

  protected accept(p: TeamProgramme): void {
    const who = p.instructorName ?? 'The instructor';
    confirmAction(this.dialog, {
      title: 'Join this programme?',
      message: `${who} will be able to read this team's vehicles, axle designs and configurations (never change them) and compare them with other teams on the programme board.`,
      confirmLabel: 'Accept',
    }).subscribe((ok) => {
      if (ok) this.send(p, 'accept', `${this.teamName()} takes part in "${p.name}".`);
    });
  }

  protected decline(p: TeamProgramme): void {
    const leaving = p.status === 'accepted';
    confirmAction(this.dialog, {
      title: leaving ? 'Leave this programme?' : 'Decline this invitation?',
      message: leaving
        ? `The instructor of "${p.name}" will no longer read this team; snapshots already taken keep the figures they froze.`
        : `The team will not appear on the board of "${p.name}".`,
      confirmLabel: leaving ? 'Leave programme' : 'Decline',
    }).subscribe((ok) => {
      if (ok) this.send(p, 'decline', leaving ? `The team left "${p.name}".` : `Invitation to "${p.name}" declined.`);
    });
  }

  private teamName(): string {
    return this.access.team()?.name ?? 'The team';
  }

  private send(p: TeamProgramme, decision: 'accept' | 'decline', done: string): void {
    this.busy.set(p.programmeId);
    this.api.decide(this.teamId(), p.programmeId, decision).subscribe({
      next: () => {
        this.busy.set(null);
        void this.notifier.info(done);
        this.reload();
      },
      // The interceptor shows the API's message.
      error: () => {
        this.busy.set(null);
        this.reload();
      },
    });
  }
}
