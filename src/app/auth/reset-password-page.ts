import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { AuthService } from '../core/auth/auth-service';
import {
  matchingPasswords,
  MAX_PASSWORD_LENGTH,
  MIN_PASSWORD_LENGTH,
} from '../core/auth/password-rules';
import { apiProblem } from '../core/http/api-error';
import { NewPasswordFields } from '../core/forms/new-password-fields';
import { AccountLinksApi } from './account-links-api';

/**
 * `/reset-password/:token`, the link of the password-reset mail: choose a
 * new password. The server ends every session of the account, so the user
 * signs in afresh with the new password.
 */
@Component({
  selector: 'rw-reset-password-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [NewPasswordFields, ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatButtonModule, RouterLink],
  templateUrl: './reset-password-page.html',
})
export class ResetPasswordPage {
  private readonly api = inject(AccountLinksApi);
  private readonly auth = inject(AuthService);

  /** From the link (route parameter). */
  readonly token = input.required<string>();

  protected readonly form = inject(NonNullableFormBuilder).group(
    {
      password: [
        '',
        [
          Validators.required,
          Validators.minLength(MIN_PASSWORD_LENGTH),
          Validators.maxLength(MAX_PASSWORD_LENGTH),
        ],
      ],
      confirm: ['', [Validators.required]],
    },
    { validators: matchingPasswords() },
  );
  protected readonly submitting = signal(false);
  protected readonly failure = signal<string | null>(null);
  /** The link itself is spent or bad: the form cannot help, a new link can. */
  protected readonly linkInvalid = signal(false);
  protected readonly done = signal(false);

  protected submit(): void {
    this.failure.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    this.api.confirmPasswordReset(this.token(), this.form.getRawValue().password).subscribe({
      next: () => {
        this.submitting.set(false);
        this.done.set(true);
        // The account's sessions have ended; if this browser held one, learn whether it still does.
        if (this.auth.signedIn()) this.auth.refresh().subscribe({ error: () => undefined });
      },
      error: (error: unknown) => {
        this.submitting.set(false);
        const problem = apiProblem(error);
        this.linkInvalid.set(problem.code === 'reset_link_invalid');
        this.failure.set(problem.message);
      },
    });
  }
}
