/**
 * What the cautions measure on a geometry, from the full kinematics: the
 * sweep over the travel range at each rack position (fits and the toe change
 * over the profile's single-wheel bump), the scrub over that bump, the
 * outside wheel's roll-steer change at the reference roll, the bump-steer
 * spread across the stroke, and the compliance comparison. One code for the
 * solver's verified proposal and for any corner (`cautionsForCorner`).
 */
import type { Corner } from '../schema/corner.js';
import type { Vehicle } from '../schema/vehicle.js';
import { SolveError } from '../errors.js';
import type { SweepRow } from '../kinematics/index.js';
import type { CautionInputs, CautionThresholds } from './cautions.js';
import type { TrackProfile } from '../tracks/profiles.js';
import { pose, PoseCounter, sweep } from '../intent/link.js';
import { axleComplianceOf } from '../compliance/axle.js';
import { describeTyreLoadLaw, tyreLoadLaw, tyreStiffnessAt } from '../balance/tyre.js';
import { InputError } from '../errors.js';
import { bumpCost, type BumpCost } from '../ride/cost.js';
import type { AxleName } from '../schema/axle.js';

const G_STD = 9.80665;
/** Cornering stiffness per unit load used when the vehicle gives no tyre data, 1/deg (from memory: 0.15–0.25 for car tyres). */
export const DEFAULT_CORNERING_COEFFICIENT_PER_DEG = 0.2;
/** Reference roll of the curvature caution when no vehicle is given, deg. */
export const DEFAULT_REFERENCE_ROLL_DEG = 2;

export interface RackFit {
  rackMm: number;
  bumpSteerDegPerM: number;
  curvatureDegPerM2: number;
  /** Largest |toe − its linear fit| over the travel range, deg. */
  maxDeviationDeg: number;
  /** Toe change over the profile's single-wheel bump at this rack position, deg. */
  bumpToeChangeDeg: number;
}

export interface UnreachableRack {
  rackMm: number;
  /** Travel at which the pose could not be reached, mm, when the engine names it. */
  travelMm: number | null;
  message: string;
}

/**
 * Sweeps `corner` over the travel at each rack position, rack by rack, so a
 * rack position it cannot reach over the whole travel is reported, not fatal
 * (rack 0 must be reachable: its SolveError is thrown).
 */
export function sweepRacks(
  counter: PoseCounter,
  corner: Corner,
  travel: { from: number; to: number; step: number },
  racks: number[],
  bumpMm: number,
): { byRack: RackFit[]; rows: SweepRow[]; unreachableRacks: UnreachableRack[] } {
  const byRack: RackFit[] = [];
  const rows: SweepRow[] = [];
  const unreachableRacks: UnreachableRack[] = [];
  for (const rack of racks) {
    try {
      const v = sweep(counter, corner, travel, [rack]);
      const f = v.fit;
      const t0 = pose(counter, corner, 0, rack).toeDeg;
      const tb = pose(counter, corner, bumpMm, rack).toeDeg;
      byRack.push({ rackMm: rack, bumpSteerDegPerM: f.bumpSteerDegPerM, curvatureDegPerM2: f.curvatureDegPerM2, maxDeviationDeg: f.maxDeviationDeg, bumpToeChangeDeg: tb - t0 });
      rows.push(...v.rows);
    } catch (e) {
      if (!(e instanceof SolveError) || rack === 0) throw e;
      unreachableRacks.push({ rackMm: rack, message: e.message, travelMm: typeof e.details['travelMm'] === 'number' ? e.details['travelMm'] : null });
    }
  }
  return { byRack, rows, unreachableRacks };
}

/** Who the cautions are for: the axle, the vehicle (tyres, loads, compliance) and its suspension roll, the team's thresholds. */
export interface CautionContext {
  axle: AxleName;
  vehicle?: Vehicle | undefined;
  /** Suspension roll gradients of the vehicle with this corner linked in (balance model), deg/g; null without a vehicle. */
  gradients: { frontDegPerG: number; rearDegPerG: number } | null;
  referenceRollDeg?: number | undefined;
  thresholds?: CautionThresholds | undefined;
}

