import { ChangeDetectionStrategy, Component, inject, input, OnInit, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { apiProblem } from '../core/http/api-error';
import { AccountLinksApi } from './account-links-api';

/**
 * Asks for a password-reset link. The answer is the same for known and
 * unknown addresses, so the page never tells who has an account.
 */
@Component({
  selector: 'rw-forgot-password-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatButtonModule, RouterLink],
  templateUrl: './forgot-password-page.html',
})
export class ForgotPasswordPage implements OnInit {
  private readonly api = inject(AccountLinksApi);
  /** `?email=`: the address typed so far on the sign-in page. */
  readonly email = input<string | undefined>(undefined);

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: [
      '',
      [Validators.required, Validators.email, Validators.maxLength(254)],
    ],
  });
  protected readonly submitting = signal(false);
  protected readonly failure = signal<string | null>(null);
  /** The address a link was requested for (shown back once sent). */
  protected readonly sentTo = signal<string | null>(null);

  ngOnInit(): void {
    const email = this.email();
    if (email) this.form.controls.email.setValue(email);
  }

  protected submit(): void {
    this.failure.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const email = this.form.getRawValue().email.trim();
    this.submitting.set(true);
    this.api.requestPasswordReset(email).subscribe({
      next: () => {
        this.submitting.set(false);
        this.sentTo.set(email);
      },
      error: (error: unknown) => {
        this.submitting.set(false);
        this.failure.set(apiProblem(error).message);
      },
    });
  }

  protected again(): void {
    this.sentTo.set(null);
  }
}
