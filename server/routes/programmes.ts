/**
 * /api/programmes (instructors) and /api/teams/:teamId/programmes (the team
 * owner accepts or declines an invitation to a programme).
 */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import { TRACK_PROFILE_IDS } from '../../shared/tracks/profiles.js';
import { Programmes } from '../services/programmes.js';
import { idParam } from './vehicles.js';
import { loadParam, loaded } from './loaders.js';
import { reply } from '../http/reply.js';
import type { Board, Programme, ProgrammeDetail, ProgrammeTeam, Snapshot, SnapshotSummary, TeamProgramme } from '../../shared/api/programmes.js';

const createSchema = z.strictObject({ name: z.string().trim().min(1, 'is required').max(120), trackProfile: z.enum(TRACK_PROFILE_IDS) });
const inviteSchema = z.strictObject({ teamSlug: z.string().trim().min(1).max(60) });
const snapshotSchema = z.strictObject({ label: z.string().trim().min(1).max(120).optional() });
const formatQuery = z.object({ format: z.enum(['json', 'csv']).optional(), units: z.enum(['si', 'imperial'], { error: 'use si or imperial' }).optional() });

/** The `:programmeId` loader of the instructor's routes: the programme, for its instructor only (anyone else: 404). */
export const loadProgramme = (programmes: Programmes) => loadParam('programme', 'Programme', (req, id) => programmes.load(currentUser(req), id));

export function programmesRouter(programmes: Programmes, auth: Authorizer): Router {
  const r = Router();
  r.param('programmeId', loadProgramme(programmes));

  r.get('/', auth.requireUser, async (req, res) => {
    reply<Programme[]>(res, await programmes.list(currentUser(req)));
  });
  r.post('/', auth.requireUser, async (req, res) => {
    reply<Programme>(res, await programmes.create(currentUser(req), validate(createSchema, req.body)), 201);
  });
  r.get('/:programmeId', auth.requireUser, async (req, res) => {
    reply<ProgrammeDetail>(res, await programmes.get(await loaded(req, 'programme')));
  });
  r.post('/:programmeId/teams', auth.requireUser, async (req, res) => {
    const { teamSlug } = validate(inviteSchema, req.body);
    reply<ProgrammeTeam>(res, await programmes.inviteTeam(await loaded(req, 'programme'), teamSlug), 201);
  });
  r.get('/:programmeId/board', auth.requireUser, async (req, res) => {
    reply<Board>(res, await programmes.board(await loaded(req, 'programme')));
  });
  r.post('/:programmeId/snapshots', auth.requireUser, async (req, res) => {
    const { label } = validate(snapshotSchema, req.body ?? {});
    reply<Snapshot>(res, await programmes.snapshot(currentUser(req), await loaded(req, 'programme'), label), 201);
  });
  r.get('/:programmeId/snapshots', auth.requireUser, async (req, res) => {
    reply<SnapshotSummary[]>(res, await programmes.snapshots(await loaded(req, 'programme')));
  });
  r.get('/:programmeId/snapshots/:snapshotId', auth.requireUser, async (req, res) => {
    const q = validate(formatQuery, req.query, 'query');
    const p = await loaded(req, 'programme');
    const s = await programmes.snapshotById(p, idParam(req.params['snapshotId'], 'Snapshot'));
    if (q.format === 'csv') {
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="programme-board-${s.takenAt.toISOString().slice(0, 10)}.csv"`);
      res.send(Programmes.csv(s.board, q.units ?? currentUser(req).displayUnits));
      return;
    }
    reply<Snapshot>(res, s);
  });
  return r;
}

/** Mounted at /api/teams/:teamId/programmes. */
export function teamProgrammesRouter(programmes: Programmes, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  r.get('/', auth.requirePermission('members:manage'), async (req, res) => {
    reply<TeamProgramme[]>(res, await programmes.forTeam(currentAccess(req).teamId));
  });
  for (const [path, status] of [['accept', 'accepted'], ['decline', 'declined']] as const) {
    r.post(`/:programmeId/${path}`, auth.requirePermission('members:manage'), async (req, res) => {
      res.json(await programmes.decide(currentAccess(req).teamId, idParam(req.params['programmeId'], 'Programme'), currentUser(req).id, status));
    });
  }
  return r;
}
