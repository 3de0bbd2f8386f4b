/**
 * Handling intent (issue 5): what one axle should do in roll, what the
 * designer may move to get there and inside which package. Our own JSON,
 * documented key by key in docs/intent.md. Coordinates and bounds in mm,
 * ISO 8855 vehicle axes, LEFT corner (the right corner is its mirror).
 */
import * as z from 'zod';
import { cornerDocumentSchema, type Corner } from './corner.js';
import { armStrokeMm, innerName, MOVABLE_COORDINATE_PATTERN } from './steering-link.js';
import { upgradeVehicleDocument, vehicleSchema } from './vehicle.js';
import { TRACK_PROFILE_IDS, trackProfiles } from '../tracks/profiles.js';
import { ROAD_CLASSES } from '../ride/road.js';
import { CAUTION_RULES } from '../cautions/cautions.js';
import { CORNER_RANGES, INTENT_RANGES, type InputRange } from './ranges.js';
import { inRange } from './ranged.js';
import { AXLE_NAMES } from './axle.js';

// The steering-link helpers and the movable-coordinate pattern live in a
// zod-free module (the browser's kinematics worker uses them without the
// schema); re-exported here for the intent code.
export { innerName, outerName, steeringStrokeMm, MOVABLE_COORDINATE_PATTERN } from './steering-link.js';

export const INTENT_FORMAT_VERSION = 1 as const;
/** Largest number of travel points per sweep a solve accepts (it runs dozens of sweeps). */
export const MAX_SWEEP_POINTS_PER_SOLVE = 201;

/** A finite number; "must be a number" only when it is not one (a range issue keeps its own words). */
const finite = (what: string) => z.number({ error: (iss) => (iss.code === 'invalid_type' ? `${what} must be a number` : undefined) }).finite();
/** A finite number held to its plausible range (shared/schema/ranges.ts, docs/inputs.md). */
const ranged = (what: string, range: InputRange, base = finite(what)) => inRange(base, range, what);
const coordinateSchema = z.string().regex(MOVABLE_COORDINATE_PATTERN, {
  message: 'expected tieRodInner.z, tieRodInner.y, tieRodOuter.z, tieRodOuter.x, rack.z (any of x, y, z) or link<k>Inner/Outer.<axis> for a five-link toe link',
});

export const intentTargetSchema = z.union([
  z.strictObject({ rollSteerCoefficient: ranged('target.rollSteerCoefficient', INTENT_RANGES.rollSteerCoefficient) }),
  z.strictObject({ understeerChangeDegPerG: ranged('target.understeerChangeDegPerG', INTENT_RANGES.understeerChangeDegPerG) }),
  z.strictObject({ zeroBumpSteer: z.literal(true) }),
  /** Roll steer plus compliance steer of the axle (deg/g, positive out of the turn), compliance from the corner's bushings or the vehicle. */
  z.strictObject({ rollAndComplianceSteerDegPerG: ranged('target.rollAndComplianceSteerDegPerG', INTENT_RANGES.axleSteerDegPerG) }),
], { error: 'target must be { rollSteerCoefficient }, { understeerChangeDegPerG }, { zeroBumpSteer: true } or { rollAndComplianceSteerDegPerG }' });

