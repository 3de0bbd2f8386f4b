/**
 * /api/teams/:teamId/configurations/:configurationId/…: the sign-off gates,
 * the "use the latest revisions" preview and the review record (JSON, a
 * printable page and a PDF, in the reader's units). The decisions themselves stay on the
 * configurations router; this file gives their bodies the gate fields.
 */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { currentAccess, currentUser, type Authorizer } from '../http/authorize.js';
import type { Configurations, ReviewAction } from '../services/configurations.js';
import type { GateInput, ReviewGates } from '../services/review-gates.js';
import type { LatestPreview } from '../services/latest-preview.js';
import type { ReviewRecord } from '../services/review-record.js';
import { renderReviewRecordHtml } from '../services/review-record-html.js';
import { renderPdf } from '../services/record-pdf.js';
import { loadParam, loaded } from './loaders.js';
import { reply } from '../http/reply.js';
import type { GatesAnswer, LatestPreviewAnswer } from '../../shared/api/configurations.js';

const axle = z.enum(['front', 'rear'], { error: 'use front or rear' });
/** Reasons up to 1000 characters, at most 24 of them: a sign-off body stays well inside the 32 kB door (server/http/body.ts). */
const reason = z.string().trim().min(3, 'write the reason (at least a few words)').max(1000, 'keep the reason to 1000 characters or fewer');
const acknowledgement = z.strictObject({ axle, code: z.string().regex(/^[a-z0-9-]{1,60}$/, 'is not a caution code'), reason });
const waiver = z.strictObject({ axle, reason });

/**
 * Reads the body of a review step: the configurations router's own schema
 * (`base`), plus `acknowledgements` for a sign-off or `waivers` for the move
 * to validated. Other steps take neither (strict: 400 when sent).
 */
export function readTransitionBody(
  action: ReviewAction,
  base: z.ZodObject,
  body: unknown,
): { message?: string | undefined; revision?: number | undefined } & GateInput {
  const schema =
    action === 'approve'
      ? base.extend({ acknowledgements: z.array(acknowledgement).max(24).optional() })
      : action === 'validate'
        ? base.extend({ waivers: z.array(waiver).max(2).optional() })
        : base;
  return validate(schema, body);
}

const revisionQuery = z.strictObject({ revision: z.coerce.number().int().positive().optional() });
/** The record page and PDF: a revision, and the unit system to write the figures in (default the reader's account setting). */
const recordQuery = revisionQuery.extend({ units: z.enum(['si', 'imperial'], { error: 'use si or imperial' }).optional() });

/** The strict policy of the record page: no script, nothing loaded, shown only inside the app's own frame. */
const RECORD_PAGE_POLICY = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'self'; base-uri 'none'; form-action 'none'";

export function reviewGatesRouter(
  configs: Configurations,
  gates: ReviewGates,
  preview: LatestPreview,
  record: ReviewRecord,
  auth: Authorizer,
  chromiumPath: string,
): Router {
  const r = Router({ mergeParams: true });
  const { requirePermission } = auth;
  r.param('configurationId', loadParam('configuration', 'Configuration', (req, id) => configs.get(currentAccess(req).teamId, id)));

  r.get('/:configurationId/gates', requirePermission('team:read'), async (req, res) => {
    const q = validate(revisionQuery, req.query, 'query');
    reply<GatesAnswer>(res, await gates.status(currentAccess(req).teamId, await loaded(req, 'configuration'), q.revision));
  });

  r.get('/:configurationId/latest-preview', requirePermission('team:read'), async (req, res) => {
    validate(z.strictObject({}), req.query, 'query');
    reply<LatestPreviewAnswer>(res, await preview.preview(await loaded(req, 'configuration')));
  });

  r.get('/:configurationId/record', requirePermission('team:read'), async (req, res) => {
    const q = validate(revisionQuery, req.query, 'query');
    res.json(await record.record(currentAccess(req).teamId, await loaded(req, 'configuration'), q.revision));
  });

  r.get('/:configurationId/record.html', requirePermission('team:read'), async (req, res) => {
    const q = validate(recordQuery, req.query, 'query');
    const units = q.units ?? currentUser(req).displayUnits;
    const answer = await record.record(currentAccess(req).teamId, await loaded(req, 'configuration'), q.revision, units);
    res.setHeader('Content-Security-Policy', RECORD_PAGE_POLICY);
    res.setHeader('X-Frame-Options', 'SAMEORIGIN');
    res.type('html').send(renderReviewRecordHtml(answer, units));
  });

  r.get('/:configurationId/record.pdf', requirePermission('team:read'), async (req, res) => {
    const q = validate(recordQuery, req.query, 'query');
    const units = q.units ?? currentUser(req).displayUnits;
    const answer = await record.record(currentAccess(req).teamId, await loaded(req, 'configuration'), q.revision, units);
    const title = `${answer.configuration.name}, revision ${answer.revision.number}`;
    const pdf = await renderPdf(renderReviewRecordHtml(answer, units), { footerText: `Review record: ${title} · made ${answer.generatedAt.toISOString().slice(0, 10)}`, executablePath: chromiumPath });
    const file = `review-record-${answer.configuration.name.replace(/[^A-Za-z0-9._-]+/g, '-').slice(0, 60)}-r${answer.revision.number}.pdf`;
    res.setHeader('Content-Disposition', `attachment; filename="${file}"`);
    res.type('application/pdf').send(pdf);
  });

  return r;
}
