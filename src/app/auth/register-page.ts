import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { homeUrl } from '../core/auth/auth-guards';
import { AuthService } from '../core/auth/auth-service';
import {
  matchingPasswords,
  MAX_PASSWORD_LENGTH,
  MIN_PASSWORD_LENGTH,
} from '../core/auth/password-rules';
import { apiProblem } from '../core/http/api-error';
import { NewPasswordFields } from '../core/forms/new-password-fields';

@Component({
  selector: 'rw-register-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [NewPasswordFields, ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatButtonModule, RouterLink],
  templateUrl: './register-page.html',
})
export class RegisterPage {
  private readonly auth = inject(AuthService);
  private readonly router = inject(Router);

  protected readonly form = inject(NonNullableFormBuilder).group(
    {
      displayName: ['', [Validators.required, Validators.maxLength(100)]],
      email: ['', [Validators.required, Validators.email]],
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

  protected submit(): void {
    this.failure.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { displayName, email, password } = this.form.getRawValue();
    this.submitting.set(true);
    this.auth.register(email.trim(), password, displayName.trim()).subscribe({
      next: () => void this.router.navigateByUrl(homeUrl(this.auth)),
      error: (error: unknown) => {
        this.submitting.set(false);
        const problem = apiProblem(error);
        if (problem.code === 'email_taken') {
          this.form.controls.email.setErrors({ taken: true });
        }
        this.failure.set(problem.message);
      },
    });
  }
}
