/**
 * CSRF defence for every state-changing request (contracts.md): the custom
 * header `X-Rollwise-Request: 1` (a cross-site form or image cannot set it,
 * and a cross-site fetch with it needs a CORS preflight we never grant), and
 * when the browser sends Origin it must be our own.
 */
import type { RequestHandler } from 'express';
import { HttpError } from './errors.js';

export const CSRF_HEADER = 'x-rollwise-request';
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export function csrfProtection(publicUrl: string): RequestHandler {
  const publicOrigin = new URL(publicUrl).origin;
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    // Token-authenticated scripts (bearer.ts ran first and accepted the token): no browser, no CSRF.
    if (req.tokenGrant) return next();
    if (req.get(CSRF_HEADER) !== '1') {
      return next(new HttpError(403, 'csrf_refused', 'This request is missing the X-Rollwise-Request header'));
    }
    const origin = req.get('origin');
    if (origin !== undefined) {
      const ownOrigin = `${req.protocol}://${req.get('host')}`;
      if (origin !== publicOrigin && origin !== ownOrigin) {
        return next(new HttpError(403, 'csrf_refused', 'Requests from another site are refused'));
      }
    }
    next();
  };
}
