import { ChangeDetectionStrategy, Component, effect, inject, input, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { AuthService } from '../core/auth/auth-service';
import { apiProblem } from '../core/http/api-error';
import { AccountLinksApi } from './account-links-api';

type Outcome =
  | { readonly status: 'confirming' }
  | { readonly status: 'confirmed' }
  | { readonly status: 'failed'; readonly code: string; readonly message: string };

/**
 * `/verify-email/:token`, the link of the confirmation mail: confirms the
 * address as soon as it opens and says how it went. An expired link can be
 * replaced from here by a signed-in user.
 */
@Component({
  selector: 'rw-verify-email-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, RouterLink],
  templateUrl: './verify-email-page.html',
})
export class VerifyEmailPage {
  private readonly api = inject(AccountLinksApi);
  protected readonly auth = inject(AuthService);

  /** From the link (route parameter). */
  readonly token = input.required<string>();

  protected readonly outcome = signal<Outcome>({ status: 'confirming' });
  protected readonly resend = signal<'idle' | 'sending' | 'sent' | 'failed'>('idle');
  protected readonly resendFailure = signal<string | null>(null);

  constructor() {
    effect(() => {
      const token = this.token();
      untracked(() => this.confirm(token));
    });
  }

  private confirm(token: string): void {
    this.outcome.set({ status: 'confirming' });
    this.api.verifyEmail(token).subscribe({
      next: () => {
        this.outcome.set({ status: 'confirmed' });
        if (this.auth.signedIn()) this.auth.refresh().subscribe({ error: () => undefined });
      },
      error: (error: unknown) => {
        const problem = apiProblem(error);
        this.outcome.set({ status: 'failed', code: problem.code, message: problem.message });
      },
    });
  }

  protected sendNewLink(): void {
    this.resend.set('sending');
    this.api.resendVerification().subscribe({
      next: () => this.resend.set('sent'),
      error: (error: unknown) => {
        this.resendFailure.set(apiProblem(error).message);
        this.resend.set('failed');
      },
    });
  }
}
