/**
 * Reading a native control from its event, typed, for templates that bind
 * `(change)` / `(input)` on plain inputs and selects (no `$any()` in templates).
 * Components expose the ones they use: `protected readonly inputValue = inputValue;`.
 */
export function inputValue(event: Event): string {
  return (event.target as HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement).value;
}

export function inputChecked(event: Event): boolean {
  return (event.target as HTMLInputElement).checked;
}

/** The chosen option when it is one of `allowed`, else null (a select's value typed as its union). */
export function chosenOption<T extends string>(event: Event, allowed: readonly T[]): T | null {
  const v = inputValue(event);
  return (allowed as readonly string[]).includes(v) ? (v as T) : null;
}

/**
 * A native select's value typed as the union its options are written from
 * (`axle.set(optionValue($event))` infers the union from where it goes). The
 * select lists only those values, so the value read back is one of them.
 */
export function optionValue<T extends string>(event: Event): T {
  return inputValue(event) as T;
}
