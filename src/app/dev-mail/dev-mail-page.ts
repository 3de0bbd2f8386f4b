import { DatePipe } from '@angular/common';
import { Component, computed, inject, input } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { BehaviorSubject, combineLatest, switchMap } from 'rxjs';
import { LoadState, toLoadState } from '../core/http/load-state';
import { TeamAccess } from '../core/teams/team-access';
import { CapturedMail, DevMailApi } from './dev-mail-api';
import { MailSegment, splitMailLinks } from './mail-links';

interface ShownMail extends CapturedMail {
  readonly segments: readonly MailSegment[];
}

/**
 * `/teams/:teamId/dev-mail` (owners, development servers only): the mail the
 * local fake SMTP server caught for the team's members or because of the
 * team, newest first, with the links in each body clickable.
 */
@Component({
  selector: 'app-dev-mail-page',
  imports: [DatePipe, MatButtonModule, MatIconModule],
  templateUrl: './dev-mail-page.html',
  styleUrl: './dev-mail-page.scss',
})
export class DevMailPage {
  private readonly api = inject(DevMailApi);
  protected readonly access = inject(TeamAccess);

  /** Route parameter of `teams/:teamId`. */
  readonly teamId = input.required<string>();

  private readonly reload$ = new BehaviorSubject<void>(undefined);
  protected readonly state = toSignal(
    combineLatest([toObservable(this.teamId), this.reload$]).pipe(
      switchMap(([teamId]) => toLoadState(this.api.list(teamId))),
    ),
    { initialValue: { status: 'loading' } as LoadState<CapturedMail[]> },
  );

  protected readonly mails = computed<readonly ShownMail[]>(() => {
    const state = this.state();
    return state.status === 'ready'
      ? state.value.map((m) => ({ ...m, segments: splitMailLinks(m.text) }))
      : [];
  });

  protected refresh(): void {
    this.reload$.next();
  }
}
