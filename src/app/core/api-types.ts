/**
 * Shapes of the Rollwise HTTP API as the browser sees them
 * (docs/api.md). Dates arrive as ISO strings.
 */

// Roles, permissions and the matrix: one copy, shared with the server.
export { PERMISSIONS, ROLE_PERMISSIONS, ROLES } from '../../../shared/schema/roles';
export type { Permission, Role } from '../../../shared/schema/roles';
import type { Role } from '../../../shared/schema/roles';

// The answers' types are the server's (shared/api/accounts.ts, teams.ts).
export type { DisplayUnits, Me, Membership, User } from '../../../shared/api/accounts';
export type { TeamDetail, TeamInvitation, TeamMember, TeamSummary } from '../../../shared/api/teams';

/** `GET /api/teams/:teamId/vehicles` rows. */
export type { VehicleSummary } from '../../../shared/api/documents';

/** The one error shape of the API (the server's, shared/api/common.ts). */
export type { ApiErrorBody } from '../../../shared/api/common';

/** What each role is for, in plain words (shown beside the role choices). */
export const ROLE_DESCRIPTIONS: Readonly<Record<Role, string>> = {
  owner: 'Manages members and roles',
  engineer: 'Vehicle data and handling intent; proposes geometry',
  designer: 'Hardpoints and axle designs; accepts proposals',
  reviewer: 'Reads everything; approves or requests changes',
  viewer: 'Reads only',
};
