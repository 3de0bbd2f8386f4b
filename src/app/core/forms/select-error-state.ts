import { Directive, inject, input } from '@angular/core';
import { MatSelect } from '@angular/material/select';
import { followErrorState } from './error-state';

/**
 * `rwErrorState` (core/forms/error-state.ts) for a `mat-select` that no form
 * control drives (a choice sent on its selection change and refused by a
 * rule): the form field's error outline and its `<mat-error>`, and
 * `aria-invalid` on the select. Its own file, so that pages without selects
 * do not load them.
 */
@Directive({ selector: 'mat-select[rwErrorState]' })
export class SelectErrorState {
  readonly rwErrorState = input.required<boolean>();

  constructor() {
    followErrorState(inject(MatSelect), this.rwErrorState);
  }
}
