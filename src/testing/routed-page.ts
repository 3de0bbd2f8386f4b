import { type Type, type WritableSignal } from '@angular/core';
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
export async function routedPageTestBed(path: string, page: Type<unknown>, units: WritableSignal<DisplayUnits>): Promise<HttpTestingController> {
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
