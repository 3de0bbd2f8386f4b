/**
 * `Authorization: Bearer rw_…` for scripts and the command line. A request
 * with a token is authenticated by it alone (no session, no cookie) and is
 * exempt from the CSRF header: a browser never attaches it by itself, so a
 * cross-site page cannot ride on it. An invalid token is 401, never a
 * fallback to the session.
 */
import type { RequestHandler } from 'express';
import type { ApiTokens, TokenGrant } from '../services/api-tokens.js';
import { HttpError } from './errors.js';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** Set when the request authenticated with a personal API token. */
      tokenGrant?: TokenGrant;
    }
  }
}

const BEARER = /^Bearer\s+(\S+)$/i;
export const READ_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Paths a token never reaches: account and token management, accepting
 * an invitation (it signs a person in or registers one), and the
 * development mailbox. Reading the own
 * account (`GET /auth/me`) and looking at an invitation are allowed.
 */
function needsSession(rawPath: string, method: string): boolean {
  // Express matches routes case-insensitively (/api/AUTH/tokens reaches the tokens router), so compare in lower case.
  const path = rawPath.toLowerCase();
  if (path.startsWith('/auth/')) return !(path === '/auth/me' && READ_METHODS.has(method));
  if (path.startsWith('/invitations/')) return !READ_METHODS.has(method);
  // The development mailbox holds reset and confirmation links: reading it would turn a token into the account.
  if (path === '/dev' || path.startsWith('/dev/')) return true;
  return false;
}

export function bearerAuth(tokens: ApiTokens): RequestHandler {
  return async (req, _res, next) => {
    const header = req.get('authorization');
    if (header === undefined) return next();
    const m = BEARER.exec(header);
    const found = m ? await tokens.authenticate(m[1]!) : null;
    if (!found) return next(new HttpError(401, 'invalid_token', 'The API token is not valid (unknown, revoked or expired)'));
    // Account and token management need a signed-in person, not a script.
    if (needsSession(req.path, req.method)) {
      return next(new HttpError(403, 'session_required', 'Sign in to do this; API tokens cannot manage accounts, tokens or invitations'));
    }
    req.user = found.user;
    req.tokenGrant = found.grant;
    next();
  };
}

/**
 * A token on a route that only needs a signed-in user (not a team's
 * permission): it may read, and use the compute API (which stores nothing);
 * any other change is outside its one team (creating teams or programmes).
 */
export function tokenAllowsOutsideTeam(method: string, baseUrl: string): HttpError | null {
  if (READ_METHODS.has(method) || baseUrl === '/api/compute') return null;
  return new HttpError(403, 'token_scope', 'An API token acts only within its team; sign in to do this');
}

/** What a token's scope allows on a team route: read = reading only; write = also changes. */
export function tokenAllows(grant: TokenGrant, teamId: string, method: string): HttpError | null {
  if (grant.teamId !== teamId) return new HttpError(403, 'token_scope', 'This API token is for another team');
  if (grant.scope === 'read' && !READ_METHODS.has(method)) return new HttpError(403, 'token_scope', 'This API token may only read; create a write token to make changes');
  return null;
}
