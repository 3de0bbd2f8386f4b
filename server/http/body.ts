/**
 * The JSON request body, read only when it will be used (issue 12 §4).
 *
 * What will be refused is refused before a byte of the body is parsed: the
 * content type (415, `requireJsonBody`), the CSRF header (403, csrf.ts) and
 * a missing sign-in run first (app.ts orders them so). An anonymous request
 * to a route that needs a signed-in user is passed on with its body unread:
 * the route's `requireUser`/`requirePermission` answers 401 and Node drains
 * the unread bytes without parsing them. Only the public routes
 * (`PUBLIC_BODY_ROUTES`: registering, signing in, password reset, e-mail
 * confirmation, accepting an invitation) read an anonymous body, and those
 * take at most `BODY_LIMITS.auth` bytes.
 *
 * Each route reads what it needs, no more (`bodyLimitFor`): sign-in and the
 * other account routes a few kB, ordinary edits (names, roles, comments)
 * `BODY_LIMITS.small`, and only the routes that take a whole document (a
 * vehicle, a corner, a compute request) the configured document limit
 * (`BODY_LIMIT`). File uploads are multipart and have their own limit
 * (upload.ts). Larger is 413 before the body is read (Content-Length) or as
 * soon as the limit is passed (chunked).
 *
 * Two checks run on the raw bytes before JSON.parse, in one linear scan
 * each: nesting deeper than `MAX_JSON_DEPTH` is 400 (a flat 1 MB body costs
 * about 2 ms once warm; walking the parsed value took 150–250 ms), and a NUL
 * character (`\u0000`) marks the body for `refuseNulCharacters`, which then
 * names the field (text.ts).
 */
import express, { type Request, type RequestHandler } from 'express';
import { HttpError } from './errors.js';

/** Our deepest document (a corner in an intent in a request) is under 10 levels. */
export const MAX_JSON_DEPTH = 64;

export const BODY_LIMITS = {
  /** Account routes: an e-mail address, a password ≤ 72 bytes, a link token ≤ 2000 characters. */
  auth: 8 * 1024,
  /** Names, roles, messages (≤ 500 characters), comments (≤ 4000 characters, up to 3 bytes each in UTF-8). */
  small: 32 * 1024,
} as const;

/** Body routes an anonymous client may use (paths below /api, compared in lower case as Express routes them). */
export const PUBLIC_BODY_ROUTES: readonly RegExp[] = [
  /^\/auth\/(register|sign-in|sign-out|password-reset|password-reset\/confirm|verify-email)$/,
  /^\/invitations\/[^/]+\/accept$/,
];

/** Routes whose body carries a whole document (vehicle, corner, proposal, compute input). */
export const DOCUMENT_BODY_ROUTES: readonly RegExp[] = [
  /^\/compute\/[^/]+$/,
  /^\/teams\/[^/]+\/vehicles$/,
  /^\/teams\/[^/]+\/vehicles\/[^/]+\/data$/,
  /^\/teams\/[^/]+\/vehicles\/[^/]+\/axle-designs$/,
  /^\/teams\/[^/]+\/axle-designs\/[^/]+\/(corner|proposals)$/,
];

/** Express matches paths case-insensitively and with or without a trailing slash. */
const routePath = (path: string) => path.toLowerCase().replace(/\/+$/, '') || '/';

export const isPublicBodyRoute = (path: string): boolean => PUBLIC_BODY_ROUTES.some((r) => r.test(routePath(path)));

export type BodyClass = 'auth' | 'small' | 'document';

/** Which limit a route's body gets. */
export function bodyClassFor(path: string): BodyClass {
  const p = routePath(path);
  if (p.startsWith('/auth/') || p.startsWith('/invitations/')) return 'auth';
  if (DOCUMENT_BODY_ROUTES.some((r) => r.test(p))) return 'document';
  return 'small';
}

/**
 * True when the JSON text nests arrays/objects deeper than `maxDepth`.
 * Scans the bytes once, skipping string contents; works on any byte
 * encoding JSON allows here (UTF-8: every byte of a multi-byte character
 * is ≥ 0x80, so it never looks like a bracket or a quote).
 */
export function jsonNestsDeeperThan(buf: Uint8Array, maxDepth: number): boolean {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < buf.length; i++) {
    const c = buf[i]!;
    if (inString) {
      if (c === 0x5c) i++; // backslash: the next byte is escaped
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x5b || c === 0x7b) {
      if (++depth > maxDepth) return true;
    } else if (c === 0x5d || c === 0x7d) depth--;
  }
  return false;
}

const NUL_ESCAPE = Buffer.from('\\u0000');

/** True when the JSON text may hold a NUL character (an escaped `\u0000`; a raw NUL byte is not valid JSON). */
export const mayHoldNul = (buf: Buffer): boolean => buf.includes(NUL_ESCAPE);

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** Set when the raw JSON body held `\u0000`: refuseNulCharacters looks for the field. */
      bodyMayHoldNul?: boolean;
    }
  }
}

function verify(req: Request, _res: unknown, buf: Buffer): void {
  if (jsonNestsDeeperThan(buf, MAX_JSON_DEPTH)) {
    throw new HttpError(400, 'invalid_input', `The request body is nested deeper than ${MAX_JSON_DEPTH} levels`, {
      fields: [{ path: '(root)', message: `nested deeper than ${MAX_JSON_DEPTH} levels` }],
    });
  }
  if (mayHoldNul(buf)) req.bodyMayHoldNul = true;
}

/**
 * Reads the JSON body when the request may use it, with its route's limit.
 * Runs after bearerAuth, csrfProtection and the session, so it knows who asks.
 */
export function jsonBody(documentLimit: string | number): RequestHandler {
  const parsers: Record<BodyClass, RequestHandler> = {
    auth: express.json({ limit: BODY_LIMITS.auth, verify }),
    small: express.json({ limit: BODY_LIMITS.small, verify }),
    document: express.json({ limit: documentLimit, verify }),
  };
  return (req, res, next) => {
    const signedIn = req.tokenGrant !== undefined || Boolean(req.session?.userId);
    // Not signed in and not a public route: the route will answer 401 (or 404); the body is never parsed.
    if (!signedIn && !isPublicBodyRoute(req.path)) return next();
    parsers[bodyClassFor(req.path)](req, res, next);
  };
}
