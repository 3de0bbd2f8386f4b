/**
 * Authorization helpers over the permission matrix. The roles, permissions
 * and the matrix itself live in shared/schema/roles.ts (the app reads the
 * same copy); docs/permissions.md shows the table for people.
 */
import { PERMISSIONS, ROLE_PERMISSIONS, type Permission, type Role } from '../shared/schema/roles.js';

export { PERMISSIONS, ROLE_PERMISSIONS, ROLES, type Permission, type Role } from '../shared/schema/roles.js';

/** Union of the permissions of a set of roles, in matrix order. */
export function permissionsOf(roles: readonly string[]): Permission[] {
  const granted = new Set<Permission>();
  for (const r of roles) for (const p of ROLE_PERMISSIONS[r as Role] ?? []) granted.add(p);
  return PERMISSIONS.filter((p) => granted.has(p));
}

export function hasPermission(roles: readonly string[], permission: Permission): boolean {
  return roles.some((r) => (ROLE_PERMISSIONS[r as Role] ?? []).includes(permission));
}
