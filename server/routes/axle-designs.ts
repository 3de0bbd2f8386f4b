/**
 * Axle designs: listed and created under their vehicle
 * (/api/teams/:teamId/vehicles/:vehicleId/axle-designs), read and edited
 * by id (/api/teams/:teamId/axle-designs/:designId).
 */
import { Router } from 'express';
import { z } from 'zod';
import { HttpError, validate } from '../http/errors.js';
import { jsonUploadField, singleTextUpload, uploadedText } from '../http/upload.js';
import { cadFrameSchema } from '../../shared/io/cad-frame-schema.js';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import { AXLES } from '../db/schema.js';
import { parseCorner, type AxleDesigns } from '../services/axle-designs.js';
import type { Proposals } from '../services/proposals.js';
import { archivedQuery, baseRevision, compareRevisions, documentName, idParam, revisionMessage, revisionNumber } from './vehicles.js';

const createSchema = z.strictObject({ axle: z.enum(AXLES), name: documentName, corner: z.unknown() });
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
export function vehicleAxleDesignsRouter(designs: AxleDesigns, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  r.get('/', auth.requirePermission('team:read'), async (req, res) => {
    const q = validate(archivedQuery, req.query, 'query');
    res.json(await designs.list(currentAccess(req).teamId, idParam(req.params['vehicleId'], 'Vehicle'), q.archived === 'true'));
  });
  r.post('/', auth.requirePermission('vehicle:manage'), async (req, res) => {
    const input = validate(createSchema, req.body);
    const corner = parseCorner(input.corner);
    const vehicleId = idParam(req.params['vehicleId'], 'Vehicle');
    res.status(201).json(await designs.create(currentAccess(req).teamId, vehicleId, currentUser(req).id, { ...input, corner }));
  });
  return r;
}

/** Mounted at /api/teams/:teamId/axle-designs. */
export function axleDesignsRouter(designs: AxleDesigns, proposals: Proposals, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  const { requirePermission } = auth;
  const designId = (raw: unknown) => idParam(raw, 'Axle design');
  const proposalId = (raw: unknown) => idParam(raw, 'Proposal');

  r.get('/:designId', requirePermission('team:read'), async (req, res) => {
    res.json(await designs.get(currentAccess(req).teamId, designId(req.params['designId'])));
  });

  r.patch('/:designId', requirePermission('vehicle:manage'), async (req, res) => {
    const { baseRevision: base, ...change } = validate(patchSchema, req.body);
    res.json(await designs.update(currentAccess(req).teamId, designId(req.params['designId']), currentUser(req).id, base, change));
  });

  r.put('/:designId/corner', requirePermission('design:edit'), async (req, res) => {
    const input = validate(cornerBodySchema, req.body);
    const corner = parseCorner(input.corner);
    res.json(
      await designs.update(currentAccess(req).teamId, designId(req.params['designId']), currentUser(req).id, input.baseRevision, {
        corner,
        message: input.message,
      }),
    );
  });

  // Reads an uploaded CSV or JSON file against the current corner and answers the preview; saves nothing.
  r.post('/:designId/import', requirePermission('design:edit'), singleTextUpload('file', ['csv', 'txt', 'tsv', 'json']), async (req, res) => {
    const fields = importFields(req.body);
    const file = uploadedText(req);
    res.json(await designs.previewImport(currentAccess(req).teamId, designId(req.params['designId']), file, fields));
  });

  r.get('/:designId/revisions', requirePermission('team:read'), async (req, res) => {
    res.json(await designs.revisions(currentAccess(req).teamId, designId(req.params['designId'])));
  });

  // Changed values (hardpoint coordinates one by one) between two revisions, e.g. ?from=1&to=3.
  r.get('/:designId/compare', requirePermission('team:read'), async (req, res) => {
    const teamId = currentAccess(req).teamId;
    const id = designId(req.params['designId']);
    res.json(await compareRevisions(req.query, (n) => designs.revision(teamId, id, n), 'corner'));
  });

  r.get('/:designId/revisions/:revision', requirePermission('team:read'), async (req, res) => {
    res.json(await designs.revision(currentAccess(req).teamId, designId(req.params['designId']), revisionNumber(req.params['revision'])));
  });

  r.get('/:designId/proposals', requirePermission('team:read'), async (req, res) => {
    res.json(await proposals.list(currentAccess(req).teamId, designId(req.params['designId'])));
  });

  r.post('/:designId/proposals', requirePermission('design:propose'), async (req, res) => {
    const input = validate(proposalSchema, req.body);
    const corner = parseCorner(input.corner);
    const p = await proposals.create(currentAccess(req).teamId, designId(req.params['designId']), currentUser(req).id, { ...input, corner });
    res.status(201).json(p);
  });

  r.get('/:designId/proposals/:proposalId', requirePermission('team:read'), async (req, res) => {
    res.json(await proposals.get(currentAccess(req).teamId, designId(req.params['designId']), proposalId(req.params['proposalId'])));
  });

  r.post('/:designId/proposals/:proposalId/accept', requirePermission('design:accept'), async (req, res) => {
    const { message } = validate(decisionSchema, req.body ?? {});
    const ids = [currentAccess(req).teamId, designId(req.params['designId']), proposalId(req.params['proposalId'])] as const;
    res.json(await proposals.accept(...ids, currentUser(req).id, message));
  });

  r.post('/:designId/proposals/:proposalId/reject', requirePermission('design:accept'), async (req, res) => {
    const { message } = validate(decisionSchema, req.body ?? {});
    const ids = [currentAccess(req).teamId, designId(req.params['designId']), proposalId(req.params['proposalId'])] as const;
    res.json(await proposals.reject(...ids, currentUser(req).id, message));
  });

  r.delete('/:designId/proposals/:proposalId', requirePermission('design:propose'), async (req, res) => {
    const ids = [currentAccess(req).teamId, designId(req.params['designId']), proposalId(req.params['proposalId'])] as const;
    res.json(await proposals.withdraw(...ids, currentUser(req).id));
  });

  return r;
}
