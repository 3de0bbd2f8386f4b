/**
 * Team roles and the permissions they grant: the one copy read by the
 * server's authorization middleware (server/permissions.ts) and by the app
 * (src/app/core/api-types.ts). docs/permissions.md shows the same table for
 * people. Pure data, no imports.
 */

/** The roles a membership can hold (a membership holds a set of them). */
export const ROLES = ['owner', 'engineer', 'designer', 'reviewer', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

/** Every permission a route can declare, in the order the API lists them. */
export const PERMISSIONS = [
  'team:read',
  'members:manage',
  'vehicle:manage',
  'vehicle:edit',
  'design:edit',
  'design:propose',
  'design:accept',
  'review:decide',
  'review:submit',
  'review:comment',
  'study:run',
] as const;
export type Permission = (typeof PERMISSIONS)[number];

/** The matrix: which permissions each role grants. */
export const ROLE_PERMISSIONS: Readonly<Record<Role, readonly Permission[]>> = {
  owner: ['team:read', 'members:manage', 'vehicle:manage', 'review:comment'],
  engineer: ['team:read', 'vehicle:manage', 'vehicle:edit', 'design:propose', 'review:submit', 'review:comment', 'study:run'],
  designer: ['team:read', 'vehicle:manage', 'design:edit', 'design:accept', 'review:submit', 'review:comment', 'study:run'],
  reviewer: ['team:read', 'review:decide', 'review:comment'],
  viewer: ['team:read'],
};
