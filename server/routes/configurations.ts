/** /api/teams/:teamId/configurations: configurations, their review, approvals, comparison and comments. */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import { TRACK_PROFILE_IDS } from '../../shared/tracks/profiles.js';
import { TRANSITIONS, type Configurations, type ReviewAction } from '../services/configurations.js';
import { readTransitionBody } from './review-gates.js';
import { archivedQuery, baseRevision, documentName, idParam, revisionMessage } from './vehicles.js';
import { loadParam, loaded } from './loaders.js';
import { reply } from '../http/reply.js';
import type {
  ApprovalDetail,
  ApprovalSummary,
  CommentThread,
  CompareAnswer,
  Configuration,
  ConfigurationRevision,
  ResultsAnswer,
  StoredComment,
  TransitionRow,
} from '../../shared/api/configurations.js';

const uuid = z.uuid('must be an id');
const rev = z.number().int().positive();
const trackProfile = z.enum(TRACK_PROFILE_IDS);

const createSchema = z.strictObject({
  name: documentName,
  vehicleId: uuid,
  vehicleRevision: rev.optional(),
  frontDesignId: uuid,
  frontDesignRevision: rev.optional(),
  rearDesignId: uuid,
  rearDesignRevision: rev.optional(),
  trackProfile,
  message: revisionMessage,
});
const reviseSchema = z
  .strictObject({
    baseRevision,
    name: documentName.optional(),
    vehicleId: uuid.optional(),
    vehicleRevision: rev.optional(),
    frontDesignId: uuid.optional(),
    frontDesignRevision: rev.optional(),
    rearDesignId: uuid.optional(),
    rearDesignRevision: rev.optional(),
    trackProfile: trackProfile.optional(),
    message: revisionMessage,
  })
  .refine((b) => Object.keys(b).some((k) => k !== 'baseRevision' && k !== 'message'), { message: 'change at least one reference, the name or the track profile', path: ['baseRevision'] });
const archiveSchema = z.strictObject({ archived: z.boolean() });
const transitionSchema = z.strictObject({
  message: revisionMessage,
  /** The revision the caller looked at; a newer one means 409 stale_revision. */
  revision: rev.optional(),
});
const changesSchema = transitionSchema.extend({ message: z.string().trim().min(1, 'say what should change').max(500) });
const revisionQuery = z.object({ revision: z.coerce.number().int().positive().optional() });
const compareQuery = z.object({
  a: uuid,
  aRevision: z.coerce.number().int().positive().optional(),
  b: uuid,
  bRevision: z.coerce.number().int().positive().optional(),
});
/** What a comment points at: the budget, a chart, a caution (by its code) or a key figure (by its result path). */
export const resultRef = z
  .string()
  .regex(/^(budget|chart:[a-z0-9-]{1,60}|caution:[a-z0-9-]{1,60}|figure:[A-Za-z0-9_.[\]-]{1,120})$/, 'use budget, chart:<name>, caution:<code> or figure:<result path>');
const commentSchema = z.strictObject({ body: z.string().trim().min(1, 'is required').max(4000), resultRef: resultRef.optional(), parentId: uuid.optional() });

