/** /api/auth: register, sign in/out, me, profile, change password. */
import { Router } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import { z } from 'zod';
import type { Config } from '../config.js';
import { perAccountFailures, perAddress } from '../http/rate-limits.js';
import type pg from 'pg';
import { HttpError, validate } from '../http/errors.js';
import { currentUser, type Authorizer } from '../http/authorize.js';
import { destroySession, endOtherSessions, establishSession, SESSION_COOKIE } from '../http/session.js';
import { normaliseEmail, type Accounts } from '../services/accounts.js';
import { reply } from '../http/reply.js';
import type { Me } from '../../shared/api/accounts.js';

// bcrypt reads at most 72 bytes; longer passwords would be silently truncated.
export const password = (min: number) =>
  z
    .string()
    .min(min, `must be at least ${min} characters`)
    .refine((s) => Buffer.byteLength(s, 'utf8') <= 72, 'must be at most 72 bytes');
export const email = z.string().trim().pipe(z.email('must be an e-mail address').max(254));
export const displayName = z.string().trim().min(1, 'is required').max(100);

const registerSchema = z.strictObject({ email, password: password(10), displayName });
const signInSchema = z.strictObject({ email: z.string().min(1, 'is required').max(254), password: z.string().min(1, 'is required').max(1000) });
const changePasswordSchema = z.strictObject({ currentPassword: z.string().min(1, 'is required').max(1000), newPassword: password(10) });
const resetRequestSchema = z.strictObject({ email: z.string().trim().min(1, 'is required').max(254) });
const resetConfirmSchema = z.strictObject({ token: z.string().min(10).max(200), newPassword: password(10) });
const verifySchema = z.strictObject({ token: z.string().min(10).max(2000) });
const profileSchema = z.strictObject({ displayName: displayName.optional(), displayUnits: z.enum(['si', 'imperial']).optional() });

export function authRouter(config: Config, accounts: Accounts, pool: pg.Pool, auth: Authorizer): Router {
  const r = Router();

  const signInLimiter = rateLimit({
    windowMs: config.signInLimit.windowMs,
    limit: config.signInLimit.max,
    // Only failed attempts count, per client address and account.
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => {
      const body = req.body as { email?: unknown } | undefined;
      const who = typeof body?.email === 'string' ? normaliseEmail(body.email) : '';
      return `${ipKeyGenerator(req.ip ?? '')}|${who}`;
    },
    handler: (_req, _res, next) => {
      next(new HttpError(429, 'rate_limited', 'Too many sign-in attempts. Please wait a few minutes and try again.'));
    },
  });

  const resetLimiter = rateLimit({
    windowMs: config.signInLimit.windowMs,
    limit: config.signInLimit.max,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', 'Too many reset requests. Please wait a few minutes and try again.')),
  });

  /** One client address, all accounts together (config.addressLimit). */
  const addressLimiter = (message: string, failedOnly: boolean) => perAddress(config.addressLimit, message, { failedOnly });
  const signInAddressLimiter = addressLimiter('Too many failed sign-ins from this address. Please wait a few minutes and try again.', true);
  const registerLimiter = addressLimiter('Too many accounts created from this address. Please wait a few minutes and try again.', false);
  const resendLimiter = addressLimiter('Too many confirmation links requested. Please wait a few minutes and try again.', false);
  // Routes that hash or compare passwords (bcrypt): every request counts, successful or not.
  const confirmLimiter = addressLimiter('Too many password resets from this address. Please wait a few minutes and try again.', false);
  const changePasswordLimiter = addressLimiter('Too many password changes from this address. Please wait a few minutes and try again.', false);
  // A stolen session guessing the current password: failures per account, as for sign-in.
  const changePasswordAccountLimiter = perAccountFailures(config.signInLimit, 'Too many wrong current passwords. Please wait a few minutes and try again.');

  r.get('/me', auth.requireUser, async (req, res) => {
    reply<Me>(res, await accounts.me(currentUser(req).id));
  });

  r.patch('/me', auth.requireUser, async (req, res) => {
    const patch = validate(profileSchema, req.body);
    const id = currentUser(req).id;
    await accounts.updateProfile(id, patch);
    reply<Me>(res, await accounts.me(id));
  });

  // Public: anyone may register (a bounded number of times per address).
  r.post('/register', registerLimiter, async (req, res) => {
    const input = validate(registerSchema, req.body);
    const id = await accounts.register(input);
    await establishSession(req, id);
    reply<Me>(res, await accounts.me(id), 201);
  });

  // Public, rate-limited.
  r.post('/sign-in', signInAddressLimiter, signInLimiter, async (req, res) => {
    const { email: e, password: p } = validate(signInSchema, req.body);
    const id = await accounts.verify(e, p);
    if (!id) throw new HttpError(401, 'invalid_credentials', 'The e-mail address or password is not correct');
    await establishSession(req, id);
    reply<Me>(res, await accounts.me(id));
  });

  // Public: signing out when already signed out is not an error.
  r.post('/sign-out', async (req, res) => {
    if (req.session?.userId) await destroySession(req);
    res.clearCookie(SESSION_COOKIE, { path: '/', httpOnly: true, sameSite: 'lax', secure: config.production });
    res.status(204).end();
  });

  r.post('/change-password', auth.requireUser, changePasswordLimiter, changePasswordAccountLimiter, async (req, res) => {
    const { currentPassword, newPassword } = validate(changePasswordSchema, req.body);
    const id = currentUser(req).id;
    await accounts.changePassword(id, currentPassword, newPassword);
    await endOtherSessions(pool, id, req.sessionID);
    res.status(204).end();
  });

  // Public: always 202, whether or not the address has an account (nothing is disclosed).
  r.post('/password-reset', resetLimiter, async (req, res) => {
    const { email: e } = validate(resetRequestSchema, req.body);
    await accounts.requestPasswordReset(e);
    res.status(202).json({ status: 'If an account uses that address, a reset link is on its way.' });
  });

  // Public: the token from the mail is the credential (checked before any hashing); every session of the account ends.
  r.post('/password-reset/confirm', confirmLimiter, async (req, res) => {
    const { token, newPassword } = validate(resetConfirmSchema, req.body);
    const userId = await accounts.resetPassword(token, newPassword);
    await endOtherSessions(pool, userId, '');
    res.status(204).end();
  });

  // Public: confirming an address needs only the link.
  r.post('/verify-email', async (req, res) => {
    const { token } = validate(verifySchema, req.body);
    await accounts.verifyEmail(token);
    res.json({ verified: true });
  });

  r.post('/verify-email/resend', auth.requireUser, resendLimiter, async (req, res) => {
    await accounts.resendVerification(currentUser(req).id);
    res.status(202).json({ status: 'A new confirmation link is on its way.' });
  });

  return r;
}
