/**
 * Tolerance studies and design sweeps (docs/api.md, docs/studies.md), mounted at /api/teams/:teamId/studies:
 *   POST   /                                   start a study (body: shared/study studyRequestSchema) → 202
 *   GET    /                                   the team's studies, newest first (without results)
 *   GET    /:studyId                           one study with its result once completed
 *   DELETE /:studyId                           cancel: every chunk stops
 *   GET    /:studyId/csv[?units=si|imperial]   the result as CSV, in the caller's units (default their account's)
 *   POST   /:studyId/variants/:index/proposal  a design-sweep variant as a proposal on its axle design → 201
 *   PUT    /:studyId/attachments/:configurationId  attach a completed study to a configuration's review record
 *   DELETE /:studyId/attachments/:configurationId  detach it → 204
 *   GET    /?attachedTo=:configurationId       the studies attached to a configuration, with key figures
 * and, mounted at /api/programmes/:programmeId/studies (programmeStudiesRouter):
 *   GET    /                                   per accepted team, its latest attached study (the programme's instructor)
 * A study whose work was lost answers 410 job_gone with the reason.
 */
import { Router } from 'express';
import { z } from 'zod';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import { validate } from '../http/errors.js';
import type { Studies } from '../services/studies.js';
import { idParam } from './vehicles.js';
import { loadParam, loadParentParam, loaded } from './loaders.js';
import { loadProgramme } from './programmes.js';
import { reply } from '../http/reply.js';
import type { AttachedStudy, ProgrammeStudies, StudyView } from '../../shared/api/studies.js';
import type { Proposal } from '../../shared/api/documents.js';
import type { Programmes } from '../services/programmes.js';

const indexParam = z.coerce.number().int().min(0).max(1_000_000);
const listQuery = z.object({ attachedTo: z.uuid('must be a configuration id').optional() });
/** The CSV's unit system; without it, the caller's account setting. */
const csvQuery = z.strictObject({ units: z.enum(['si', 'imperial'], { error: 'use si or imperial' }).optional() });
const attachSchema = z.strictObject({ note: z.string().trim().max(500).optional() });

export function studiesRouter(studies: Studies, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  const { requirePermission } = auth;
  const teamId = (req: import('express').Request) => currentAccess(req).teamId;
  r.param('studyId', loadParam('study', 'Study', (req, id) => studies.load(teamId(req), id)));

  r.post('/', requirePermission('study:run'), async (req, res) => {
    const study = await studies.create(teamId(req), currentUser(req).id, req.body);
    res.location(`${req.baseUrl}/${study.id}`);
    reply<{ study: StudyView }>(res, { study }, 202);
  });

  r.get('/', requirePermission('team:read'), async (req, res) => {
    const q = validate(listQuery, req.query, 'query');
    if (q.attachedTo) {
      reply<{ attachments: AttachedStudy[] }>(res, { attachments: await studies.attachedTo(teamId(req), q.attachedTo) });
      return;
    }
    reply<{ studies: StudyView[] }>(res, { studies: await studies.list(teamId(req)) });
  });

  r.put('/:studyId/attachments/:configurationId', requirePermission('study:run'), async (req, res) => {
    const { note } = validate(attachSchema, req.body ?? {}, 'attachment');
    const configurationId = idParam(req.params['configurationId'], 'Configuration');
    reply<{ attachment: AttachedStudy }>(res, { attachment: await studies.attach(teamId(req), await loaded(req, 'study'), configurationId, currentUser(req).id, note ?? '') });
  });

  r.delete('/:studyId/attachments/:configurationId', requirePermission('study:run'), async (req, res) => {
    const configurationId = idParam(req.params['configurationId'], 'Configuration');
    await studies.detach(teamId(req), await loaded(req, 'study'), configurationId);
    res.status(204).end();
  });

  // `{ study: StudyView }` (shared/api) as text: the stored result is written in without parsing it (Studies.answer).
  r.get('/:studyId', requirePermission('team:read'), async (req, res) => {
    res.type('json').send(await studies.answer(await loaded(req, 'study')));
  });

  r.delete('/:studyId', requirePermission('study:run'), async (req, res) => {
    res.type('json').send(await studies.answer(await studies.cancel(teamId(req), await loaded(req, 'study'))));
  });

  r.get('/:studyId/csv', requirePermission('team:read'), async (req, res) => {
    const q = validate(csvQuery, req.query, 'query');
    const { filename, text } = await studies.csv(await loaded(req, 'study'), q.units ?? currentUser(req).displayUnits);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
    res.send(text);
  });

  r.post('/:studyId/variants/:index/proposal', requirePermission('design:propose'), async (req, res) => {
    const index = validate(indexParam, req.params['index'], 'variant index');
    const proposal = await studies.proposeVariant(teamId(req), await loaded(req, 'study'), index, currentUser(req).id);
    reply<{ proposal: Proposal }>(res, { proposal }, 201);
  });

  return r;
}

/** Mounted at /api/programmes/:programmeId/studies: the programme board's study column (its instructor only, as the board). */
export function programmeStudiesRouter(studies: Studies, programmes: Programmes, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  r.use(loadParentParam('programmeId', loadProgramme(programmes)));
  r.get('/', auth.requireUser, async (req, res) => {
    reply<ProgrammeStudies>(res, await studies.programmeStudies(await loaded(req, 'programme')));
  });
  return r;
}
