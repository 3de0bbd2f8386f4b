import { DatePipe } from '@angular/common';
import { Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { BehaviorSubject, switchMap } from 'rxjs';
import { LoadState, toLoadState } from '../core/http/load-state';
import { AuthService } from '../core/auth/auth-service';
import { CapturedMail, DevMailApi } from './dev-mail-api';
import { MailSegment, splitMailLinks } from './mail-links';

interface ShownMail extends CapturedMail {
  readonly segments: readonly MailSegment[];
}

/**
 * `/dev-mail` (signed in, development servers only): the signed-in person's
 * own inbox on the local fake SMTP server, newest first, with the links in
 * each body clickable. Nobody sees anyone else's mail here, so no reset,
 * confirmation or invitation link reaches anyone but its addressee.
 */
@Component({
  selector: 'app-dev-mail-page',
  imports: [DatePipe, MatButtonModule, MatIconModule],
  templateUrl: './dev-mail-page.html',
  styleUrl: './dev-mail-page.scss',
})
export class DevMailPage {
  private readonly api = inject(DevMailApi);
  protected readonly auth = inject(AuthService);

  private readonly reload$ = new BehaviorSubject<void>(undefined);
  protected readonly state = toSignal(
    this.reload$.pipe(switchMap(() => toLoadState(this.api.list()))),
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
