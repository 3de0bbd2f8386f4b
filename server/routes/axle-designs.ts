/**
 * Axle designs: listed and created under their vehicle
 * (/api/teams/:teamId/vehicles/:vehicleId/axle-designs), read and edited
 * by id (/api/teams/:teamId/axle-designs/:designId).
 */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { jsonUploadField, singleTextUpload, uploadedText } from '../http/upload.js';
import { cadFrameSchema } from '../../shared/io/cad-frame-schema.js';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import { AXLE_NAMES } from '../../shared/schema/axle.js';
import { parseCorner, type AxleDesigns } from '../services/axle-designs.js';
import type { Proposals } from '../services/proposals.js';
import type { Vehicles } from '../services/vehicles.js';
import { archivedQuery, baseRevision, compareRevisions, documentName, revisionMessage, revisionNumber } from './vehicles.js';
import { loadParam, loadParentParam, loaded } from './loaders.js';
import { reply } from '../http/reply.js';
import type { AcceptedProposal, AxleDesign, AxleDesignSummary, DesignRevisionRecord, ImportPreview, Proposal } from '../../shared/api/documents.js';
import type { RevisionCompare, RevisionRow } from '../../shared/api/common.js';

const createSchema = z.strictObject({ axle: z.enum(AXLE_NAMES), name: documentName, corner: z.unknown() });
const patchSchema = z
  .strictObject({ name: documentName.optional(), archived: z.boolean().optional(), baseRevision, message: revisionMessage })
  .refine((p) => p.name !== undefined || p.archived !== undefined, { message: 'give name or archived', path: ['name'] });
const cornerBodySchema = z.strictObject({ corner: z.unknown(), baseRevision, message: revisionMessage });
const proposalSchema = z.strictObject({
  corner: z.unknown(),
  baseRevision,
  message: revisionMessage,
  /** What produced the geometry (e.g. the intent and a summary of the solution), shown to the designer. */
  origin: z.record(z.string(), z.unknown()).optional(),
});
const decisionSchema = z.strictObject({ message: revisionMessage });
/**
 * Text fields beside the uploaded file, each JSON: `frame`, the CAD frame the
 * file's points are in; `corner`, the editor's working corner (unsaved edits
 * included) to merge into instead of the stored one.
 */
const importFieldsSchema = z.strictObject({ frame: z.string().max(2000).optional(), corner: z.string().max(60_000).optional() });

function importFields(body: unknown) {
  const fields = validate(importFieldsSchema, body ?? {}, 'upload fields');
  return {
    frame: fields.frame === undefined ? undefined : validate(cadFrameSchema, jsonUploadField('frame', fields.frame), 'frame'),
    corner: fields.corner === undefined ? undefined : parseCorner(jsonUploadField('corner', fields.corner)),
  };
}

/** Mounted at /api/teams/:teamId/vehicles/:vehicleId/axle-designs. */
export function vehicleAxleDesignsRouter(designs: AxleDesigns, vehicles: Vehicles, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  r.use(loadParentParam('vehicleId', loadParam('vehicle', 'Vehicle', (req, id) => vehicles.get(currentAccess(req).teamId, id))));
  r.get('/', auth.requirePermission('team:read'), async (req, res) => {
    const q = validate(archivedQuery, req.query, 'query');
    reply<AxleDesignSummary[]>(res, await designs.list(await loaded(req, 'vehicle'), q.archived === 'true'));
  });
  r.post('/', auth.requirePermission('vehicle:manage'), async (req, res) => {
    const input = validate(createSchema, req.body);
    const corner = parseCorner(input.corner);
    const vehicle = await loaded(req, 'vehicle');
    reply<AxleDesign>(res, await designs.create(currentAccess(req).teamId, vehicle, currentUser(req).id, { ...input, corner }), 201);
  });
  return r;
}

