import { catchError, map, Observable, of, startWith } from 'rxjs';
import { apiProblem } from './api-error';

/** What a screen shows while it fetches something: loading, the value, or why it failed. */
export type LoadState<T> =
  | { readonly status: 'loading' }
  | { readonly status: 'ready'; readonly value: T }
  | { readonly status: 'error'; readonly message: string };

/**
 * Turns one request into the states a screen walks through: `loading` at
 * once, then `ready` with the value or `error` with the API's message.
 * Use inside `switchMap` so a newer request replaces an older one.
 */
export function toLoadState<T>(request: Observable<T>): Observable<LoadState<T>> {
  return request.pipe(
    map((value): LoadState<T> => ({ status: 'ready', value })),
    catchError((error: unknown) => of<LoadState<T>>({ status: 'error', message: apiProblem(error).message })),
    startWith<LoadState<T>>({ status: 'loading' }),
  );
}
