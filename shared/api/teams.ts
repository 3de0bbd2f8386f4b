/**
 * Response types of the teams, invitations and activity API (docs/api.md), as
 * they travel: timestamps are ISO 8601 UTC strings. The server's handlers are
 * checked against them (server/http/reply.ts) and the app's data access reads
 * them; framework-free types only.
 */
import type { Permission, Role } from '../schema/roles.js';
import type { Me } from './accounts.js';

/** `GET /api/teams` rows. */
export interface TeamSummary {
  readonly id: string;
  readonly name: string;
  readonly slug: string;
  readonly roles: readonly Role[];
}

/** `GET /api/teams/:teamId`: the caller's own roles and permissions. */
export interface TeamDetail extends TeamSummary {
  readonly permissions: readonly Permission[];
}

export interface TeamMember {
  readonly userId: string;
  readonly email: string;
  readonly displayName: string;
  readonly roles: readonly Role[];
}

/** `POST /api/teams/:teamId/invitations` answer and `GET …/invitations` rows (the list adds who invited, and when). */
export interface TeamInvitation {
  readonly id: string;
  readonly email: string;
  readonly roles: readonly Role[];
  readonly expiresAt: string;
  readonly acceptedAt: string | null;
  readonly invitedByName?: string | null;
  readonly createdAt?: string;
}

/** `GET /api/invitations/:token`: what the invitation offers. Reading it never accepts. */
export interface InvitationInfo {
  readonly teamId: string;
  readonly teamName: string;
  /** The invited address (lower-case). */
  readonly email: string;
  readonly roles: readonly Role[];
  readonly invitedByName: string | null;
  readonly expiresAt: string;
}

/** `POST /api/invitations/:token/accept`. */
export interface AcceptedInvitation {
  readonly teamId: string;
  readonly me: Me;
}

/** `GET /api/teams/:teamId/activity` rows (newest first); `at` is UTC. */
export interface ActivityEntry {
  readonly id: string;
  readonly at: string;
  readonly actorName: string | null;
  readonly action: string;
  readonly subjectType: string;
  readonly subjectId: string | null;
  readonly designId: string | null;
  readonly summary: string;
}
