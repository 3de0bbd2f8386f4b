import { Directive, effect, inject, input } from '@angular/core';
import type { ErrorStateMatcher } from '@angular/material/core';
import { MatInput } from '@angular/material/input';
import type { Subject } from 'rxjs';

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
    followErrorState(inject(MatInput), this.rwErrorState);
  }
}

/** What a Material control with an error state offers (an input, a chip grid): its matcher, its update, its change stream. */
interface ErrorStateControl {
  errorStateMatcher: ErrorStateMatcher;
  updateErrorState(): void;
  readonly stateChanges: Subject<void>;
}

/**
 * Makes `control` show its error state exactly while `inError()` is true, and tells its form field
 * whenever that changes. The one way the `rwErrorState` directives drive a control; call it in an
 * injection context (it creates an effect).
 */
export function followErrorState(control: ErrorStateControl, inError: () => boolean): void {
  control.errorStateMatcher = { isErrorState: () => inError() };
  effect(() => {
    inError();
    control.updateErrorState();
    control.stateChanges.next();
  });
}
