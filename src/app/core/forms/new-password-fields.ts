import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { ControlContainer, FormGroupDirective, ReactiveFormsModule } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MAX_PASSWORD_LENGTH, MIN_PASSWORD_LENGTH } from '../auth/password-rules';

/**
 * A new password and its repetition, with their messages, inside the parent's
 * reactive form (`[formGroup]`). The group carries a `matchingPasswords`
 * validator; its `passwordsDiffer` error shows once the repeat is touched.
 * Used by registration, invitations, password reset and the account page.
 */
@Component({
  selector: 'rw-new-password-fields',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule],
  viewProviders: [{ provide: ControlContainer, useExisting: FormGroupDirective }],
  styles: ':host { display: contents; }',
  template: `
    <mat-form-field appearance="outline">
      <mat-label>{{ label() }}</mat-label>
      <input matInput [formControlName]="passwordControl()" [name]="passwordControl()" type="password" autocomplete="new-password" required />
      <mat-hint>At least {{ minPasswordLength }} characters.</mat-hint>
      @if (has(passwordControl(), 'required')) {
        <mat-error>{{ requiredMessage() }}</mat-error>
      } @else if (has(passwordControl(), 'minlength')) {
        <mat-error>Use at least {{ minPasswordLength }} characters.</mat-error>
      } @else if (has(passwordControl(), 'maxlength')) {
        <mat-error>Use at most {{ maxPasswordLength }} characters.</mat-error>
      }
    </mat-form-field>

    <mat-form-field appearance="outline">
      <mat-label>{{ repeatLabel() }}</mat-label>
      <input matInput [formControlName]="confirmControl()" [name]="confirmControl()" type="password" autocomplete="new-password" required />
      @if (has(confirmControl(), 'required')) {
        <mat-error>Repeat the password.</mat-error>
      }
    </mat-form-field>
    @if (group.form.hasError('passwordsDiffer') && group.form.get(confirmControl())?.touched) {
      <p class="rw-form-error" role="alert">The two passwords differ.</p>
    }
  `,
})
export class NewPasswordFields {
  readonly label = input('Password');
  readonly repeatLabel = input('Repeat password');
  readonly requiredMessage = input('Choose a password.');
  readonly passwordControl = input('password');
  readonly confirmControl = input('confirm');

  protected readonly group = inject(FormGroupDirective);
  protected readonly minPasswordLength = MIN_PASSWORD_LENGTH;
  protected readonly maxPasswordLength = MAX_PASSWORD_LENGTH;

  protected has(control: string, error: string): boolean {
    return this.group.form.get(control)?.hasError(error) ?? false;
  }
}
