/** /api/auth/tokens: a signed-in person's personal API tokens (never reachable with a token). */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { currentUser, type Authorizer } from '../http/authorize.js';
import { TOKEN_SCOPES } from '../db/schema.js';
import type { ApiTokens } from '../services/api-tokens.js';
import { idParam } from './vehicles.js';
import { reply } from '../http/reply.js';
import type { ApiToken, CreatedApiToken } from '../../shared/api/accounts.js';

const createSchema = z.strictObject({
  name: z.string().trim().min(1, 'is required').max(100),
  teamId: z.uuid('must be a team id'),
  scope: z.enum(TOKEN_SCOPES),
  expiresInDays: z.number().int().min(1).max(366).optional(),
});

export function apiTokensRouter(tokens: ApiTokens, auth: Authorizer): Router {
  const r = Router();
  r.get('/', auth.requireUser, async (req, res) => {
    reply<ApiToken[]>(res, await tokens.list(currentUser(req).id));
  });
  r.post('/', auth.requireUser, async (req, res) => {
    reply<CreatedApiToken>(res, await tokens.create(currentUser(req).id, validate(createSchema, req.body)), 201);
  });
  r.delete('/:tokenId', auth.requireUser, async (req, res) => {
    await tokens.revoke(currentUser(req).id, idParam(req.params['tokenId'], 'Token'));
    res.status(204).end();
  });
  return r;
}