/** Mounted at /api/teams/:teamId/axle-designs. */
export function axleDesignsRouter(designs: AxleDesigns, proposals: Proposals, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  const { requirePermission } = auth;
  r.param('designId', loadParam('design', 'Axle design', (req, id) => designs.get(currentAccess(req).teamId, id)));
  r.param('proposalId', loadParam('proposal', 'Proposal', async (req, id) => proposals.getOf(await loaded(req, 'design'), id)));

  r.get('/:designId', requirePermission('team:read'), async (req, res) => {
    reply<AxleDesign>(res, await loaded(req, 'design'));
  });

  r.patch('/:designId', requirePermission('vehicle:manage'), async (req, res) => {
    const { baseRevision: base, ...change } = validate(patchSchema, req.body);
    const d = await loaded(req, 'design');
    reply<AxleDesign>(res, await designs.update(currentAccess(req).teamId, d.id, currentUser(req).id, base, change));
  });

  r.put('/:designId/corner', requirePermission('design:edit'), async (req, res) => {
    const input = validate(cornerBodySchema, req.body);
    const corner = parseCorner(input.corner);
    const d = await loaded(req, 'design');
    reply<AxleDesign>(res, await designs.update(currentAccess(req).teamId, d.id, currentUser(req).id, input.baseRevision, { corner, message: input.message }));
  });

  // Reads an uploaded CSV or JSON file against the current corner and answers the preview; saves nothing.
  r.post('/:designId/import', requirePermission('design:edit'), singleTextUpload('file', ['csv', 'txt', 'tsv', 'json']), async (req, res) => {
    const fields = importFields(req.body);
    const file = uploadedText(req);
    reply<ImportPreview>(res, await designs.previewImport(await loaded(req, 'design'), file, fields));
  });

  r.get('/:designId/revisions', requirePermission('team:read'), async (req, res) => {
    reply<RevisionRow[]>(res, await designs.revisions(await loaded(req, 'design')));
  });

  // Changed values (hardpoint coordinates one by one) between two revisions, e.g. ?from=1&to=3.
  r.get('/:designId/compare', requirePermission('team:read'), async (req, res) => {
    const d = await loaded(req, 'design');
    reply<RevisionCompare>(res, await compareRevisions(req.query, (n) => designs.revisionOf(d, n), 'corner'));
  });

  r.get('/:designId/revisions/:revision', requirePermission('team:read'), async (req, res) => {
    const d = await loaded(req, 'design');
    reply<DesignRevisionRecord>(res, await designs.revisionOf(d, revisionNumber(req.params['revision'])));
  });

  r.get('/:designId/proposals', requirePermission('team:read'), async (req, res) => {
    reply<Proposal[]>(res, await proposals.list(await loaded(req, 'design')));
  });

  r.post('/:designId/proposals', requirePermission('design:propose'), async (req, res) => {
    const input = validate(proposalSchema, req.body);
    const corner = parseCorner(input.corner);
    const p = await proposals.create(currentAccess(req).teamId, await loaded(req, 'design'), currentUser(req).id, { ...input, corner });
    reply<Proposal>(res, p, 201);
  });

  r.get('/:designId/proposals/:proposalId', requirePermission('team:read'), async (req, res) => {
    reply<Proposal>(res, await loaded(req, 'proposal'));
  });

  r.post('/:designId/proposals/:proposalId/accept', requirePermission('design:accept'), async (req, res) => {
    const { message } = validate(decisionSchema, req.body ?? {});
    const p = await loaded(req, 'proposal');
    reply<AcceptedProposal>(res, await proposals.accept(currentAccess(req).teamId, await loaded(req, 'design'), p, currentUser(req).id, message));
  });

  r.post('/:designId/proposals/:proposalId/reject', requirePermission('design:accept'), async (req, res) => {
    const { message } = validate(decisionSchema, req.body ?? {});
    const p = await loaded(req, 'proposal');
    reply<Proposal>(res, await proposals.reject(currentAccess(req).teamId, await loaded(req, 'design'), p, currentUser(req).id, message));
  });

  r.delete('/:designId/proposals/:proposalId', requirePermission('design:propose'), async (req, res) => {
    const p = await loaded(req, 'proposal');
    reply<Proposal>(res, await proposals.withdraw(currentAccess(req).teamId, await loaded(req, 'design'), p, currentUser(req).id));
  });

  return r;
}
