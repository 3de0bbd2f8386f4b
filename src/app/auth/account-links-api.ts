import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { map, Observable } from 'rxjs';
import { SHOW_ERRORS_INLINE } from '../core/http/api-error';

/** These pages show every refusal beside the form, not in a snackbar. */
const INLINE = { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };

/**
 * The links Rollwise mails (password reset, address confirmation) and the
 * request for a reset link. All public: the token in the link is the credential.
 */
@Injectable({ providedIn: 'root' })
export class AccountLinksApi {
  private readonly http = inject(HttpClient);

  /** 202 whether or not the address has an account (nothing is disclosed). */
  requestPasswordReset(email: string): Observable<void> {
    return this.http.post('/api/auth/password-reset', { email }, INLINE).pipe(map(() => undefined));
  }

  /** 204; every session of the account ends. 400 `reset_link_invalid`. */
  confirmPasswordReset(token: string, newPassword: string): Observable<void> {
    return this.http
      .post('/api/auth/password-reset/confirm', { token, newPassword }, INLINE)
      .pipe(map(() => undefined));
  }

  /** 200; 400 `verification_invalid`, 410 `verification_expired`. */
  verifyEmail(token: string): Observable<void> {
    return this.http.post('/api/auth/verify-email', { token }, INLINE).pipe(map(() => undefined));
  }

  /** Signed in: mails a new confirmation link. 409 `already_verified`. */
  resendVerification(): Observable<void> {
    return this.http.post('/api/auth/verify-email/resend', {}, INLINE).pipe(map(() => undefined));
  }
}
