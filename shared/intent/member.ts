/**
 * One member of the solution family, chosen by the user (not only the
 * solver's pick), worked out for the workshop: its geometry verified with the
 * full kinematics, its toe and roll-steer curves beside the current ones,
 * the workshop numbers with the user's shim and thread, the as-built ε after
 * rounding to whole shims and the sensitivity of ε to each coordinate.
 */
import type { Corner } from '../schema/corner.js';
import type { Intent } from '../schema/intent.js';
import { SolveError } from '../errors.js';
import { resolveTrackProfile } from '../tracks/profiles.js';
import { rollSweep, type SweepRow } from '../kinematics/index.js';
import { readCoordinates } from './coordinates.js';
import { PoseCounter, rollSteer, sweep, trialCorner } from './link.js';
import { asBuiltCorner, workshopNumbers, type WorkshopNumbers } from './workshop.js';
import { coordinateChanges, judgeMember, sensitivities, toeAfterShimming, understeerChange, verifyOverRacks, type CoordinateChange, type StaticToeReset } from './solve.js';
import { SI_FIGURES, type Caution, type CautionFigures } from '../cautions/cautions.js';
import type { BumpCost } from '../ride/cost.js';

/** Roll range of the roll-steer curves, deg (either way). */
const ROLL_RANGE_DEG = 3;

export interface ProposalDetails {
  coordinates: CoordinateChange[];
  corner: Corner;
  /** Verified ε of this member, deg/deg. */
  rollSteerCoefficient: number;
  currentRollSteerCoefficient: number;
  /** With a vehicle: the balance model's understeer change from the current geometry, deg/g (null without, or where the roll centre is at infinity). */
  understeerChangeDegPerG: number | null;
  /** dε per mm of each movable coordinate at this member (central differences ±0.5 mm), deg/deg per mm. */
  sensitivity: Record<string, number>;
  workshop: WorkshopNumbers;
  asBuilt: {
    /** Verified ε of the geometry with whole shims, deg/deg. */
    rollSteerCoefficient: number;
    /** What the rounding to whole shims costs: as-built ε − this member's ε. */
    shimRoundingEffect: number;
    understeerChangeDegPerG: number | null;
  };
  staticToe: StaticToeReset;
  /** This member verified over the travel at each rack position of the verification (as the solver verifies its pick). */
  verified: {
    /** Bump steer with the rack straight ahead, deg/m, and the curvature of its toe line, deg/m². */
    bumpSteerDegPerM: number;
    curvatureDegPerM2: number;
    /** Largest toe deviation from its line at any rack position reached, deg, and that rack position, mm. */
    worstToeDeg: number;
    worstToeRackMm: number;
    /** Rack positions this member cannot reach over the whole travel. */
    unreachableRackMm: number[];
  };
  /** This member's own cautions (its safety notice last), measured as the solver measures its pick's. */
  cautions: Caution[];
  /** This member's bump cost on the profile's road (ride model), or why there is none. */
  bumpCost: BumpCost | null;
  bumpCostUnavailable: string | null;
  /** Toe change from ride height against travel, rack straight ahead, deg: current and this member, same travels. */
  toeCurve: { travelMm: number; currentDeg: number; proposedDeg: number }[];
  /** Axle steer change from zero roll against body roll, rack straight ahead, deg (+ left): current and this member. */
  rollCurve: { rollDeg: number; currentDeg: number; proposedDeg: number }[];
}

/**
 * The member at `values` (one per `intent.movable`, mm), each held to its
 * bounds. Throws SolveError where the kinematics cannot reach the member's
 * poses over the intent's travel range.
 */
