/**
 * Entry point of the balance model for the CLI, the HTTP worker pool and the
 * browser: validates the request, links the kinematics of the front and rear
 * corners into the vehicle (roll steer, roll camber, roll-centre height,
 * spring and bar motion ratios, each overridable), evaluates, and optionally
 * compares with a variant. Returns JSON-safe plain objects; throws
 * InputError (bad input) or SolveError (unsolvable corner).
 */
import * as z from 'zod';
import { parseOrThrow, SolveError } from '../errors.js';
import { cornerDocumentSchema } from '../schema/corner.js';
import { VEHICLE_RANGES } from '../schema/ranges.js';
import { inRange } from '../schema/ranged.js';
import { upgradeVehicleDocument, vehicleSchema, type Vehicle } from '../schema/vehicle.js';
import { compareBalance, type BalanceComparison } from './compare.js';
import { evaluateBalance, type BalanceOptions, type BalanceResult } from './index.js';
import { blame, linkVehicle, type AxleLink, type BalanceCase } from './link.js';

export { linkVehicle, rollSteerTermDegPerG, type AxleLink, type AxleOverrides, type BalanceCase, type LinkedVehicle, type ValueSource } from './link.js';

const finite = z.number().finite();

/** Entered values that win over both the kinematics and the vehicle's own fields. */
// Held to the vehicle document's plausible ranges (shared/schema/ranges.ts, docs/inputs.md).
const overrideNumber = (key: string) => inRange(z.number().finite(), VEHICLE_RANGES[key]!, key);
export const axleOverridesSchema = z.strictObject({
  rollSteerCoefficient: overrideNumber('rollSteerCoefficient').optional(),
  rollCamberDegPerDeg: overrideNumber('rollCamberDegPerDeg').optional(),
  rollCentreHeightMm: overrideNumber('rollCentreHeightMm').optional(),
  springMotionRatio: overrideNumber('spring.motionRatio').optional(),
  barMotionRatio: overrideNumber('antiRollBar.linkMotionRatio').optional(),
  barTwistRadPerM: overrideNumber('antiRollBar.twistRadPerM').optional(),
  mechanicalTrailMm: overrideNumber('mechanicalTrailMm').optional(),
});

const vehicleDocument = z.preprocess(upgradeVehicleDocument, vehicleSchema);
const cornerDocument = cornerDocumentSchema;

const caseSchema = {
  vehicle: vehicleDocument,
  frontCorner: cornerDocument.optional(),
  rearCorner: cornerDocument.optional(),
  overrides: z.strictObject({ front: axleOverridesSchema.optional(), rear: axleOverridesSchema.optional() }).optional(),
};

export const balanceRequestSchema = z.strictObject({
  ...caseSchema,
  /** Speed of the step steer, km/h. Below walking pace the transient model's 1/V terms make it singular. */
  speedKph: finite.min(1, 'speedKph must be at least 1 km/h (the step-steer model divides by the speed)').max(400).optional(),
  /** Corner radius: sets the steer (and so the rack position) at which the kinematics are read, and the steer curve's radius, m. */
  cornerRadiusM: finite.positive().min(2).max(10000).optional(),
  lateralAccelerationG: finite.min(0).max(2).optional(),
  speedsKph: z.array(finite.positive().max(400)).min(1).max(100).optional(),
  steerCurveMaxG: finite.positive().max(3).optional(),
  steerCurvePoints: z.number().int().min(2).max(200).optional(),
  stepSteerDeg: finite.refine((x) => x !== 0 && Math.abs(x) <= 20, 'must be non-zero and at most 20 deg').optional(),
  stepDurationS: finite.positive().max(30).optional(),
  sensitivity: z.boolean().optional(),
  /** A second vehicle (with its own corners and overrides) to compare with, side by side. */
  variant: z.strictObject(caseSchema).optional(),
});

export interface BalanceResponse extends BalanceResult {
  kinematicsLink: { front: AxleLink; rear: AxleLink; cornerRadiusM: number | null };
  /** The vehicle actually evaluated (entered values with the linked ones written in). */
  effectiveVehicle: Vehicle;
  comparison: (BalanceComparison & { variant: BalanceResult & { kinematicsLink: { front: AxleLink; rear: AxleLink } } }) | null;
}

/** Evaluates one vehicle with its corners linked in (`linkVehicle`). */
function evaluateCase(c: BalanceCase, options: BalanceOptions, radiusM: number | null, prefix = ''): { result: BalanceResult; front: AxleLink; rear: AxleLink; vehicle: Vehicle } {
  const linked = linkVehicle(c, options, radiusM, prefix);
  return { result: blame(`${prefix}vehicle`, () => evaluateBalance(linked.vehicle, options)), front: linked.front, rear: linked.rear, vehicle: linked.vehicle };
}

export function computeBalance(input: unknown): BalanceResponse {
  const req = parseOrThrow(balanceRequestSchema, input, 'balance request');
  const options: BalanceOptions = {
    lateralAccelerationG: req.lateralAccelerationG,
    speedKph: req.speedKph,
    speedsKph: req.speedsKph,
    cornerRadiusM: req.cornerRadiusM,
    steerCurveMaxG: req.steerCurveMaxG,
    steerCurvePoints: req.steerCurvePoints,
    stepSteerDeg: req.stepSteerDeg,
    stepDurationS: req.stepDurationS,
    sensitivity: req.sensitivity,
  };
  for (const k of Object.keys(options) as (keyof BalanceOptions)[]) if (options[k] === undefined) delete options[k];
  const radius = req.cornerRadiusM ?? null;
  const base = evaluateCase(req, options, radius);
  let comparison: BalanceResponse['comparison'] = null;
  if (req.variant) {
    const variant = evaluateCase(req.variant, options, radius, 'variant.');
    comparison = { ...compareBalance(base.result, variant.result), variant: { ...variant.result, kinematicsLink: { front: variant.front, rear: variant.rear } } };
  }
  const response: BalanceResponse = { ...base.result, kinematicsLink: { front: base.front, rear: base.rear, cornerRadiusM: radius }, effectiveVehicle: base.vehicle, comparison };
  refuseNonFinite(response, 'result');
  return response;
}

/**
 * Last line of defence: inputs many orders of magnitude off (a damping of
 * 1e300) can overflow the model; JSON would turn the NaN into a silent null.
 * Names the output and the case it belongs to instead.
 */
function refuseNonFinite(value: unknown, path: string): void {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) {
      // The base case is walked first, so a non-finite value under comparison comes from the variant.
      const where = path.startsWith('result.comparison') ? 'variant.vehicle' : 'vehicle';
      throw new SolveError('singular_geometry', `${where}: the model overflowed (${path} is ${value}); check for an entry many orders of magnitude off`, { field: where, path });
    }
  } else if (Array.isArray(value)) value.forEach((v, i) => refuseNonFinite(v, `${path}[${i}]`));
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) refuseNonFinite(v, `${path}.${k}`);
}
