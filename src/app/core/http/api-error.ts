import { HttpContextToken, HttpErrorResponse } from '@angular/common/http';
import { ApiErrorBody } from '../api-types';

/**
 * Set on a request whose errors the caller shows itself (inline in a form,
 * or as an expected outcome such as 401 from `GET /api/auth/me`), so the
 * error interceptor does not also raise a snackbar.
 */
export const SHOW_ERRORS_INLINE = new HttpContextToken<boolean>(() => false);

function isApiErrorBody(body: unknown): body is ApiErrorBody {
  if (typeof body !== 'object' || body === null || !('error' in body)) return false;
  const inner = (body).error;
  return (
    typeof inner === 'object' &&
    inner !== null &&
    typeof (inner as { message?: unknown }).message === 'string' &&
    typeof (inner as { code?: unknown }).code === 'string'
  );
}

export interface ApiProblem {
  readonly status: number;
  readonly code: string;
  readonly message: string;
  readonly details?: unknown;
}

/** Reads the API's `{ error: { code, message } }` shape, with plain fallbacks. */
export function apiProblem(error: unknown): ApiProblem {
  if (error instanceof HttpErrorResponse) {
    if (isApiErrorBody(error.error)) {
      return {
        status: error.status,
        code: error.error.error.code,
        message: error.error.error.message,
        details: error.error.error.details,
      };
    }
    if (error.status === 0) {
      return {
        status: 0,
        code: 'network',
        message: 'The Rollwise server could not be reached. Check your connection and try again.',
      };
    }
    return {
      status: error.status,
      code: 'http_' + error.status,
      message: `The server answered ${error.status}${error.statusText ? ' ' + error.statusText : ''}.`,
    };
  }
  return {
    status: -1,
    code: 'unexpected',
    message: error instanceof Error ? error.message : 'Something unexpected went wrong.',
  };
}
