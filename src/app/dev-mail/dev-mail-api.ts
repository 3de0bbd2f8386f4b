import { HttpClient, HttpContext, HttpErrorResponse } from '@angular/common/http';
import { inject, Injectable, signal } from '@angular/core';
import { Observable } from 'rxjs';
import { SHOW_ERRORS_INLINE } from '../core/http/api-error';

const INLINE = { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };

/** `GET /api/teams/:teamId/dev/mail` rows: what the local fake SMTP server captured. */
export interface CapturedMail {
  readonly id: string;
  readonly messageId: string;
  readonly from: string;
  readonly to: readonly string[];
  readonly subject: string;
  readonly text: string;
  readonly receivedAt: string;
}

function devMailPath(teamId: string): string {
  return `/api/teams/${encodeURIComponent(teamId)}/dev/mail`;
}

/**
 * Development mail (owners only). The route exists only on a development
 * server; `available` learns that once per page load from one HEAD request
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
  list(teamId: string): Observable<CapturedMail[]> {
    return this.http.get<CapturedMail[]>(devMailPath(teamId), INLINE);
  }

  /** Asks once (through a team the caller owns) whether this server has the route. */
  probe(teamId: string): void {
    if (this.availability() !== null || this.probing) return;
    this.probing = true;
    this.http.head(devMailPath(teamId), { ...INLINE, observe: 'response' }).subscribe({
      next: () => {
        this.probing = false;
        this.availability.set(true);
      },
      error: (error: unknown) => {
        this.probing = false;
        // Only "no such route" settles it; anything else (offline, roles changed) asks again later.
        if (error instanceof HttpErrorResponse && error.status === 404) this.availability.set(false);
      },
    });
  }
}
