import { computed, type Resource, type Signal } from '@angular/core';
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