export const trackProfileChoiceSchema = z.union([
  z.enum(TRACK_PROFILE_IDS),
  z.strictObject({
    id: z.enum(TRACK_PROFILE_IDS),
    /** Travel range of the sweeps [droop, bump], mm; must contain 0. */
    travelMm: z.tuple([ranged('travelMm[0]', INTENT_RANGES.travelMm), ranged('travelMm[1]', INTENT_RANGES.travelMm)]).optional(),
    /** Single-wheel bump height of the bump cautions, mm. */
    bumpHeightMm: ranged('bumpHeightMm', INTENT_RANGES.bumpHeightMm).optional(),
    /** Length of that half-sine bump, mm. */
    bumpLengthMm: ranged('bumpLengthMm', INTENT_RANGES.bumpLengthMm).optional(),
    /** ISO 8608 class of the profile's random road. */
    roadClass: z.enum(ROAD_CLASSES, { error: 'roadClass must be one of the ISO 8608 classes A to H' }).optional(),
    /** Speed of the bump cost, km/h. */
    speedKph: ranged('speedKph', INTENT_RANGES.speedKph).optional(),
    /** Radius of the corner whose steer a steered axle is judged at, m. */
    cornerRadiusM: ranged('cornerRadiusM', INTENT_RANGES.cornerRadiusM).optional(),
    /** Drop height of a landing, mm (null: no landing). */
    landingDropMm: ranged('landingDropMm', INTENT_RANGES.landingDropMm).nullable().optional(),
  }),
]);

const levelThresholdsSchema = z.strictObject({
  info: ranged('info', INTENT_RANGES.cautionThreshold).optional(),
  warning: ranged('warning', INTENT_RANGES.cautionThreshold).optional(),
  critical: ranged('critical', INTENT_RANGES.cautionThreshold).optional(),
});

export const intentOptionsSchema = z.strictObject({
  /** Rack positions (mm) of the worst-toe report and bump cautions; default: stroke min, 0, stroke max. */
  rackPositionsMm: z.array(ranged('rackPositionsMm[]', INTENT_RANGES.rackPositionMm)).min(1).max(9).optional(),
  /** Travel step of the objective and verification sweeps, mm (default: range / 20). */
  travelStepMm: ranged('travelStepMm', INTENT_RANGES.travelStepMm).optional(),
  /** Optional bound on the worst toe deviation from its linear fit at any rack position, deg. */
  worstToeBoundDeg: ranged('worstToeBoundDeg', INTENT_RANGES.worstToeBoundDeg).optional(),
  /**
   * Optional bump-cost budget: the largest RMS yaw-rate disturbance on the profile's road, as a
   * percentage of the steady yaw rate of its corner (the unit of the bump-yaw-disturbance caution). Needs the vehicle.
   */
  bumpYawBudgetPct: ranged('bumpYawBudgetPct', INTENT_RANGES.bumpYawBudgetPct).optional(),
  /** Members of the returned solution family (default 21). */
  familySize: z.number().int().min(3).max(101).default(21),
  /** Shim thickness for the shim stacks at each end, mm. */
  shimThicknessMm: ranged('shimThicknessMm', INTENT_RANGES.shimThicknessMm).default(1),
  /** Thread pitch of the tie-rod adjuster, mm per turn. */
  threadPitchMm: ranged('threadPitchMm', INTENT_RANGES.threadPitchMm).default(1.5),
  /** `single-thread`: one turn = one pitch; `turnbuckle` (left- and right-hand threads): one turn = two pitches. */
  adjuster: z.enum(['single-thread', 'turnbuckle']).default('single-thread'),
  /** How far the adjuster can change the link's length either way, mm; beyond it a new link is needed (default 5 mm, from memory). */
  adjusterReachMm: ranged('adjusterReachMm', INTENT_RANGES.adjusterReachMm).default(5),
  /** Tallest shim stack an end takes, mm; beyond it a new bracket is needed (default 10 mm, from memory). */
  shimStackMaxMm: ranged('shimStackMaxMm', INTENT_RANGES.shimStackMaxMm).default(10),
  /** Roll angle (deg) at which the curvature caution compares roll steer; default from the vehicle at 1 g, else 2°. */
  referenceRollDeg: ranged('referenceRollDeg', INTENT_RANGES.referenceRollDeg).optional(),
});

/** Smallest travel range a solve fits toe over (mm); below it the fit's curvature is numerical noise. */
export const MIN_TRAVEL_SPAN_MM = 2;

