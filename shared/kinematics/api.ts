/**
 * Request-level entry points used by the HTTP routes, the worker pool and
 * the CLI: validate with zod (InputError naming the field), cap the pose
 * count, solve, and return JSON-safe plain objects (no NaN, no Infinity).
 */
import * as z from 'zod';
import { InputError, SolveError, parseOrThrow } from '../errors.js';
import { cornerDocumentSchema, upgradeCornerDocument } from '../schema/corner.js';
import { INTENT_RANGES, VEHICLE_RANGES } from '../schema/ranges.js';
import { inRange } from '../schema/ranged.js';
import { sweepCorner, expandRange } from './sweep.js';
import { axleKinematics, rollSweep, rightCornerToLeftFrame } from './axle.js';
import { AXLE_NAMES } from '../schema/axle.js';

/** Most poses one request may solve (sweep rows; roll rows count both wheels). */
export const MAX_POSES_PER_REQUEST = 20_000;
/** Most rack positions one request may list. */
export const MAX_RACK_POSITIONS = 25;

const finite = z.number().finite();
// Travel, roll and rack positions are held to their plausible ranges (shared/schema/ranges.ts, docs/inputs.md).
const travel = inRange(z.number().finite(), INTENT_RANGES.travelMm);
const rangeSchema = z.strictObject({ from: travel, to: travel, step: finite });
const roll = inRange(z.number().finite(), INTENT_RANGES.rollDeg);
const rollRangeSchema = z.strictObject({ from: roll, to: roll, step: finite });
const cornerField = cornerDocumentSchema;
const rackList = z.array(inRange(z.number().finite(), INTENT_RANGES.rackPositionMm)).min(1).max(MAX_RACK_POSITIONS).optional();
const vehicleNumber = (key: string) => inRange(z.number().finite().positive(), VEHICLE_RANGES[key]!, key);

export const cornerSweepRequestSchema = z.strictObject({
  corner: cornerField,
  /** Wheel travel range, mm. */
  travel: rangeSchema,
  /** Rack positions, mm (default [0]). */
  rackMm: rackList,
  /** Travel window of the fits, mm. */
  fitRange: z.strictObject({ fromMm: travel, toMm: travel }).optional(),
});

export const axleRollRequestSchema = z.strictObject({
  corner: cornerField,
  /** Explicit RIGHT corner in vehicle coordinates (y < 0); default: the mirror of `corner`. */
  rightCorner: z.unknown().optional(),
  /** Body roll range, deg (positive = right side down). */
  roll: rollRangeSchema,
  rackMm: rackList,
  /** Wheelbase, mm: enables Ackermann percentages. */
  wheelbaseMm: vehicleNumber('wheelbaseMm').optional(),
  /** Anti-dive / anti-squat inputs. */
  anti: z
    .strictObject({
      axle: z.enum(AXLE_NAMES),
      cgHeightMm: vehicleNumber('cgHeightMm'),
      wheelbaseMm: vehicleNumber('wheelbaseMm'),
      brakeFrontFraction: finite.min(0).max(1).optional(),
      driveFrontFraction: finite.min(0).max(1).optional(),
    })
    .optional(),
  /** Rack travel per handwheel revolution, mm: enables the overall steering ratio. */
  rackMmPerHandwheelRev: inRange(z.number().finite(), INTENT_RANGES.rackMmPerHandwheelRev, 'rackMmPerHandwheelRev').optional(),
});

function capPoses(n: number, field: string): void {
  if (n > MAX_POSES_PER_REQUEST) {
    throw new InputError(`${field}: ${n} poses is more than the ${MAX_POSES_PER_REQUEST} one request may solve; use a coarser step or fewer rack positions`, [
      { path: field, message: `more than ${MAX_POSES_PER_REQUEST} poses` },
    ]);
  }
}

/** Throws SolveError if any number in the result is not finite (the engine never returns NaN). */
export function assertFinite(value: unknown, path = 'result'): void {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new SolveError('singular_geometry', `Non-finite value at ${path}`, { path });
  } else if (Array.isArray(value)) value.forEach((v, i) => assertFinite(v, `${path}[${i}]`));
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) assertFinite(v, `${path}.${k}`);
}

/** POST /api/compute/corner-sweep and `rollwise sweep`: rows per (rack, travel) and fits per rack. */
export function computeCornerSweep(input: unknown) {
  const req = parseOrThrow(cornerSweepRequestSchema, input, 'corner-sweep request');
  const travels = expandRange(req.travel, 'travel');
  capPoses(travels.length * (req.rackMm?.length ?? 1), 'travel');
  const result = sweepCorner(req.corner, { travel: req.travel, rackMm: req.rackMm, fitRange: req.fitRange });
  assertFinite(result);
  return result;
}

/** POST /api/compute/axle-roll and `rollwise roll`: roll sweep (ε, roll camber, roll centre migration) plus the axle at design. */
export function computeAxleRoll(input: unknown) {
  const req = parseOrThrow(axleRollRequestSchema, input, 'axle-roll request');
  const rolls = expandRange(req.roll, 'roll');
  capPoses(2 * rolls.length * (req.rackMm?.length ?? 1), 'roll');
  const right = req.rightCorner === undefined ? undefined : rightCornerToLeftFrameChecked(req.rightCorner);
  const roll = rollSweep(req.corner, { roll: req.roll, rackMm: req.rackMm, rightCorner: right, wheelbaseMm: req.wheelbaseMm });
  const axle = axleKinematics(req.corner, {
    rightCorner: right,
    wheelbaseMm: req.wheelbaseMm,
    anti: req.anti,
    rackMmPerHandwheelRev: req.rackMmPerHandwheelRev,
  });
  const result = { ...roll, axle };
  assertFinite(result);
  return result;
}

/** Upgrades and checks an explicit right corner early, so its errors name `rightCorner.…`; returns it unchanged (vehicle frame). */
function rightCornerToLeftFrameChecked(doc: unknown): unknown {
  const up = upgradeCornerDocument(doc);
  rightCornerToLeftFrame(up);
  return up;
}
