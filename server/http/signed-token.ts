/**
 * Signed, expiring tokens for links in mail (team invitations, e-mail
 * verification): `base64url(JSON payload).base64url(HMAC-SHA256)`, keyed by
 * the session secret with a purpose label, so a token made for one purpose
 * never verifies for another. Compared in constant time.
 */
import { createHmac, timingSafeEqual } from 'node:crypto';

export type TokenPurpose = 'invitation' | 'verify-email';

export type TokenCheck<T> = { ok: true; payload: T; expired: boolean } | { ok: false };

const sign = (secret: string, purpose: TokenPurpose, body: string) => createHmac('sha256', `${purpose}:${secret}`).update(body).digest('base64url');

export function makeToken(secret: string, purpose: TokenPurpose, payload: Record<string, unknown>, expiresAt: Date): string {
  const body = Buffer.from(JSON.stringify({ ...payload, exp: Math.floor(expiresAt.getTime() / 1000) })).toString('base64url');
  return `${body}.${sign(secret, purpose, body)}`;
}

/** `ok: false` for anything not signed by us for this purpose; `expired` is reported separately (the link can say so). */
export function readToken<T extends Record<string, unknown>>(secret: string, purpose: TokenPurpose, token: string, now = Date.now()): TokenCheck<T> {
  const parts = token.split('.');
  if (parts.length !== 2 || !parts[0] || !parts[1]) return { ok: false };
  const [body, mac] = parts as [string, string];
  const expected = Buffer.from(sign(secret, purpose, body));
  const given = Buffer.from(mac);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return { ok: false };
  try {
    const payload = JSON.parse(Buffer.from(body, 'base64url').toString('utf8')) as T & { exp: number };
    if (typeof payload.exp !== 'number') return { ok: false };
    return { ok: true, payload, expired: payload.exp * 1000 <= now };
  } catch {
    return { ok: false };
  }
}
