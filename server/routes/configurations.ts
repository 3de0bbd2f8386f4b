/** /api/teams/:teamId/configurations: configurations, their review, approvals, comparison and comments. */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import { TRACK_PROFILE_IDS } from '../../shared/intent/profiles.js';
import { TRANSITIONS, type Configurations, type ReviewAction } from '../services/configurations.js';
import { archivedQuery, baseRevision, documentName, idParam, revisionMessage } from './vehicles.js';

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
  const configId = (raw: unknown) => idParam(raw, 'Configuration');

  r.get('/', requirePermission('team:read'), async (req, res) => {
    const q = validate(archivedQuery, req.query, 'query');
    res.json(await configs.list(currentAccess(req).teamId, q.archived === 'true'));
  });

  r.post('/', requirePermission('vehicle:manage'), async (req, res) => {
    const input = validate(createSchema, req.body);
    res.status(201).json(await configs.create(currentAccess(req).teamId, currentUser(req).id, input));
  });

  r.get('/compare', requirePermission('team:read'), async (req, res) => {
    const q = validate(compareQuery, req.query, 'query');
    res.json(await configs.compare(currentAccess(req).teamId, { id: q.a, revision: q.aRevision }, { id: q.b, revision: q.bRevision }));
  });

  r.get('/:configurationId', requirePermission('team:read'), async (req, res) => {
    res.json(await configs.get(currentAccess(req).teamId, configId(req.params['configurationId'])));
  });

  r.put('/:configurationId', requirePermission('vehicle:manage'), async (req, res) => {
    const { baseRevision: base, ...change } = validate(reviseSchema, req.body);
    res.json(await configs.revise(currentAccess(req).teamId, configId(req.params['configurationId']), currentUser(req).id, base, change));
  });

  r.patch('/:configurationId', requirePermission('vehicle:manage'), async (req, res) => {
    const { archived } = validate(archiveSchema, req.body);
    res.json(await configs.setArchived(currentAccess(req).teamId, configId(req.params['configurationId']), currentUser(req).id, archived));
  });

  r.get('/:configurationId/revisions', requirePermission('team:read'), async (req, res) => {
    res.json(await configs.revisions(currentAccess(req).teamId, configId(req.params['configurationId'])));
  });

  r.get('/:configurationId/history', requirePermission('team:read'), async (req, res) => {
    res.json(await configs.history(currentAccess(req).teamId, configId(req.params['configurationId'])));
  });

  r.get('/:configurationId/results', requirePermission('team:read'), async (req, res) => {
    const q = validate(revisionQuery, req.query, 'query');
    res.json(await configs.results(currentAccess(req).teamId, configId(req.params['configurationId']), q.revision));
  });

  for (const action of Object.keys(TRANSITIONS) as ReviewAction[]) {
    const t = TRANSITIONS[action];
    r.post(`/:configurationId/${action}`, requirePermission(t.permission), async (req, res) => {
      const body = validate(action === 'request-changes' ? changesSchema : transitionSchema, req.body ?? {});
      const a = currentAccess(req);
      const actor = { id: currentUser(req).id, roles: a.roles };
      res.json(await configs.transition(a.teamId, configId(req.params['configurationId']), actor, action, { message: body.message, expectRevision: body.revision }));
    });
  }

  r.get('/:configurationId/approvals', requirePermission('team:read'), async (req, res) => {
    res.json(await configs.approvals(currentAccess(req).teamId, configId(req.params['configurationId'])));
  });

  r.get('/:configurationId/approvals/:approvalId', requirePermission('team:read'), async (req, res) => {
    const ids = [currentAccess(req).teamId, configId(req.params['configurationId']), idParam(req.params['approvalId'], 'Approval')] as const;
    res.json(await configs.approval(...ids));
  });

  r.get('/:configurationId/comments', requirePermission('team:read'), async (req, res) => {
    res.json(await configs.comments(currentAccess(req).teamId, configId(req.params['configurationId'])));
  });

  r.post('/:configurationId/comments', requirePermission('review:comment'), async (req, res) => {
    const input = validate(commentSchema, req.body);
    res.status(201).json(await configs.addComment(currentAccess(req).teamId, configId(req.params['configurationId']), currentUser(req).id, input));
  });

  for (const [path, resolved] of [['resolve', true], ['reopen', false]] as const) {
    r.post(`/:configurationId/comments/:commentId/${path}`, requirePermission('review:comment'), async (req, res) => {
      const ids = [currentAccess(req).teamId, configId(req.params['configurationId']), idParam(req.params['commentId'], 'Comment thread')] as const;
      res.json(await configs.resolveThread(...ids, currentUser(req).id, resolved));
    });
  }

  return r;
}
