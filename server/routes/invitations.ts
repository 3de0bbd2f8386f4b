/**
 * Team invitations: the owner invites by e-mail (/api/teams/:teamId/invitations);
 * the invited person opens the link (/api/invitations/:token: GET shows it and
 * never accepts, POST …/accept accepts once).
 */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import { establishSession } from '../http/session.js';
import { perAddress, type Limit } from '../http/rate-limits.js';
import { ROLES } from '../permissions.js';
import type { Accounts } from '../services/accounts.js';
import type { Invitations } from '../services/invitations.js';
import { displayName, email, password } from './auth.js';
import { reply } from '../http/reply.js';
import type { AcceptedInvitation, InvitationInfo, TeamInvitation } from '../../shared/api/teams.js';

const roles = z
  .array(z.enum(ROLES))
  .min(1, 'give at least one role')
  .transform((r) => ROLES.filter((x) => r.includes(x)));
const inviteSchema = z.strictObject({ email, roles });
const acceptSchema = z.strictObject({ displayName: displayName.optional(), password: password(10).optional() });
const token = (raw: unknown) => validate(z.string().min(10).max(2000), raw, 'invitation link');

/** Mounted at /api/teams/:teamId/invitations. */
export function teamInvitationsRouter(invitations: Invitations, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  r.get('/', auth.requirePermission('members:manage'), async (req, res) => {
    reply<TeamInvitation[]>(res, await invitations.list(currentAccess(req).teamId));
  });
  r.post('/', auth.requirePermission('members:manage'), async (req, res) => {
    const input = validate(inviteSchema, req.body);
    reply<TeamInvitation>(res, await invitations.create(currentAccess(req).teamId, currentUser(req).id, input), 201);
  });
  return r;
}

/** Mounted at /api/invitations (public: the link is the credential). */
export function invitationLinksRouter(invitations: Invitations, accounts: Accounts, limit: Limit): Router {
  const r = Router();
  // Accepting may create an account (a bcrypt hash): limited per client address like registering.
  const acceptLimiter = perAddress(limit, 'Too many invitations accepted from this address. Please wait a few minutes and try again.');
  r.get('/:token', async (req, res) => {
    reply<InvitationInfo>(res, await invitations.info(token(req.params['token'])));
  });
  r.post('/:token/accept', acceptLimiter, async (req, res) => {
    const t = token(req.params['token']);
    const body = validate(acceptSchema, req.body ?? {});
    const signedIn = req.session?.userId ? await accounts.me(req.session.userId).catch(() => undefined) : undefined;
    let result: { userId: string; teamId: string };
    if (signedIn) {
      result = await invitations.accept(t, { userId: signedIn.user.id, email: signedIn.user.email, emailVerified: signedIn.user.emailVerified });
    } else {
      const reg = validate(
        z.object({ displayName, password: password(10) }, { error: 'give displayName and password to create your account, or sign in first' }),
        body,
      );
      result = await invitations.accept(t, { register: reg });
      await establishSession(req, result.userId);
    }
    reply<AcceptedInvitation>(res, { teamId: result.teamId, me: await accounts.me(result.userId) });
  });
  return r;
}
