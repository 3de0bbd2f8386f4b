import { ChangeDetectionStrategy, Component, effect, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { DisplayUnits } from '../core/api-types';
import { AuthService } from '../core/auth/auth-service';
import { apiProblem } from '../core/http/api-error';
import { ApiTokensSection } from './api-tokens-section';
import { ChangePasswordForm } from './change-password-form';
import { Notifier } from '../core/layout/notifier';

/** The signed-in user's name, display units, password and personal API tokens. */
@Component({
  selector: 'rw-account-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ReactiveFormsModule,
    MatFormFieldModule,
    MatInputModule,
    MatRadioModule,
    MatButtonModule,
    ChangePasswordForm,
    ApiTokensSection,
  ],
  templateUrl: './account-page.html',
  styleUrl: './account-page.scss',
})
export class AccountPage {
  protected readonly auth = inject(AuthService);
  private readonly notifier = inject(Notifier);

  protected readonly form = inject(NonNullableFormBuilder).group({
    displayName: ['', [Validators.required, Validators.maxLength(100)]],
    displayUnits: ['si' as DisplayUnits, [Validators.required]],
  });
  protected readonly saving = signal(false);
  protected readonly failure = signal<string | null>(null);

  constructor() {
    // Fill the form from the profile whenever it (re)loads and nothing is being edited.
    effect(() => {
      const user = this.auth.user();
      if (user && !this.form.dirty) {
        this.form.setValue({ displayName: user.displayName, displayUnits: user.displayUnits });
      }
    });
  }

  protected save(): void {
    this.failure.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { displayName, displayUnits } = this.form.getRawValue();
    this.saving.set(true);
    this.auth.updateProfile({ displayName: displayName.trim(), displayUnits }).subscribe({
      next: (me) => {
        this.saving.set(false);
        this.form.reset({ displayName: me.user.displayName, displayUnits: me.user.displayUnits });
        void this.notifier.info('Profile saved.');
      },
      error: (error: unknown) => {
        this.saving.set(false);
        this.failure.set(apiProblem(error).message);
      },
    });
  }
}
