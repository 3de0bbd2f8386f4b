import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { AcceptedInvitation, InvitationInfo } from '../../../shared/api/teams';
import { SHOW_ERRORS_INLINE } from '../core/http/api-error';

/** The invitation page explains every refusal itself. */
const INLINE = { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };

// The answers' types are the server's (shared/api/teams.ts).
export type { AcceptedInvitation, InvitationInfo } from '../../../shared/api/teams';

/** A new person's account, created by accepting. */
export interface InvitationRegistration {
  readonly displayName: string;
  readonly password: string;
}

function linkPath(token: string): string {
  return `/api/invitations/${encodeURIComponent(token)}`;
}

/** Invitation links (public: the signed token is the credential). */
@Injectable({ providedIn: 'root' })
export class InvitationsApi {
  private readonly http = inject(HttpClient);

  /** 404 `invitation_invalid`, 410 `invitation_expired` / `invitation_used`. */
  get(token: string): Observable<InvitationInfo> {
    return this.http.get<InvitationInfo>(linkPath(token), INLINE);
  }

  /**
   * Signed in: `{}` (the account's address must be the invited one, else 403
   * `wrong_email`, and confirmed, else 403 `email_unverified`). Signed out:
   * the new account's name and password.
   */
  accept(token: string, registration?: InvitationRegistration): Observable<AcceptedInvitation> {
    return this.http.post<AcceptedInvitation>(`${linkPath(token)}/accept`, registration ?? {}, INLINE);
  }
}
