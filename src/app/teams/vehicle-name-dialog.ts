import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';

export interface VehicleNameDialogData {
  readonly title: string;
  readonly confirmLabel: string;
  readonly name: string;
}

export const VEHICLE_NAME_MAX_LENGTH = 120;

/** Asks for a vehicle name (new vehicle or rename); closes with the trimmed name. */
@Component({
  selector: 'rw-vehicle-name-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatDialogModule, MatFormFieldModule, MatInputModule, MatButtonModule],
  template: `
    <h2 mat-dialog-title>{{ data.title }}</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content>
        <mat-form-field appearance="outline" class="name-field">
          <mat-label>Vehicle name</mat-label>
          <input matInput formControlName="name" required cdkFocusInitial autocomplete="off" />
          <mat-hint>For example the car's number and nickname.</mat-hint>
          @if (form.controls.name.hasError('required')) {
            <mat-error>Enter a name.</mat-error>
          } @else if (form.controls.name.hasError('maxlength')) {
            <mat-error>Keep it to {{ maxLength }} characters or fewer.</mat-error>
          }
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Cancel</button>
        <button mat-flat-button type="submit">{{ data.confirmLabel }}</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .name-field {
      width: 100%;
      min-width: 20rem;
      margin-top: 0.25rem;
    }
  `,
})
export class VehicleNameDialog {
  protected readonly data = inject<VehicleNameDialogData>(MAT_DIALOG_DATA);
  private readonly dialogRef = inject<MatDialogRef<VehicleNameDialog, string>>(MatDialogRef);
  protected readonly maxLength = VEHICLE_NAME_MAX_LENGTH;
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: [this.data.name, [Validators.required, Validators.maxLength(VEHICLE_NAME_MAX_LENGTH)]],
  });

  protected submit(): void {
    const name = this.form.controls.name.value.trim();
    if (!name) this.form.controls.name.setErrors({ required: true });
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.dialogRef.close(name);
  }
}
