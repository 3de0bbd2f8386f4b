import { computed, type Resource, type Signal } from '@angular/core';
import { catchError, map, Observable, of, startWith } from 'rxjs';
import { apiProblem, type ApiProblem } from './api-error';

/**
 * What a screen shows while it fetches something: loading, the value, or why
 * it failed. The one load-state shape of the app: pages load through
 * `rxResource()` and read it with `loadState(resource)`.
 */
export type LoadState<T> =
  | { readonly status: 'loading' }
  | { readonly status: 'ready'; readonly value: T }
  | { readonly status: 'error'; readonly message: string };

/** The API problem behind a resource's error (rxResource wraps values that are not Error-like). */
export function resourceProblem(error: unknown): ApiProblem {
  const inner = error instanceof Error && error.name === 'Error' && error.cause !== undefined ? error.cause : error;
  return apiProblem(inner);
}

/**
 * A resource as a LoadState. While the same request reloads (`reload()`),
 * the value already shown stays `ready`; a new request (new route id)
 * shows `loading` until its answer arrives.
 */
export function loadState<T>(resource: Resource<T | undefined>): Signal<LoadState<T>> {
  return computed<LoadState<T>>(() => {
    if (resource.status() === 'error') {
      return { status: 'error', message: resourceProblem(resource.error()).message };
    }
    return resource.hasValue() ? { status: 'ready', value: resource.value() as T } : { status: 'loading' };
  });
}

/** Transitional: one request as the states a screen walks through (pages move to `loadState(rxResource(…))`). */
export function toLoadState<T>(request: Observable<T>): Observable<LoadState<T>> {
  return request.pipe(
    map((value): LoadState<T> => ({ status: 'ready', value })),
    catchError((error: unknown) => of<LoadState<T>>({ status: 'error', message: apiProblem(error).message })),
    startWith<LoadState<T>>({ status: 'loading' }),
  );
}
