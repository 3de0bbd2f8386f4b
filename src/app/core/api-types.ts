/**
 * Shapes of the Rollwise HTTP API as the browser sees them
 * (see coord/contracts.md, "HTTP API"). Dates arrive as ISO strings.
 */

export const ROLES = ['owner', 'engineer', 'designer', 'reviewer', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  'team:read',
  'members:manage',
  'vehicle:manage',
  'vehicle:edit',
  'design:edit',
  'design:propose',
  'design:accept',
  'review:decide',
] as const;
export type Permission = (typeof PERMISSIONS)[number];

export type DisplayUnits = 'si' | 'imperial';

export interface User {
  readonly id: string;
  readonly email: string;
  readonly displayName: string;
  readonly displayUnits: DisplayUnits;
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
