/**
 * Rate limits per client address (express-rate-limit, in the server's memory).
 * Every route that does bcrypt work is behind one, so no client can make the
 * server hash passwords without bound (docs/security.md, "Rate limits").
 */
import type { RequestHandler } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import { HttpError } from './errors.js';

export interface Limit {
  windowMs: number;
  max: number;
}

/** At most `limit.max` requests (only failed ones with `failedOnly`) per client address and window; then 429 `rate_limited`. */
export function perAddress(limit: Limit, message: string, o: { failedOnly?: boolean } = {}): RequestHandler {
  return rateLimit({
    windowMs: limit.windowMs,
    limit: limit.max,
    skipSuccessfulRequests: o.failedOnly ?? false,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', message)),
  });
}

/** At most `limit.max` failed requests per signed-in account and window (behind requireUser). */
export function perAccountFailures(limit: Limit, message: string): RequestHandler {
  return rateLimit({
    windowMs: limit.windowMs,
    limit: limit.max,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `account:${req.user?.id ?? ipKeyGenerator(req.ip ?? '')}`,
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', message)),
  });
}
