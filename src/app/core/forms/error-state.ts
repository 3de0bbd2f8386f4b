import { Directive, effect, inject, input } from '@angular/core';
import { MatInput } from '@angular/material/input';

/**
 * Puts a `matInput` that no form control drives into its error state while
 * `rwErrorState` is true: the form field draws its error outline, shows its
 * `<mat-error>` (and points the input's `aria-describedby` at it), and the
 * input says `aria-invalid="true"`. For inputs committed by hand on their
 * change event, e.g. the hardpoint table's cells:
 *
 * ```html
 * <mat-form-field subscriptSizing="dynamic">
 *   <input matInput [rwErrorState]="!!error()" (change)="commit($event)" />
 *   <mat-error>{{ error() }}</mat-error>
 * </mat-form-field>
 * ```
 */
@Directive({ selector: 'input[matInput][rwErrorState]' })
export class ErrorState {
  readonly rwErrorState = input.required<boolean>();

  constructor() {
    const control = inject(MatInput);
    control.errorStateMatcher = { isErrorState: () => this.rwErrorState() };
    effect(() => {
      this.rwErrorState();
      control.updateErrorState();
    });
  }
}