export function proposalDetails(intent: Intent, values: Readonly<Record<string, number>>, figures: CautionFigures = SI_FIGURES): ProposalDetails {
  const counter = new PoseCounter();
  const current = intent.corner;
  const names = intent.movable;
  const q0 = readCoordinates(current, names);
  const lo = names.map((n) => intent.bounds[n]![0]);
  const hi = names.map((n) => intent.bounds[n]![1]);
  const q = names.map((n, i) => {
    const v = values[n];
    return v === undefined || !Number.isFinite(v) ? q0[i]! : Math.min(hi[i]!, Math.max(lo[i]!, v));
  });
  const proposed = trialCorner(current, names, q);
  const eps = rollSteer(counter, proposed);
  const epsCurrent = rollSteer(counter, current);

  const sensitivity = sensitivities((x) => rollSteer(counter, trialCorner(current, names, x)), names, q);

  const workshop = workshopNumbers(current, proposed, intent.options);
  const built = asBuiltCorner(current, proposed, intent.options.shimThicknessMm);
  const epsBuilt = rollSteer(counter, built);
  const dK = (c: Corner): number | null => {
    if (!intent.vehicle) return null;
    try {
      return understeerChange(intent.vehicle, intent.axle, current, c);
    } catch (e) {
      if (e instanceof SolveError && e.code === 'singular_geometry') return null;
      throw e;
    }
  };

  const profile = resolveTrackProfile(intent.trackProfile);
  const [from, to] = profile.travelMm;
  const travel = { from, to, step: intent.options.travelStepMm ?? (to - from) / 20 };
  const fromRide = (rows: SweepRow[]) => {
    const ride = rows.reduce((best, r) => (Math.abs(r.travelMm) < Math.abs(best.travelMm) ? r : best), rows[0]!);
    return rows.map((r) => ({ travelMm: r.travelMm, toeDeg: r.toeDeg - ride.toeDeg }));
  };
  const toeNow = fromRide(sweep(counter, current, travel, [0]).rows);
  const toeNew = fromRide(sweep(counter, proposed, travel, [0]).rows);
  const roll = { from: -ROLL_RANGE_DEG, to: ROLL_RANGE_DEG, step: 0.5 };
  const steerFromZero = (c: Corner) => {
    const rows = rollSweep(c, { roll, rackMm: [0] }).rows;
    counter.poses += 2 * rows.length;
    const zero = rows.find((r) => r.rollDeg === 0)?.axleSteerDeg ?? 0;
    return rows.map((r) => ({ rollDeg: r.rollDeg, steerDeg: r.axleSteerDeg - zero }));
  };
  const checked = verifyOverRacks(counter, intent, proposed);
  const straight = checked.byRack.find((r) => r.rackMm === 0)!;
  const worst = checked.byRack.reduce((w, r) => (r.maxDeviationDeg > w.maxDeviationDeg ? r : w), straight);
  const judged = judgeMember(counter, intent, proposed, eps, checked, undefined, figures);

  const rollNow = steerFromZero(current);
  const rollNew = steerFromZero(proposed);

  return {
    coordinates: coordinateChanges(names, q0, q, lo, hi),
    corner: proposed,
    rollSteerCoefficient: eps,
    currentRollSteerCoefficient: epsCurrent,
    understeerChangeDegPerG: dK(proposed),
    sensitivity,
    workshop,
    asBuilt: { rollSteerCoefficient: epsBuilt, shimRoundingEffect: epsBuilt - eps, understeerChangeDegPerG: dK(built) },
    staticToe: toeAfterShimming(counter, current, built),
    verified: {
      bumpSteerDegPerM: straight.bumpSteerDegPerM,
      curvatureDegPerM2: straight.curvatureDegPerM2,
      worstToeDeg: worst.maxDeviationDeg,
      worstToeRackMm: worst.rackMm,
      unreachableRackMm: checked.unreachableRacks.map((u) => u.rackMm),
    },
    ...judged,
    toeCurve: toeNow.map((p, i) => ({ travelMm: p.travelMm, currentDeg: p.toeDeg, proposedDeg: toeNew[i]?.toeDeg ?? NaN })),
    rollCurve: rollNow.map((p, i) => ({ rollDeg: p.rollDeg, currentDeg: p.steerDeg, proposedDeg: rollNew[i]?.steerDeg ?? NaN })),
  };
}
