import { signal, type Type, type WritableSignal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { DISPLAY_UNITS } from '../app/core/format/num-pipe';
import type { DisplayUnits } from '../app/core/api-types';

/**
 * The test bed of a routed feature page: the page at `path` with its route
 * parameters bound to inputs, HttpClient under the testing backend, and the
 * display units from `units` (set it to 'imperial' to read the page in
 * inch/pound). Returns the backend to answer the page's requests with.
 */
async function routedPageTestBed(path: string, page: Type<unknown>, units: WritableSignal<DisplayUnits>): Promise<HttpTestingController> {
  await TestBed.configureTestingModule({
    providers: [
      provideRouter([{ path, component: page }], withComponentInputBinding()),
      provideHttpClient(),
      provideHttpClientTesting(),
      { provide: DISPLAY_UNITS, useValue: units },
    ],
  }).compileComponents();
  return TestBed.inject(HttpTestingController);
}

/**
 * `routedPageTestBed` for every test of the calling describe block: the page's test bed set up before
 * each test with the units back at SI, and its backend verified after each (no request left unanswered).
 * Read `bed.backend` inside the tests; set `bed.units` to read the page in inch/pound.
 */
export function useRoutedPage(path: string, page: Type<unknown>): { readonly backend: HttpTestingController; readonly units: WritableSignal<DisplayUnits> } {
  const units = signal<DisplayUnits>('si');
  let backend: HttpTestingController | undefined;
  beforeEach(async () => {
    units.set('si');
    backend = await routedPageTestBed(path, page, units);
  });
  afterEach(() => backend?.verify());
  return {
    get backend(): HttpTestingController {
      if (!backend) throw new Error('useRoutedPage: the backend exists inside a test only');
      return backend;
    },
    units,
  };
}
