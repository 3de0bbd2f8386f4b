/**
 * Sessions in PostgreSQL (connect-pg-simple, table created by migration).
 * Cookie `rollwise.sid`: httpOnly, SameSite=Lax, Secure in production.
 * Idle timeout: rolling maxAge refreshed on every request. Absolute timeout:
 * the sign-in time is stored in the session and checked on every request.
 * The stored expiry is refreshed at most once a minute per session (see
 * throttleTouch), so the idle timeout holds to within that minute.
 */
import type { RequestHandler, Request } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type pg from 'pg';
import type { Config } from '../config.js';

declare module 'express-session' {
  interface SessionData {
    userId: string;
    /** Epoch ms of sign-in; the absolute timeout counts from here. */
    signedInAt: number;
  }
}

export const SESSION_COOKIE = 'rollwise.sid';
export const SESSION_TABLE = 'session';

export interface SessionSetup {
  middleware: RequestHandler;
  close(): void;
}

export function createSession(config: Config, pool: pg.Pool, onStoreError: (err: unknown) => void): SessionSetup {
  const PgStore = connectPgSimple(session);
  const store = new PgStore({
    pool,
    tableName: SESSION_TABLE,
    createTableIfMissing: false,
    // Expired rows are pruned every 15 minutes; the first prune waits that long too.
    pruneSessionInterval: 15 * 60,
    errorLog: onStoreError,
  });
  throttleTouch(store, Math.min(60_000, config.sessionIdleMs / 10));
  const middleware = session({
    name: SESSION_COOKIE,
    secret: config.sessionSecret,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    proxy: config.production ? true : undefined,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: config.production,
      maxAge: config.sessionIdleMs,
      path: '/',
    },
  });
  return { middleware, close: () => store.close() };
}

/** Ends a session past its absolute lifetime before any route sees it. */
export function absoluteTimeout(absoluteMs: number): RequestHandler {
  return (req, _res, next) => {
    const s = req.session;
    if (s?.userId && (!s.signedInAt || Date.now() - s.signedInAt > absoluteMs)) {
      // A fresh empty session replaces it (deleting the old row), so the request goes on signed out.
      s.regenerate((err) => next(err));
      return;
    }
    next();
  };
}

/** New session id at sign-in (no fixation), then stores the user. */
export function establishSession(req: Request, userId: string): Promise<void> {
  return new Promise((resolve, reject) => {
    req.session.regenerate((err) => {
      if (err) return reject(err);
      req.session.userId = userId;
      req.session.signedInAt = Date.now();
      req.session.save((e) => (e ? reject(e) : resolve()));
    });
  });
}

export function destroySession(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
}

/** Deletes every other session row of a user (after a password change). */
export async function endOtherSessions(pool: pg.Pool, userId: string, keepSid: string): Promise<number> {
  const r = await pool.query(`DELETE FROM "${SESSION_TABLE}" WHERE sess->>'userId' = $1 AND sid <> $2`, [userId, keepSid]);
  return r.rowCount ?? 0;
}

interface TouchingStore {
  touch(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void;
}

/**
 * Rolling sessions touch the store on every request: one UPDATE of the same
 * row per request, which a busy client (a script, a page firing parallel
 * requests) turns into a queue on that row's lock. This lets one touch per
 * session through every `intervalMs`; the cookie itself is still renewed on
 * every response.
 */
export function throttleTouch(store: TouchingStore, intervalMs: number, maxTracked = 10_000): void {
  const last = new Map<string, number>();
  const touch = store.touch.bind(store);
  store.touch = (sid, sess, fn) => {
    const now = Date.now();
    const at = last.get(sid);
    if (at !== undefined && now - at < intervalMs) {
      fn?.();
      return;
    }
    if (last.size >= maxTracked) last.clear();
    last.set(sid, now);
    touch(sid, sess, fn);
  };
}
