/**
 * The bump-sensitivity and handling cautions of any corner, not only a
 * solved proposal: the same measurement (measure.ts) and the same rules
 * (`evaluateCautions`) the back-solver applies to its verified geometry, so
 * a corner gets one list whichever screen asks. docs/cautions.md.
 */
import type { Corner } from '../schema/corner.js';
import { steeringStrokeMm } from '../schema/steering-link.js';
import type { Vehicle } from '../schema/vehicle.js';
import { SolveError } from '../errors.js';
import { suspensionRollGradients } from '../balance/understeer.js';
import { evaluateCautions, type Caution, type CautionFigures, type CautionThresholds } from './cautions.js';
import { resolveTrackProfile, type TrackProfileChoice, type TrackProfileId } from '../tracks/profiles.js';
import { cautionInputs, sweepRacks } from './measure.js';
import { linked, PoseCounter, rollSteer } from '../intent/link.js';
import type { BumpCost } from '../ride/cost.js';
import type { AxleName } from '../schema/axle.js';

export interface CornerCautionOptions {
  axle: AxleName;
  /** A profile id, or `{ id, travelMm?, bumpHeightMm? }` overriding its travel range and bump height. */
  trackProfile: TrackProfileId | TrackProfileChoice;
  /** The vehicle: tyre data and loads for the lateral-force index, compliance steer, suspension roll for the reference roll. */
  vehicle?: Vehicle | undefined;
  /** The team's thresholds by code and level (only the levels given replace the defaults). */
  thresholds?: CautionThresholds | undefined;
  /** Rack positions besides 0, mm; default the stroke ends. */
  rackPositionsMm?: number[] | undefined;
  /** Sweep step, mm; default (travel range)/20. */
  travelStepMm?: number | undefined;
  /** Roll of the curvature caution, deg; default the vehicle's suspension roll at 1 g, else 2°. */
  referenceRollDeg?: number | undefined;
  /** How the messages write their figures (the reader's unit system); default SI. */
  figures?: CautionFigures | undefined;
}

/** Rack positions of the bump cautions and worst-toe report: 0 first, then the given ones or the stroke's ends. */
export function cautionRackPositions(corner: Corner, list?: number[]): number[] {
  if (!corner.steered) return [0];
  const stroke = steeringStrokeMm(corner);
  const others = list ?? (stroke ? [stroke[0], stroke[1]] : []);
  return [0, ...others.filter((r) => r !== 0)];
}

/** Suspension roll gradients with `corner` linked into the vehicle (balance model), or null (no vehicle, or a roll centre at infinity). */
export function linkedRollGradients(counter: PoseCounter, vehicle: Vehicle | undefined, axle: AxleName, corner: Corner) {
  if (!vehicle) return null;
  try {
    return suspensionRollGradients(linked(counter, vehicle, axle, corner).vehicle);
  } catch (e) {
    if (e instanceof SolveError && e.code === 'singular_geometry') return null;
    throw e;
  }
}

/**
 * Every caution that applies to `corner` on the chosen track profile, most
 * severe first, the safety notice last. Throws SolveError (naming
 * `trackProfile.travelMm`) when the corner cannot reach the profile's travel
 * range straight ahead; rack positions it cannot reach become
 * `rack-pose-unreachable` cautions.
 */
export function cautionsForCorner(corner: Corner, options: CornerCautionOptions): Caution[] {
  return measureCornerCautions(corner, options).cautions;
}

/**
 * `cautionsForCorner` with the bump cost the ride model gave them (the
 * screens show it beside the results), or why there is none.
 */
export function measureCornerCautions(corner: Corner, options: CornerCautionOptions): { cautions: Caution[]; bumpCost: BumpCost | null; bumpCostUnavailable: string | null } {
  const counter = new PoseCounter();
  const profile = resolveTrackProfile(options.trackProfile);
  const [from, to] = profile.travelMm;
  const travel = { from, to, step: options.travelStepMm ?? (to - from) / 20 };
  let measured: ReturnType<typeof sweepRacks>;
  try {
    measured = sweepRacks(counter, corner, travel, cautionRackPositions(corner, options.rackPositionsMm), profile.bumpHeightMm);
  } catch (e) {
    if (!(e instanceof SolveError)) throw e;
    throw new SolveError(e.code, `${e.message}. The travel range [${from}, ${to}] mm of the cautions' ${profile.label.toLowerCase()} profile is beyond this corner's reach: set trackProfile.travelMm to the corner's travel`, {
      ...e.details,
      field: 'trackProfile.travelMm',
      travelRangeMm: [from, to],
    });
  }
  const eps = rollSteer(counter, corner);
  const context = {
    axle: options.axle,
    vehicle: options.vehicle,
    gradients: linkedRollGradients(counter, options.vehicle, options.axle, corner),
    referenceRollDeg: options.referenceRollDeg,
    thresholds: options.thresholds,
  };
  const inputs = cautionInputs(counter, context, profile, corner, eps, measured.byRack, measured.unreachableRacks);
  return { cautions: evaluateCautions(inputs, options.figures), bumpCost: inputs.bumpCost ?? null, bumpCostUnavailable: inputs.bumpCostUnavailable ?? null };
}
