/**
 * Tolerance studies and design sweeps (docs/api.md, docs/studies.md), mounted at /api/teams/:teamId/studies:
 *   POST   /                                   start a study (body: shared/study studyRequestSchema) → 202
 *   GET    /                                   the team's studies, newest first (without results)
 *   GET    /:studyId                           one study with its result once completed
 *   DELETE /:studyId                           cancel: every chunk stops
 *   GET    /:studyId/csv                       the result as CSV
 *   POST   /:studyId/variants/:index/proposal  a design-sweep variant as a proposal on its axle design → 201
 * A study whose work was lost answers 410 job_gone with the reason.
 */
import { Router } from 'express';
import { z } from 'zod';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import { validate } from '../http/errors.js';
import type { Studies } from '../services/studies.js';
import { idParam } from './vehicles.js';

const indexParam = z.coerce.number().int().min(0).max(1_000_000);

export function studiesRouter(studies: Studies, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  const { requirePermission } = auth;
  const teamId = (req: import('express').Request) => currentAccess(req).teamId;
  const studyId = (raw: unknown) => idParam(raw, 'Study');

  r.post('/', requirePermission('study:run'), async (req, res) => {
    const study = await studies.create(teamId(req), currentUser(req).id, req.body);
    res.status(202).location(`${req.baseUrl}/${study.id}`).json({ study });
  });

  r.get('/', requirePermission('team:read'), async (req, res) => {
    res.json({ studies: await studies.list(teamId(req)) });
  });

  r.get('/:studyId', requirePermission('team:read'), async (req, res) => {
    res.json({ study: await studies.get(teamId(req), studyId(req.params['studyId'])) });
  });

  r.delete('/:studyId', requirePermission('study:run'), async (req, res) => {
    res.json({ study: await studies.cancel(teamId(req), studyId(req.params['studyId'])) });
  });

  r.get('/:studyId/csv', requirePermission('team:read'), async (req, res) => {
    const { filename, text } = await studies.csv(teamId(req), studyId(req.params['studyId']));
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
    res.send(text);
  });

  r.post('/:studyId/variants/:index/proposal', requirePermission('design:propose'), async (req, res) => {
    const index = validate(indexParam, req.params['index'], 'variant index');
    const proposal = await studies.proposeVariant(teamId(req), studyId(req.params['studyId']), index, currentUser(req).id);
    res.status(201).json({ proposal });
  });

  return r;
}
