import { Directive, inject, input } from '@angular/core';
import { MatChipGrid } from '@angular/material/chips';
import { followErrorState } from './error-state';

/**
 * `rwErrorState` (core/forms/error-state.ts) for a `mat-chip-grid` that no form
 * control drives (a list of single values added by hand, e.g. the study form's
 * rack positions): the form field's error outline and its `<mat-error>`, and
 * `aria-invalid` on the grid. Its own file, so that pages with plain inputs do
 * not load the chips.
 */
@Directive({ selector: 'mat-chip-grid[rwErrorState]' })
export class ChipGridErrorState {
  readonly rwErrorState = input.required<boolean>();

  constructor() {
    followErrorState(inject(MatChipGrid), this.rwErrorState);
  }
}