export const intentSchema = z
  .strictObject({
    formatVersion: z.literal(INTENT_FORMAT_VERSION).optional(),
    name: z.string().max(200).optional(),
    corner: cornerDocumentSchema,
    axle: z.enum(AXLE_NAMES, { error: 'axle must be "front" or "rear"' }),
    target: intentTargetSchema,
    movable: z.array(coordinateSchema).min(1, 'movable must name at least one coordinate').max(5),
    bounds: z.record(z.string(), z.tuple([ranged('min', CORNER_RANGES.coordinateMm), ranged('max', CORNER_RANGES.coordinateMm)])),
    trackProfile: trackProfileChoiceSchema,
    vehicle: z.preprocess(upgradeVehicleDocument, vehicleSchema).optional(),
    options: intentOptionsSchema.default(() => intentOptionsSchema.parse({})),
    /** Per-vehicle overrides of the caution thresholds, by caution code. */
    // Only codes with a threshold rule can be tuned (not the notices, nor the rig tolerance cautions, which take the team's tolerance).
    cautionThresholds: z.partialRecord(z.enum(Object.keys(CAUTION_RULES) as [string, ...string[]]), levelThresholdsSchema).optional(),
  })
  .superRefine(
    (intent, ctx) => {
      // Runs also when a field already has an issue (see `when`), so every problem is reported at once:
      // each rule looks only at values that passed their own field's check.
      const issue = (path: (string | number)[], message: string) => ctx.addIssue({ code: 'custom', path, message });
      const fin = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
      const pair = (v: unknown): v is [number, number] => Array.isArray(v) && fin(v[0]) && fin(v[1]);
      const seen = new Set<string>();
      intent.movable.forEach((m, i) => {
        if (typeof m !== 'string') return;
        if (seen.has(m)) issue(['movable', i], `${m} is listed twice`);
        seen.add(m);
        const why = coordinateProblem(intent.corner, m);
        if (why) issue(['movable', i], why);
        if (!intent.bounds[m]) issue(['bounds', m], `bounds.${m} is required: every movable coordinate needs packaging bounds [min, max] in mm`);
      });
      if (seen.has('rack.z') && seen.has(innerName(intent.corner) + '.z')) {
        issue(['movable'], `rack.z and ${innerName(intent.corner)}.z move the same point: list one of them`);
      }
      for (const [k, b] of Object.entries(intent.bounds)) {
        if (!seen.has(k)) issue(['bounds', k], `bounds.${k} is given but ${k} is not in movable`);
        else if (pair(b) && !(b[0] < b[1])) issue(['bounds', k], `the lowest, ${b[0]} mm, must be below the highest, ${b[1]} mm`);
      }
      const target: object = typeof intent.target === 'object' && intent.target !== null ? intent.target : {};
      if ('rollAndComplianceSteerDegPerG' in target && !intent.vehicle) {
        issue(['vehicle'], 'vehicle is required for target.rollAndComplianceSteerDegPerG (its suspension roll and axle load turn steer per degree and per kN into deg/g)');
      }
      const options: Partial<z.infer<typeof intentOptionsSchema>> = typeof intent.options === 'object' && intent.options !== null ? intent.options : {};
      if (options.bumpYawBudgetPct !== undefined && !intent.vehicle) {
        issue(['options', 'bumpYawBudgetPct'], 'a bump-cost budget needs the vehicle (the ride model needs its masses, springs, dampers and tyres)');
      }
      if ('understeerChangeDegPerG' in target && !intent.vehicle) {
        issue(['vehicle'], 'vehicle is required for target.understeerChangeDegPerG (the suspension roll gradient turns it into a roll steer coefficient)');
      }
      const tp = intent.trackProfile;
      const entered = typeof tp === 'object' && tp !== null && pair(tp.travelMm) ? tp.travelMm : null;
      if (entered && !(entered[0] < 0 && entered[1] > 0)) {
        issue(['trackProfile', 'travelMm'], `the travel range ${entered[0]} to ${entered[1]} mm must run from droop (below 0) to bump (above 0)`);
      } else if (entered && entered[1] - entered[0] < MIN_TRAVEL_SPAN_MM) {
        // A span of micrometres makes the toe fit's curvature a ratio of rounding errors (NaN or 1e47 deg/m²).
        issue(['trackProfile', 'travelMm'], `the travel range ${entered[0]} to ${entered[1]} mm spans less than ${MIN_TRAVEL_SPAN_MM} mm`);
      }
      const id = typeof tp === 'object' && tp !== null ? tp.id : tp;
      const travel = entered ?? (Object.hasOwn(trackProfiles, id) ? trackProfiles[id].travelMm : null);
      const stepMm = options.travelStepMm;
      if (travel && fin(stepMm) && (travel[1] - travel[0]) / stepMm < 4) {
        issue(['options', 'travelStepMm'], `options.travelStepMm ${stepMm} mm leaves fewer than five sweep points over the travel range [${travel[0]}, ${travel[1]}] mm`);
      }
      if (travel && fin(stepMm) && (travel[1] - travel[0]) / stepMm > MAX_SWEEP_POINTS_PER_SOLVE - 1) {
        issue(['options', 'travelStepMm'], `options.travelStepMm ${stepMm} mm gives more than ${MAX_SWEEP_POINTS_PER_SOLVE} sweep points over [${travel[0]}, ${travel[1]}] mm; a solve runs dozens of sweeps`);
      }
      const st = intent.corner.steering;
      const stroke = st?.kind === 'rack' ? st.rackStroke : st?.kind === 'arm' ? armStrokeMm(intent.corner) : null;
      (Array.isArray(options.rackPositionsMm) ? options.rackPositionsMm : []).forEach((r, i) => {
        if (!intent.corner.steered) issue(['options', 'rackPositionsMm', i], 'the corner is not steered: rack positions do not apply');
        else if (stroke && fin(r) && (r < stroke[0] || r > stroke[1])) issue(['options', 'rackPositionsMm', i], `rack position ${r} mm is outside the stroke [${stroke[0]}, ${stroke[1]}]`);
      });
    },
    {
      // The rules read the corner, the movable list and the bounds: they run whenever those have a usable
      // shape, even with a bad number elsewhere, so a form hears of every problem at once.
      when: (payload) => {
        const v = payload.value as Record<string, unknown> | null | undefined;
        if (!v || typeof v !== 'object' || !Array.isArray(v['movable']) || !v['bounds'] || typeof v['bounds'] !== 'object') return false;
        return payload.issues.every((i) => {
          const path = i.path ?? [];
          return !['corner', 'axle', 'movable', 'bounds', 'formatVersion'].includes(String(path[0])) || (path[0] === 'bounds' && path.length > 2);
        });
      },
    },
  );

export type Intent = z.infer<typeof intentSchema>;
export type IntentInput = z.input<typeof intentSchema>;

/** Why coordinate `m` cannot move on this corner, or null when it can. */
export function coordinateProblem(corner: Corner, m: string): string | null {
  const match = MOVABLE_COORDINATE_PATTERN.exec(m);
  if (!match) return `${m} is not a movable coordinate`;
  if (m === 'rack.z') {
    if (corner.type === 'five-link') return 'rack.z does not apply to a five-link corner; move the toe link ends instead';
    if (!corner.steering) return 'rack.z needs a steered corner with a rack or steering arm';
    return null;
  }
  const point = match[1]!;
  if (corner.type === 'five-link') {
    if (point.startsWith('tieRod')) return `a five-link corner has no ${point}; its toe link is link ${corner.toeLink}: use link${corner.toeLink}${point.endsWith('Inner') ? 'Inner' : 'Outer'}.${match[2]}`;
    if (!point.startsWith(`link${corner.toeLink}`)) return `${point} is not the toe link (toeLink is ${corner.toeLink}): only the toe link's ends may move`;
    return null;
  }
  if (point.startsWith('link')) return `${point} exists only on a five-link corner; this is a ${corner.type}`;
  return null;
}
