/**
 * Spec helpers (component specs only: excluded from the app build by
 * tsconfig.app.json). The HTTP stack is the real one with the app's
 * interceptor over Angular's testing backend; only the snackbar is faked.
 */
import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { EnvironmentProviders, Provider } from '@angular/core';
import { provideRouter } from '@angular/router';
import { rollwiseInterceptor } from '../app/core/http/rollwise-interceptor';
import { Notifier } from '../app/core/layout/notifier';

/** A Notifier whose messages a spec can read back. */
export interface FakeNotifier {
  readonly error: ReturnType<typeof vi.fn>;
  readonly info: ReturnType<typeof vi.fn>;
}

export function fakeNotifier(): FakeNotifier {
  return { error: vi.fn(() => Promise.resolve()), info: vi.fn(() => Promise.resolve()) };
}

/** Router, HttpClient with the Rollwise interceptor on the testing backend, and `notifier`. */
export function shellTestProviders(notifier: FakeNotifier): (Provider | EnvironmentProviders)[] {
  return [
    provideRouter([]),
    provideHttpClient(withInterceptors([rollwiseInterceptor])),
    provideHttpClientTesting(),
    { provide: Notifier, useValue: notifier },
  ];
}
