import { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';

/** The API's minimum password length (contracts: register, change-password). */
export const MIN_PASSWORD_LENGTH = 10;

/** bcrypt reads at most 72 bytes; the API refuses longer passwords. */
export const MAX_PASSWORD_LENGTH = 72;

/** Group validator: the `second` field must repeat the `first` one. */
export function matchingPasswords(first = 'password', second = 'confirm'): ValidatorFn {
  return (group: AbstractControl): ValidationErrors | null => {
    const a: unknown = group.get(first)?.value;
    const b: unknown = group.get(second)?.value;
    return a && b && a !== b ? { passwordsDiffer: true } : null;
  };
}
