/**
 * Rig measurements (docs/rig-measurements.md), mounted at /api/teams/:teamId:
 *   POST   /rig-measurements/preview   multipart `file`: columns, first rows, proposed mapping (nothing stored)
 *   POST   /rig-measurements           multipart `file` + `mapping` + `target` (+ `options`): stored whole, with its comparison
 *   GET    /rig-measurements           list (?configurationId=, ?designId=)
 *   GET    /rig-measurements/:id       points, mapping and the comparison recomputed now (cautions worded in the caller's units)
 *   DELETE /rig-measurements/:id
 *   GET    /rig-tolerance, PUT /rig-tolerance   the team's rig tolerance
 */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { jsonUploadField, singleTextUpload, uploadedText } from '../http/upload.js';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import { AXLE_NAMES } from '../../shared/schema/axle.js';
import { rigMappingSchema } from '../../shared/io/rig-mapping-schema.js';
import { INTENT_RANGES } from '../../shared/schema/ranges.js';
import { inRange } from '../../shared/schema/ranged.js';
import { RIG_BASES, rigToleranceSchema } from '../../shared/rig/compare.js';
import type { RigMeasurements } from '../services/rig-measurements.js';
import { loadParam, loaded } from './loaders.js';
import { reply } from '../http/reply.js';
import type { CreatedRigMeasurement, RigMeasurementDetail, RigMeasurementSummary, RigPreviewAnswer, RigToleranceView } from '../../shared/api/rig.js';

const uuid = z.uuid('must be an id');
const rev = z.number().int().positive();

const targetSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('configuration'), configurationId: uuid, configurationRevision: rev.optional(), axle: z.enum(AXLE_NAMES) }),
  z.strictObject({ kind: z.literal('baseline'), designId: uuid, designRevision: rev.optional() }),
]);

const optionsSchema = z.strictObject({
  name: z.string().trim().max(120).optional(),
  note: z.string().trim().max(1000).optional(),
  side: z.enum(['left', 'right']).default('left'),
  rackMm: inRange(z.number().finite(), INTENT_RANGES.rackPositionMm, 'rackMm').default(0),
  basis: z.enum(RIG_BASES).default('change'),
});

/** Text fields beside the file, each JSON. */
const createFieldsSchema = z.strictObject({
  mapping: z.string({ error: 'is required (the column mapping, JSON)' }).max(4000),
  target: z.string({ error: 'is required (what the measurement is compared with, JSON)' }).max(2000),
  options: z.string().max(4000).optional(),
});

const listQuery = z.strictObject({ configurationId: uuid.optional(), designId: uuid.optional() });

const RIG_EXTENSIONS = ['csv', 'txt', 'tsv'];

export function rigMeasurementsRouter(rig: RigMeasurements, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  const { requirePermission } = auth;
  r.param('measurementId', loadParam('rigMeasurement', 'Rig measurement', (req, id) => rig.summary(currentAccess(req).teamId, id)));

  r.post('/rig-measurements/preview', requirePermission('vehicle:manage'), singleTextUpload('file', RIG_EXTENSIONS), (req, res) => {
    validate(z.strictObject({}), req.body ?? {}, 'upload fields');
    reply<RigPreviewAnswer>(res, rig.preview(uploadedText(req)));
  });

  r.post('/rig-measurements', requirePermission('vehicle:manage'), singleTextUpload('file', RIG_EXTENSIONS), async (req, res) => {
    const fields = validate(createFieldsSchema, req.body ?? {}, 'upload fields');
    const mapping = validate(rigMappingSchema, jsonUploadField('mapping', fields.mapping), 'mapping');
    const target = validate(targetSchema, jsonUploadField('target', fields.target), 'target');
    const options = validate(optionsSchema, fields.options === undefined ? {} : jsonUploadField('options', fields.options), 'options');
    const file = uploadedText(req);
    reply<CreatedRigMeasurement>(res, await rig.create(currentAccess(req).teamId, currentUser(req).id, file, mapping, target, options), 201);
  });

  r.get('/rig-measurements', requirePermission('team:read'), async (req, res) => {
    const q = validate(listQuery, req.query, 'query');
    reply<RigMeasurementSummary[]>(res, await rig.list(currentAccess(req).teamId, q));
  });

  r.get('/rig-measurements/:measurementId', requirePermission('team:read'), async (req, res) => {
    reply<RigMeasurementDetail>(res, await rig.get(currentAccess(req).teamId, await loaded(req, 'rigMeasurement'), currentUser(req).displayUnits));
  });

  r.delete('/rig-measurements/:measurementId', requirePermission('vehicle:manage'), async (req, res) => {
    await rig.remove(currentAccess(req).teamId, await loaded(req, 'rigMeasurement'), currentUser(req).id);
    res.status(204).end();
  });

  r.get('/rig-tolerance', requirePermission('team:read'), async (req, res) => {
    reply<RigToleranceView>(res, await rig.tolerance(currentAccess(req).teamId));
  });

  r.put('/rig-tolerance', requirePermission('members:manage'), async (req, res) => {
    const t = validate(rigToleranceSchema, req.body, 'rig tolerance');
    reply<RigToleranceView>(res, await rig.setTolerance(currentAccess(req).teamId, currentUser(req).id, t));
  });

  return r;
}
