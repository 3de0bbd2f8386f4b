/**
 * The permission matrix: which role grants which permission. The one source
 * the authorization middleware reads; docs/permissions.md shows the same
 * table for people.
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
  'review:submit',
  'review:comment',
] as const;
export type Permission = (typeof PERMISSIONS)[number];

export const ROLE_PERMISSIONS: Readonly<Record<Role, readonly Permission[]>> = {
  owner: ['team:read', 'members:manage', 'vehicle:manage', 'review:comment'],
  engineer: ['team:read', 'vehicle:manage', 'vehicle:edit', 'design:propose', 'review:submit', 'review:comment'],
  designer: ['team:read', 'vehicle:manage', 'design:edit', 'design:accept', 'review:submit', 'review:comment'],
  reviewer: ['team:read', 'review:decide', 'review:comment'],
  viewer: ['team:read'],
};

/** Union of the permissions of a set of roles, in matrix order. */
export function permissionsOf(roles: readonly string[]): Permission[] {
  const granted = new Set<Permission>();
  for (const r of roles) for (const p of ROLE_PERMISSIONS[r as Role] ?? []) granted.add(p);
  return PERMISSIONS.filter((p) => granted.has(p));
}

export function hasPermission(roles: readonly string[], permission: Permission): boolean {
  return roles.some((r) => (ROLE_PERMISSIONS[r as Role] ?? []).includes(permission));
}
