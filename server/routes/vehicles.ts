/** /api/teams/:teamId/vehicles: vehicles, their data and revisions. */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { notFound } from '../../shared/errors.js';
import { currentAccess, currentUser, isUuid, type Authorizer } from '../http/authorize.js';
import { parseVehicleData, type Vehicles } from '../services/vehicles.js';
import { loadParam, loaded } from './loaders.js';
import { reply } from '../http/reply.js';
import type { VehicleRecord, VehicleRevisionRecord, VehicleSummary } from '../../shared/api/documents.js';
import type { RevisionCompare, RevisionRow } from '../../shared/api/common.js';
import { diffDocuments } from '../services/document-diff.js';

export const documentName = z.string().trim().min(1, 'is required').max(120);
export const baseRevision = z.number({ error: 'baseRevision (the revision your edit starts from) is required' }).int().positive();
export const revisionMessage = z.string().trim().max(500).optional();
export const archivedQuery = z.object({ archived: z.enum(['true', 'false']).optional() });
const revisionParam = z.coerce.number().int().positive();

/** The :revision path parameter; anything but a positive integer is a missing revision. */
export function revisionNumber(raw: unknown): number {
  const n = revisionParam.safeParse(raw);
  if (!n.success) throw notFound('Revision');
  return n.data;
}

const createSchema = z.strictObject({ name: documentName, data: z.unknown().optional() });
const patchSchema = z
  .strictObject({ name: documentName.optional(), archived: z.boolean().optional(), baseRevision, message: revisionMessage })
  .refine((p) => p.name !== undefined || p.archived !== undefined, { message: 'give name or archived', path: ['name'] });
const dataSchema = z.strictObject({ data: z.unknown(), baseRevision, message: revisionMessage });

export function idParam(raw: unknown, what: string): string {
  if (!isUuid(raw)) throw notFound(what);
  return raw;
}

export function vehiclesRouter(vehicles: Vehicles, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  const { requirePermission } = auth;
  r.param('vehicleId', loadParam('vehicle', 'Vehicle', (req, id) => vehicles.get(currentAccess(req).teamId, id)));

  r.get('/', requirePermission('team:read'), async (req, res) => {
    const q = validate(archivedQuery, req.query, 'query');
    reply<VehicleSummary[]>(res, await vehicles.list(currentAccess(req).teamId, q.archived === 'true'));
  });

  r.post('/', requirePermission('vehicle:manage'), async (req, res) => {
    const input = validate(createSchema, req.body);
    reply<VehicleRecord>(res, await vehicles.create(currentAccess(req).teamId, currentUser(req).id, input), 201);
  });

  r.get('/:vehicleId', requirePermission('team:read'), async (req, res) => {
    reply<VehicleRecord>(res, await loaded(req, 'vehicle'));
  });

  r.patch('/:vehicleId', requirePermission('vehicle:manage'), async (req, res) => {
    const { baseRevision: base, ...change } = validate(patchSchema, req.body);
    const v = await loaded(req, 'vehicle');
    reply<VehicleRecord>(res, await vehicles.update(currentAccess(req).teamId, v.id, currentUser(req).id, base, change));
  });

  r.put('/:vehicleId/data', requirePermission('vehicle:edit'), async (req, res) => {
    const input = validate(dataSchema, req.body);
    const data = parseVehicleData(input.data);
    const v = await loaded(req, 'vehicle');
    reply<VehicleRecord>(
      res,
      await vehicles.update(currentAccess(req).teamId, v.id, currentUser(req).id, input.baseRevision, {
        data,
        message: input.message,
      }),
    );
  });

  r.get('/:vehicleId/revisions', requirePermission('team:read'), async (req, res) => {
    reply<RevisionRow[]>(res, await vehicles.revisions(await loaded(req, 'vehicle')));
  });

  // Changed values between two revisions (e.g. ?from=1&to=3), side by side.
  r.get('/:vehicleId/compare', requirePermission('team:read'), async (req, res) => {
    const v = await loaded(req, 'vehicle');
    reply<RevisionCompare>(res, await compareRevisions(req.query, (n) => vehicles.revision(v, n), 'data'));
  });

  r.get('/:vehicleId/revisions/:revision', requirePermission('team:read'), async (req, res) => {
    const v = await loaded(req, 'vehicle');
    reply<VehicleRevisionRecord>(res, await vehicles.revision(v, revisionNumber(req.params['revision'])));
  });

  return r;
}

const compareRevisionsQuery = z.object({ from: z.coerce.number().int().positive(), to: z.coerce.number().int().positive() });

/**
 * Answer of a revisions compare route (`?from=&to=`): the changed values of
 * two revisions of one document (name, archived and the document under `docKey`).
 */
export async function compareRevisions<K extends string>(
  query: unknown,
  load: (revision: number) => Promise<{ name: string; archived: boolean } & Record<K, unknown>>,
  docKey: K,
) {
  const { from, to } = validate(compareRevisionsQuery, query, 'query');
  const [a, b] = await Promise.all([load(from), load(to)]);
  const pick = (r: typeof a) => ({ name: r.name, archived: r.archived, [docKey]: r[docKey] });
  return { from, to, changes: diffDocuments(pick(a), pick(b), { expandArrays: true }) };
}
