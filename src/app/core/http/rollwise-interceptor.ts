import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { Router } from '@angular/router';
import { catchError, finalize, throwError } from 'rxjs';
import { AuthService } from '../auth/auth-service';
import { LoadingIndicator } from '../layout/loading-indicator';
import { apiProblem, SHOW_ERRORS_INLINE } from './api-error';
import { Notifier } from '../layout/notifier';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Header the API requires on every state-changing request (CSRF defence). */
export const CSRF_HEADER = 'X-Rollwise-Request';

/**
 * Adds the CSRF header to state-changing requests, counts requests in flight
 * for the loading indicator, and turns the API's error JSON into a snackbar
 * (unless the caller shows errors inline). A 401 means the session has
 * ended: the user is sent to sign in and brought back afterwards.
 */
export const rollwiseInterceptor: HttpInterceptorFn = (request, next) => {
  const notifier = inject(Notifier);
  const loading = inject(LoadingIndicator);
  const auth = inject(AuthService);
  const router = inject(Router);

  const outgoing = SAFE_METHODS.has(request.method.toUpperCase())
    ? request
    : request.clone({ setHeaders: { [CSRF_HEADER]: '1' } });

  loading.begin();
  return next(outgoing).pipe(
    catchError((error: unknown) => {
      if (error instanceof HttpErrorResponse && !request.context.get(SHOW_ERRORS_INLINE)) {
        if (error.status === 401) {
          auth.forget();
          void notifier.error('Your session has ended. Please sign in again.');
          void router.navigate(['/sign-in'], {
            queryParams: { returnUrl: router.url },
          });
        } else {
          void notifier.error(apiProblem(error).message);
        }
      }
      return throwError(() => error);
    }),
    finalize(() => loading.end()),
  );
};
