import { TestBed } from '@angular/core/testing';

/**
 * Spec helpers for Angular Material controls, driven as a person would: open
 * a mat-select and click the option by its text, tick a mat-checkbox or a
 * mat-radio-button by its label, type into a matInput. Each runs change
 * detection after the event (zoneless: `TestBed.tick()`), so the page has
 * reacted when the helper returns.
 */

/** The mat-select under `root` matching `selector` (e.g. `mat-select[name="vehicle"]`), or a failure naming it. */
export function matSelect(root: ParentNode, selector: string): HTMLElement {
  const el = root.querySelector<HTMLElement>(selector);
  if (!el) throw new Error(`no mat-select ${selector}`);
  return el;
}

/** The option texts of a mat-select, in order (opens the panel and closes it again). */
export function optionTexts(select: HTMLElement): string[] {
  const texts = openSelect(select).map((o) => o.textContent.trim());
  document.querySelector<HTMLElement>('.cdk-overlay-backdrop')?.click();
  TestBed.tick();
  return texts;
}

/** Opens the select's panel and returns its options (a panel still closing from another select is not among them). */
function openSelect(select: HTMLElement): HTMLElement[] {
  const trigger = select.querySelector<HTMLElement>('.mat-mdc-select-trigger');
  if (!trigger) throw new Error('not a mat-select (no trigger)');
  trigger.click();
  TestBed.tick();
  const panelId = select.getAttribute('aria-controls');
  const panel = panelId ? document.getElementById(panelId) : null;
  if (!panel) throw new Error('the mat-select did not open its panel');
  return [...panel.querySelectorAll<HTMLElement>('mat-option')];
}

/**
 * Opens `select` and clicks the option whose text is `label` (exactly, or
 * matching a RegExp). Fails with the options there are when none matches.
 */
export function chooseOption(select: HTMLElement, label: string | RegExp): void {
  const options = openSelect(select);
  const match = options.find((o) => {
    const text = o.textContent.trim();
    return typeof label === 'string' ? text === label : label.test(text);
  });
  if (!match) throw new Error(`no option ${String(label)} among: ${options.map((o) => o.textContent.trim()).join(' | ')}`);
  match.click();
  TestBed.tick();
}

/** Ticks or clears the mat-checkbox (or mat-radio-button) under `root` whose label text contains `label`. */
export function clickToggle(root: ParentNode, label: string): void {
  const hosts = [...root.querySelectorAll<HTMLElement>('mat-checkbox, mat-radio-button')];
  const host = hosts.find((h) => h.textContent.includes(label));
  if (!host) throw new Error(`no checkbox or radio button labelled ${label}`);
  host.querySelector<HTMLInputElement>('input')!.click();
  TestBed.tick();
}

/** Types `value` into the input or textarea under `root` matching `selector`, as an `input` event. */
export function typeInto(root: ParentNode, selector: string, value: string): void {
  const el = root.querySelector<HTMLInputElement | HTMLTextAreaElement>(selector);
  if (!el) throw new Error(`no input ${selector}`);
  el.value = value;
  el.dispatchEvent(new Event('input'));
  TestBed.tick();
}
