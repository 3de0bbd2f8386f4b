import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { loadState } from '../core/http/load-state';
import { AuthService } from '../core/auth/auth-service';
import { CapturedMail, DevMailApi } from './dev-mail-api';
import { MailSegment, splitMailLinks } from './mail-links';
import { LocalTimePipe } from '../core/time/local-time';

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
  selector: 'rw-dev-mail-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LocalTimePipe, MatButtonModule, MatIconModule],
  templateUrl: './dev-mail-page.html',
  styleUrl: './dev-mail-page.scss',
})
export class DevMailPage {
  private readonly api = inject(DevMailApi);
  protected readonly auth = inject(AuthService);

  private readonly inbox = rxResource({ stream: () => this.api.list() });
  protected readonly state = loadState(this.inbox);

  protected readonly mails = computed<readonly ShownMail[]>(() => {
    const state = this.state();
    return state.status === 'ready'
      ? state.value.map((m) => ({ ...m, segments: splitMailLinks(m.text) }))
      : [];
  });

  protected refresh(): void {
    // The list goes while the inbox is read again: what shows afterwards is the inbox now.
    this.inbox.set(undefined);
    this.inbox.reload();
  }
}
