/**
 * Request-level entry point of the compliance engine, used by the HTTP
 * route (in the compute pool), the Web Worker and the CLI: validate with
 * zod (InputError naming the field), cap the pose count, solve, and return
 * JSON-safe plain objects.
 */
import * as z from 'zod';
import { InputError, parseOrThrow } from '../errors.js';
import { cornerDocumentSchema } from '../schema/corner.js';
import { expandRange } from '../kinematics/index.js';
import { cornerCompliance, complianceSweep, type ComplianceRow, type CornerComplianceReport } from './index.js';

/** Most poses one compliance request may sweep. */
export const MAX_COMPLIANCE_POSES = 5000;

const finite = z.number().finite();

export const cornerComplianceRequestSchema = z.strictObject({
  corner: cornerDocumentSchema,
  /** Wheel travel of the reported pose, mm (default 0). */
  travelMm: finite.optional(),
  /** Rack position of the reported pose, mm (default 0). */
  rackMm: finite.optional(),
  /** Optional sweep: headline figures over a travel range at each rack position. */
  sweep: z
    .strictObject({
      travel: z.strictObject({ from: finite, to: finite, step: finite }),
      rackMm: z.array(finite).min(1).max(25).optional(),
    })
    .optional(),
});

export type CornerComplianceResult = CornerComplianceReport & { sweep?: ComplianceRow[] };

/** POST /api/compute/corner-compliance and `rollwise compliance`. */
export function computeCornerCompliance(input: unknown): CornerComplianceResult {
  const req = parseOrThrow(cornerComplianceRequestSchema, input, 'corner-compliance request');
  const report: CornerComplianceResult = cornerCompliance(req.corner, { travelMm: req.travelMm, rackMm: req.rackMm });
  if (req.sweep) {
    const travels = expandRange(req.sweep.travel, 'sweep.travel');
    const racks = req.sweep.rackMm ?? [0];
    if (travels.length * racks.length > MAX_COMPLIANCE_POSES) {
      throw new InputError(`sweep: ${travels.length * racks.length} poses is more than the ${MAX_COMPLIANCE_POSES} one request may sweep; use a coarser step or fewer rack positions`, [
        { path: 'sweep.travel', message: `more than ${MAX_COMPLIANCE_POSES} poses` },
      ]);
    }
    try {
      report.sweep = complianceSweep(req.corner, travels, racks);
    } catch (e) {
      if (e instanceof InputError) throw new InputError(e.message.replace(/^rackMm/, 'sweep.rackMm'), e.issues.map((i) => ({ ...i, path: i.path.replace(/^rackMm/, 'sweep.rackMm') })));
      throw e;
    }
  }
  return report;
}
