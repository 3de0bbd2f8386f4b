import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { homeUrl, safeReturnUrl } from '../core/auth/auth-guards';
import { AuthService } from '../core/auth/auth-service';
import { apiProblem } from '../core/http/api-error';

@Component({
  selector: 'rw-sign-in-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatButtonModule, RouterLink],
  templateUrl: './sign-in-page.html',
  styles: `
    .forgot {
      margin: -0.5rem 0 0;
    }
  `,
})
export class SignInPage {
  private readonly auth = inject(AuthService);
  private readonly router = inject(Router);
  /** `?returnUrl=`: where a guard sent the visitor from (only same-site paths are followed). */
  readonly returnUrl = input<string | undefined>(undefined);

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
    password: ['', [Validators.required]],
  });
  protected readonly submitting = signal(false);
  protected readonly failure = signal<string | null>(null);

  /** The reset page starts with the address typed here, if any. */
  protected forgotParams(): { email?: string } {
    const email = this.form.controls.email.value.trim();
    return email ? { email } : {};
  }

  protected submit(): void {
    this.failure.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { email, password } = this.form.getRawValue();
    this.submitting.set(true);
    this.auth.signIn(email.trim(), password).subscribe({
      next: () => {
        const target =
          safeReturnUrl(this.returnUrl() ?? null) ?? homeUrl(this.auth);
        void this.router.navigateByUrl(target);
      },
      error: (error: unknown) => {
        this.submitting.set(false);
        this.form.controls.password.reset();
        this.failure.set(apiProblem(error).message);
      },
    });
  }
}
