/**
 * Activity log of a team (/api/teams/:teamId/activity) and of one axle design
 * (/api/teams/:teamId/axle-designs/:designId/activity), as JSON or CSV
 * (`?format=csv`, optionally `&timeZone=Europe/Lisbon` for a local-time column).
 */
import { Router, type Response } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { currentAccess, type Authorizer } from '../http/authorize.js';
import { checkTimeZone, type Activity, type ActivityQuery } from '../services/activity.js';
import type { AxleDesigns } from '../services/axle-designs.js';
import { loadParam, loaded } from './loaders.js';
import { reply } from '../http/reply.js';
import type { ActivityEntry } from '../../shared/api/teams.js';

const querySchema = z
  .object({
    before: z.iso.datetime({ offset: true }).optional(),
    /** With `before`: the id of the last entry seen (entries sharing its time are paged by id). */
    beforeId: z.uuid().optional(),
    limit: z.coerce.number().int().min(1).max(5000).optional(),
    format: z.enum(['json', 'csv']).optional(),
    timeZone: z.string().min(1).max(64).optional(),
  })
  .refine((q) => !q.beforeId || q.before, { message: 'needs before (the time of that entry)', path: ['beforeId'] });

export function activityRouter(activity: Activity, designs: AxleDesigns, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  r.param('designId', loadParam('design', 'Axle design', (req, id) => designs.get(currentAccess(req).teamId, id)));

  async function answer(res: Response, teamId: string, raw: unknown, designId?: string, fileName = 'activity') {
    const q = validate(querySchema, raw, 'query');
    const query: ActivityQuery = { designId, before: q.before ? new Date(q.before) : undefined, beforeId: q.beforeId, limit: q.limit ?? (q.format === 'csv' ? 5000 : 200) };
    if (q.format === 'csv') {
      const timeZone = q.timeZone ? checkTimeZone(q.timeZone) : undefined;
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="${fileName}.csv"`);
      res.send(await activity.csv(teamId, { ...query, timeZone }));
      return;
    }
    reply<ActivityEntry[]>(res, await activity.list(teamId, query));
  }

  r.get('/activity', auth.requirePermission('team:read'), async (req, res) => {
    await answer(res, currentAccess(req).teamId, req.query);
  });

  r.get('/axle-designs/:designId/activity', auth.requirePermission('team:read'), async (req, res) => {
    const teamId = currentAccess(req).teamId;
    const d = await loaded(req, 'design'); // 404 outside the team
    await answer(res, teamId, req.query, d.id, 'design-activity');
  });

  return r;
}
