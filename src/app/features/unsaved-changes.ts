import { Signal } from '@angular/core';
import { CanDeactivateFn } from '@angular/router';

/** A screen that may hold edits not yet saved. */
export interface HoldsUnsavedChanges {
  readonly dirty: Signal<boolean>;
}

/** Asks before leaving a screen with unsaved changes. */
export const unsavedChangesGuard: CanDeactivateFn<HoldsUnsavedChanges> = (component) =>
  !component?.dirty() || globalThis.confirm('You have unsaved changes. Leave this page and lose them?');