/** The caution rules' inputs for `corner` (ε and the per-rack fits already measured on it). */
export function cautionInputs(
  counter: PoseCounter,
  ctx: CautionContext,
  profile: TrackProfile,
  corner: Corner,
  eps: number,
  byRack: RackFit[],
  unreachableRacks: UnreachableRack[],
): CautionInputs {
  const straight = byRack.find((r) => r.rackMm === 0)!;
  const bump = profile.bumpHeightMm;
  let worstBump = byRack[0]!;
  for (const r of byRack) if (Math.abs(r.bumpToeChangeDeg) > Math.abs(worstBump.bumpToeChangeDeg)) worstBump = r;
  let spread = 0;
  let spreadRack = 0;
  for (const r of byRack) {
    const d = Math.abs(r.bumpSteerDegPerM - straight.bumpSteerDegPerM);
    if (d > spread) {
      spread = d;
      spreadRack = r.rackMm;
    }
  }
  const scrub = Math.abs(pose(counter, corner, bump).halfTrackChangeMm);
  // Outside wheel's local toe gradient at the reference roll versus design.
  const atDesign = pose(counter, corner, 0);
  const track = 2 * atDesign.contactPatch[1];
  const v = ctx.vehicle;
  const grads = ctx.gradients;
  const refRoll = ctx.referenceRollDeg ?? (grads ? Math.abs(ctx.axle === 'front' ? grads.frontDegPerG : grads.rearDegPerG) : DEFAULT_REFERENCE_ROLL_DEG);
  const s = (track / 2) * Math.sin((refRoll * Math.PI) / 180);
  const g0 = atDesign.toeGradientDegPerM;
  const gs = pose(counter, corner, s).toeGradientDegPerM;
  const curvatureChange = -((gs - g0) / 1000) * (track / 2) * (Math.PI / 180);
  // Tyre's cornering stiffness per unit load at its landing load.
  let cc = DEFAULT_CORNERING_COEFFICIENT_PER_DEG;
  let ccSource = `the product default ${DEFAULT_CORNERING_COEFFICIENT_PER_DEG} per degree`;
  let landing: number | null = null;
  let complianceRatio: number | null = null;
  let complianceKnown = false;
  let complianceSource: 'entered' | 'computed' | undefined;
  if (v) {
    const axleLoadN = v.massKg * G_STD * (ctx.axle === 'front' ? (v.wheelbaseMm - v.cgToFrontAxleMm) / v.wheelbaseMm : v.cgToFrontAxleMm / v.wheelbaseMm);
    const wheel = axleLoadN / 2;
    landing = wheel * profile.landingLoadFactor;
    // The tyre's stiffness at the landing load on the one load law of the balance model (shared/balance/tyre.ts):
    // the vehicle's own quadratic, or the degressive law from its static-load stiffness (not linear scaling).
    const law = tyreLoadLaw(v[ctx.axle].tyre, wheel);
    cc = tyreStiffnessAt(law, landing) / landing;
    ccSource = `the vehicle tyre at the landing load, by ${describeTyreLoadLaw(law)}`;
    // Entered compliance steer wins; else the corner's own, computed from its bushings (lateral force at the
    // contact patch acting a pneumatic trail behind it), for this very geometry.
    const entered = v[ctx.axle].complianceSteerDegPerKN;
    const comp = entered ?? axleComplianceOf(corner, { pneumaticTrailMm: v[ctx.axle].tyre.pneumaticTrailMm })?.totalSteerDegPerKN;
    if (comp !== undefined) complianceSource = entered !== undefined ? 'entered' : 'computed';
    if (comp !== undefined && grads) {
      const compDegPerG = Math.abs(comp * (axleLoadN / 1000));
      const rollDegPerG = Math.abs(eps * (ctx.axle === 'front' ? grads.frontDegPerG : grads.rearDegPerG));
      // Only against deliberate roll steer: with none, there is nothing for compliance to rival.
      complianceRatio = rollDegPerG > 1e-3 ? compDegPerG / rollDegPerG : null;
      complianceKnown = true;
    }
  }
  const ride = rideCost(counter, ctx, profile, corner);
  return {
    axle: ctx.axle,
    steered: corner.steered,
    profile,
    bumpCost: ride.cost,
    bumpCostUnavailable: ride.unavailable,
    rollSteerCoefficient: eps,
    bumpToeChangeDeg: Math.abs(worstBump.bumpToeChangeDeg),
    bumpToeRackMm: worstBump.rackMm,
    corneringCoefficientPerDeg: Math.max(0, cc),
    corneringCoefficientSource: ccSource,
    landingLoadN: landing,
    bumpScrubMm: scrub,
    rollSteerCurvatureChange: curvatureChange,
    referenceRollDeg: refRoll,
    lockBumpSteerSpreadDegPerM: spread,
    lockBumpSteerRackMm: spreadRack,
    complianceRatio,
    complianceKnown,
    complianceSource,
    unreachableRacks,
    thresholds: ctx.thresholds,
  };
}

/**
 * The ride model's bump cost of `corner` on the profile (shared/ride/cost.ts),
 * or why there is none: no vehicle, or a vehicle without the ride data (the
 * InputError's field is named). Adds an estimate of its poses to the count
 * (the ride model solves its toe curves with its own solvers).
 */
export function rideCost(counter: PoseCounter, ctx: CautionContext, profile: TrackProfile, corner: Corner): { cost: BumpCost | null; unavailable: string | undefined } {
  if (!ctx.vehicle) return { cost: null, unavailable: 'give the vehicle to judge the bump steer on the profile’s road' };
  try {
    const cost = bumpCost(ctx.vehicle, ctx.axle, corner, profile);
    // Estimate: 9 Gauss–Hermite poses per wheel and condition, and the event tables (21 or more each).
    counter.poses += corner.steered ? 4 * 9 + 4 * 9 + 4 * 21 : 2 * 9 + 2 * 21;
    return { cost, unavailable: undefined };
  } catch (e) {
    if (e instanceof InputError) return { cost: null, unavailable: e.issues[0] ? `${e.issues[0].path}: ${e.issues[0].message}` : e.message };
    if (e instanceof SolveError) return { cost: null, unavailable: `the toe curve is out of reach over the travel the road asks for (${e.message})` };
    throw e;
  }
}
