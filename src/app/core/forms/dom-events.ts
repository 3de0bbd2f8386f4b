/**
 * Reading a native control from its event, typed, for templates that bind
 * `(change)` / `(input)` on plain inputs and selects (no `$any()` in templates).
 * Components expose the ones they use: `protected readonly inputValue = inputValue;`.
 */
export function inputValue(event: Event): string {
  return (event.target as HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement).value;
}
