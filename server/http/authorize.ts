/**
 * The one authorization middleware. Every route declares what it needs:
 * `requireUser` (signed in) or `requirePermission('vehicle:edit')` (signed in,
 * a member of :teamId, holding a role that grants the permission).
 * Non-members get 404 (a team's existence is not disclosed); members without
 * the permission get 403 `forbidden`.
 */
import type { RequestHandler, Request } from 'express';
import { and, eq } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { memberships, users } from '../db/schema.js';
import { hasPermission, type Permission, type Role } from '../permissions.js';
import { HttpError } from './errors.js';
import { notFound } from '../../shared/errors.js';
import { tokenAllows, tokenAllowsOutsideTeam } from './bearer.js';

export interface SessionUser {
  id: string;
  email: string;
  displayName: string;
  displayUnits: 'si' | 'imperial';
  instructor: boolean;
}

export interface TeamAccess {
  teamId: string;
  roles: Role[];
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      user?: SessionUser;
      access?: TeamAccess;
    }
  }
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export const isUuid = (s: unknown): s is string => typeof s === 'string' && UUID.test(s);

export const unauthenticated = () => new HttpError(401, 'unauthenticated', 'Please sign in');

export function currentUser(req: Request): SessionUser {
  if (!req.user) throw unauthenticated();
  return req.user;
}

export function currentAccess(req: Request): TeamAccess {
  if (!req.access) throw new Error('route has no requirePermission');
  return req.access;
}

export interface Authorizer {
  requireUser: RequestHandler;
  requirePermission(permission: Permission): RequestHandler;
}

/** `instructorReads(userId, teamId)`: an accepted programme gives its instructor read access to the team. */
export function createAuthorizer(orm: Orm, instructorReads?: (userId: string, teamId: string) => Promise<boolean>): Authorizer {
  async function loadUser(req: Request): Promise<SessionUser> {
    if (req.user) return req.user;
    const id = req.session?.userId;
    if (!id) throw unauthenticated();
    const [u] = await orm
      .select({ id: users.id, email: users.email, displayName: users.displayName, displayUnits: users.displayUnits, instructor: users.instructor })
      .from(users)
      .where(eq(users.id, id));
    if (!u) throw unauthenticated();
    req.user = u;
    return u;
  }

  const requireUser: RequestHandler = async (req, _res, next) => {
    await loadUser(req);
    if (req.tokenGrant) {
      const refused = tokenAllowsOutsideTeam(req.method, req.baseUrl);
      if (refused) throw refused;
    }
    next();
  };

  function requirePermission(permission: Permission): RequestHandler {
    return async (req, _res, next) => {
      const user = await loadUser(req);
      const teamId = req.params['teamId'];
      if (!isUuid(teamId)) throw notFound('Team');
      const [m] = await orm
        .select({ roles: memberships.roles })
        .from(memberships)
        .where(and(eq(memberships.teamId, teamId), eq(memberships.userId, user.id)));
      if (!m) {
        // An instructor whose programme the team accepted may read it, and only read.
        if (permission === 'team:read' && user.instructor && (req.method === 'GET' || req.method === 'HEAD') && (await instructorReads?.(user.id, teamId))) {
          // A token is held to its team here as everywhere.
          const refused = req.tokenGrant ? tokenAllows(req.tokenGrant, teamId, req.method) : null;
          if (refused) throw refused;
          req.access = { teamId, roles: [] };
          return next();
        }
        throw notFound('Team');
      }
      if (req.tokenGrant) {
        const refused = tokenAllows(req.tokenGrant, teamId, req.method);
        if (refused) throw refused;
      }
      if (!hasPermission(m.roles, permission)) {
        throw new HttpError(403, 'forbidden', `Your roles in this team do not allow this (needs ${permission})`, { permission });
      }
      req.access = { teamId, roles: m.roles };
      next();
    };
  }

  return { requireUser, requirePermission };
}
