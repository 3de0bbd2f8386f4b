import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import { Role, TeamDetail, TeamInvitation, TeamMember, TeamSummary } from '../api-types';
import { SHOW_ERRORS_INLINE } from '../http/api-error';

/** For requests made from a form that shows the error beside itself. */
const INLINE = { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };

function teamPath(teamId: string): string {
  return `/api/teams/${encodeURIComponent(teamId)}`;
}

/** Teams and memberships (`/api/teams…`). */
@Injectable({ providedIn: 'root' })
export class TeamsApi {
  private readonly http = inject(HttpClient);

  list(): Observable<TeamSummary[]> {
    return this.http.get<TeamSummary[]>('/api/teams');
  }

  create(name: string, slug: string): Observable<TeamSummary> {
    return this.http.post<TeamSummary>('/api/teams', { name, slug }, INLINE);
  }

  get(teamId: string): Observable<TeamDetail> {
    return this.http.get<TeamDetail>(teamPath(teamId));
  }

  members(teamId: string): Observable<TeamMember[]> {
    return this.http.get<TeamMember[]>(`${teamPath(teamId)}/members`);
  }

  /** Invites an address (the only way into a team); the answer is alike whether or not it has an account. */
  invite(teamId: string, email: string, roles: readonly Role[]): Observable<TeamInvitation> {
    return this.http.post<TeamInvitation>(`${teamPath(teamId)}/invitations`, { email, roles }, INLINE);
  }

  /** The team's invitations, newest first (owners). */
  invitations(teamId: string): Observable<TeamInvitation[]> {
    return this.http.get<TeamInvitation[]>(`${teamPath(teamId)}/invitations`);
  }

  setRoles(teamId: string, userId: string, roles: readonly Role[]): Observable<TeamMember> {
    return this.http.patch<TeamMember>(
      `${teamPath(teamId)}/members/${encodeURIComponent(userId)}`,
      { roles },
    );
  }

  removeMember(teamId: string, userId: string): Observable<void> {
    return this.http.delete<void>(`${teamPath(teamId)}/members/${encodeURIComponent(userId)}`);
  }
}
