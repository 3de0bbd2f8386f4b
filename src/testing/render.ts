import type { Type } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';

/**
 * Creates `component` with its inputs set (by their public names) and runs a first change
 * detection: the one way a component spec renders the component it tests.
 *
 * ```ts
 * const fixture = renderComponent(HardpointTable, { corner, editable: true });
 * ```
 */
export function renderComponent<T>(component: Type<T>, inputs: Readonly<Record<string, unknown>> = {}): ComponentFixture<T> {
  const fixture = TestBed.createComponent(component);
  for (const [name, value] of Object.entries(inputs)) fixture.componentRef.setInput(name, value);
  fixture.detectChanges();
  return fixture;
}
