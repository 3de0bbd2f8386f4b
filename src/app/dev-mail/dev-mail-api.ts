import { HttpClient, HttpContext, HttpErrorResponse } from '@angular/common/http';
import { inject, Injectable, signal } from '@angular/core';
import { Observable } from 'rxjs';
import { SHOW_ERRORS_INLINE } from '../core/http/api-error';
import type { CapturedMail } from '../../../shared/api/accounts';

// The answer's type is the server's (shared/api/accounts.ts).
export type { CapturedMail } from '../../../shared/api/accounts';

const INLINE = { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };


const DEV_MAIL_PATH = '/api/dev/mail';

/**
 * The signed-in person's own development mailbox (mail addressed to them,
 * nobody else's). The route exists only on a development server; `available` learns that once per page load from one HEAD request
 * (404 on a production server), so the navigation shows the page only where
 * it works.
 */
@Injectable({ providedIn: 'root' })
export class DevMailApi {
  private readonly http = inject(HttpClient);
  private readonly availability = signal<boolean | null>(null);
  private probing = false;

  /** null until known; false on a production server. */
  readonly available = this.availability.asReadonly();

  /** Newest first, at most 200. The page shows the errors itself. */
  list(): Observable<CapturedMail[]> {
    return this.http.get<CapturedMail[]>(DEV_MAIL_PATH, INLINE);
  }

  /** Asks once (signed in) whether this server has the route. */
  probe(): void {
    if (this.availability() !== null || this.probing) return;
    this.probing = true;
    this.http.head(DEV_MAIL_PATH, { ...INLINE, observe: 'response' }).subscribe({
      next: () => {
        this.probing = false;
        this.availability.set(true);
      },
      error: (error: unknown) => {
        this.probing = false;
        // Only "no such route" settles it; anything else (offline, signed out) asks again later.
        if (error instanceof HttpErrorResponse && error.status === 404) this.availability.set(false);
      },
    });
  }
}
