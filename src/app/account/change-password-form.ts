import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import {
  FormGroupDirective,
  NonNullableFormBuilder,
  ReactiveFormsModule,
  Validators,
} from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { AuthService } from '../core/auth/auth-service';
import {
  matchingPasswords,
  MAX_PASSWORD_LENGTH,
  MIN_PASSWORD_LENGTH,
} from '../core/auth/password-rules';
import { apiProblem } from '../core/http/api-error';
import { NewPasswordFields } from '../core/forms/new-password-fields';

/** Current password, new password twice; success ends the user's other sessions. */
@Component({
  selector: 'rw-change-password-form',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [NewPasswordFields, ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatButtonModule],
  templateUrl: './change-password-form.html',
})
export class ChangePasswordForm {
  private readonly auth = inject(AuthService);

  protected readonly form = inject(NonNullableFormBuilder).group(
    {
      currentPassword: ['', [Validators.required]],
      newPassword: [
        '',
        [
          Validators.required,
          Validators.minLength(MIN_PASSWORD_LENGTH),
          Validators.maxLength(MAX_PASSWORD_LENGTH),
        ],
      ],
      confirm: ['', [Validators.required]],
    },
    { validators: matchingPasswords('newPassword', 'confirm') },
  );
  protected readonly submitting = signal(false);
  protected readonly failure = signal<string | null>(null);
  protected readonly done = signal(false);

  protected submit(formDirective: FormGroupDirective): void {
    this.failure.set(null);
    this.done.set(false);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { currentPassword, newPassword } = this.form.getRawValue();
    this.submitting.set(true);
    this.auth.changePassword(currentPassword, newPassword).subscribe({
      next: () => {
        this.submitting.set(false);
        formDirective.resetForm();
        this.done.set(true);
      },
      error: (error: unknown) => {
        this.submitting.set(false);
        this.failure.set(apiProblem(error).message);
      },
    });
  }
}
