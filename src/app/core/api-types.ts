/**
 * Shapes of the Rollwise HTTP API as the browser sees them
 * (see coord/contracts.md, "HTTP API"). Dates arrive as ISO strings.
 */

// Roles, permissions and the matrix: one copy, shared with the server.
export { PERMISSIONS, ROLE_PERMISSIONS, ROLES } from '../../../shared/schema/roles';
export type { Permission, Role } from '../../../shared/schema/roles';
import type { Permission, Role } from '../../../shared/schema/roles';

export type DisplayUnits = 'si' | 'imperial';

export interface User {
  readonly id: string;
  readonly email: string;
  readonly displayName: string;
  readonly displayUnits: DisplayUnits;
  /** The address was confirmed (verification link, invitation or password reset). */
  readonly emailVerified?: boolean;
  /** May create programmes (an account property, not a team role). */
  readonly instructor?: boolean;
}

export interface Membership {
  readonly teamId: string;
  readonly teamName: string;
  readonly teamSlug: string;
  readonly roles: readonly Role[];
}

/** `GET /api/auth/me`, also returned by sign-in, register and profile updates. */
export interface Me {
  readonly user: User;
  readonly memberships: readonly Membership[];
}

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

/** `GET /api/teams/:teamId/vehicles` rows. */
export interface VehicleSummary {
  readonly id: string;
  readonly name: string;
  readonly archived: boolean;
  readonly revision: number;
  readonly updatedAt: string;
  readonly updatedByName: string | null;
}

/** The one error shape of the API. */
export interface ApiErrorBody {
  readonly error: {
    readonly code: string;
    readonly message: string;
    readonly details?: unknown;
  };
}

/** What each role is for, in plain words (shown beside the role choices). */
export const ROLE_DESCRIPTIONS: Readonly<Record<Role, string>> = {
  owner: 'Manages members and roles',
  engineer: 'Vehicle data and handling intent; proposes geometry',
  designer: 'Hardpoints and axle designs; accepts proposals',
  reviewer: 'Reads everything; approves or requests changes',
  viewer: 'Reads only',
};