export function configurationsRouter(configs: Configurations, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  const { requirePermission } = auth;
  r.param('configurationId', loadParam('configuration', 'Configuration', (req, id) => configs.get(currentAccess(req).teamId, id)));
  r.param('approvalId', loadParam('approval', 'Approval', async (req, id) => configs.approval(await loaded(req, 'configuration'), id)));

  r.get('/', requirePermission('team:read'), async (req, res) => {
    const q = validate(archivedQuery, req.query, 'query');
    reply<Configuration[]>(res, await configs.list(currentAccess(req).teamId, q.archived === 'true'));
  });

  r.post('/', requirePermission('vehicle:manage'), async (req, res) => {
    const input = validate(createSchema, req.body);
    reply<Configuration>(res, await configs.create(currentAccess(req).teamId, currentUser(req).id, input), 201);
  });

  r.get('/compare', requirePermission('team:read'), async (req, res) => {
    const q = validate(compareQuery, req.query, 'query');
    reply<CompareAnswer>(res, await configs.compare(currentAccess(req).teamId, { id: q.a, revision: q.aRevision }, { id: q.b, revision: q.bRevision }));
  });

  r.get('/:configurationId', requirePermission('team:read'), async (req, res) => {
    reply<Configuration>(res, await loaded(req, 'configuration'));
  });

  r.put('/:configurationId', requirePermission('vehicle:manage'), async (req, res) => {
    const { baseRevision: base, ...change } = validate(reviseSchema, req.body);
    const c = await loaded(req, 'configuration');
    reply<Configuration>(res, await configs.revise(currentAccess(req).teamId, c.id, currentUser(req).id, base, change));
  });

  r.patch('/:configurationId', requirePermission('vehicle:manage'), async (req, res) => {
    const { archived } = validate(archiveSchema, req.body);
    reply<Configuration>(res, await configs.setArchived(currentAccess(req).teamId, await loaded(req, 'configuration'), currentUser(req).id, archived));
  });

  r.get('/:configurationId/revisions', requirePermission('team:read'), async (req, res) => {
    reply<ConfigurationRevision[]>(res, await configs.revisions(await loaded(req, 'configuration')));
  });

  r.get('/:configurationId/history', requirePermission('team:read'), async (req, res) => {
    reply<TransitionRow[]>(res, await configs.history(await loaded(req, 'configuration')));
  });

  r.get('/:configurationId/results', requirePermission('team:read'), async (req, res) => {
    const q = validate(revisionQuery, req.query, 'query');
    reply<ResultsAnswer>(res, await configs.results(await loaded(req, 'configuration'), q.revision));
  });

  for (const action of Object.keys(TRANSITIONS) as ReviewAction[]) {
    const t = TRANSITIONS[action];
    r.post(`/:configurationId/${action}`, requirePermission(t.permission), async (req, res) => {
      const { revision, message, ...gate } = readTransitionBody(action, action === 'request-changes' ? changesSchema : transitionSchema, req.body ?? {});
      const a = currentAccess(req);
      const actor = { id: currentUser(req).id, roles: a.roles };
      const c = await loaded(req, 'configuration');
      reply<Configuration>(res, await configs.transition(a.teamId, c.id, actor, action, { message, expectRevision: revision, gate }));
    });
  }

  r.get('/:configurationId/approvals', requirePermission('team:read'), async (req, res) => {
    reply<ApprovalSummary[]>(res, await configs.approvals(await loaded(req, 'configuration')));
  });

  r.get('/:configurationId/approvals/:approvalId', requirePermission('team:read'), async (req, res) => {
    reply<ApprovalDetail>(res, await loaded(req, 'approval'));
  });

  r.get('/:configurationId/comments', requirePermission('team:read'), async (req, res) => {
    reply<CommentThread[]>(res, await configs.comments(await loaded(req, 'configuration')));
  });

  r.post('/:configurationId/comments', requirePermission('review:comment'), async (req, res) => {
    const input = validate(commentSchema, req.body);
    const c = await loaded(req, 'configuration');
    reply<StoredComment>(res, await configs.addComment(currentAccess(req).teamId, c, currentUser(req).id, input), 201);
  });

  for (const [path, resolved] of [['resolve', true], ['reopen', false]] as const) {
    r.post(`/:configurationId/comments/:commentId/${path}`, requirePermission('review:comment'), async (req, res) => {
      const c = await loaded(req, 'configuration');
      reply<StoredComment & { readonly resolved: boolean }>(res, await configs.resolveThread(c, idParam(req.params['commentId'], 'Comment thread'), currentUser(req).id, resolved));
    });
  }

  return r;
}
