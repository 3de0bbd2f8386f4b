/**
 * Entry point of the balance model for the CLI, the HTTP worker pool and the
 * browser: validates the request, links the kinematics of the front and rear
 * corners into the vehicle (roll steer, roll camber, roll-centre height,
 * spring and bar motion ratios, each overridable), evaluates, and optionally
 * compares with a variant. Returns JSON-safe plain objects; throws
 * InputError (bad input) or SolveError (unsolvable corner).
 */
import { z } from 'zod';
import { InputError, parseOrThrow, SolveError } from '../errors.js';
import { axleSummary, rackForAxleSteer, type AxleSummary } from '../kinematics/index.js';
import { cornerSchema, upgradeCornerDocument, type Corner } from '../schema/corner.js';
import { upgradeVehicleDocument, vehicleSchema, type Vehicle } from '../schema/vehicle.js';
import { DEG } from './constants.js';
import { compareBalance, type BalanceComparison } from './compare.js';
import { evaluateBalance, type BalanceOptions, type BalanceResult } from './index.js';
import { balanceCore, DEFAULT_BUDGET_LATERAL_G, understeerBudget } from './understeer.js';

const finite = z.number().finite();

/** Entered values that win over both the kinematics and the vehicle's own fields. */
export const axleOverridesSchema = z.strictObject({
  rollSteerCoefficient: finite.optional(),
  rollCamberDegPerDeg: finite.optional(),
  rollCentreHeightMm: finite.optional(),
  springMotionRatio: finite.positive().optional(),
  barMotionRatio: finite.positive().optional(),
});
export type AxleOverrides = z.infer<typeof axleOverridesSchema>;

const vehicleDocument = z.preprocess(upgradeVehicleDocument, vehicleSchema);
const cornerDocument = z.preprocess(upgradeCornerDocument, cornerSchema);

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
export type BalanceRequest = z.infer<typeof balanceRequestSchema>;

export type ValueSource = 'override' | 'kinematics' | 'vehicle' | 'not-applicable';

export interface AxleLink {
  /** The corner was given and its kinematics were read. */
  fromCorner: boolean;
  /** Rack position at which they were read, mm (0 for an unsteered axle). */
  rackMm: number | null;
  /** Mean road-wheel steer at that rack position, deg. */
  axleSteerDeg: number | null;
  kinematics: AxleSummary | null;
  used: { rollSteerCoefficient: number; rollCamberDegPerDeg: number; rollCentreHeightMm: number; springMotionRatio: number | null; barMotionRatio: number | null };
  source: { rollSteerCoefficient: ValueSource; rollCamberDegPerDeg: ValueSource; rollCentreHeightMm: ValueSource; springMotionRatio: ValueSource; barMotionRatio: ValueSource };
  notes: string[];
}

export interface BalanceResponse extends BalanceResult {
  kinematicsLink: { front: AxleLink; rear: AxleLink; cornerRadiusM: number | null };
  /** The vehicle actually evaluated (entered values with the linked ones written in). */
  effectiveVehicle: Vehicle;
  comparison: (BalanceComparison & { variant: BalanceResult & { kinematicsLink: { front: AxleLink; rear: AxleLink } } }) | null;
}

type Case = { vehicle: Vehicle; frontCorner?: Corner | undefined; rearCorner?: Corner | undefined; overrides?: { front?: AxleOverrides | undefined; rear?: AxleOverrides | undefined } | undefined };

function pick<T>(override: T | undefined, kin: T | undefined, own: T | undefined): { value: T | undefined; source: ValueSource } {
  if (override !== undefined) return { value: override, source: 'override' };
  if (kin !== undefined) return { value: kin, source: 'kinematics' };
  if (own !== undefined) return { value: own, source: 'vehicle' };
  return { value: undefined, source: 'not-applicable' };
}

/** Writes the linked values into a copy of the vehicle's axle and says where each came from. */
function linkAxle(v: Vehicle, name: 'front' | 'rear', corner: Corner | undefined, o: AxleOverrides | undefined, steerDeg: number | null): { axle: Vehicle['front']; link: AxleLink } {
  const axle = structuredClone(v[name]);
  const notes: string[] = [];
  let kin: AxleSummary | null = null;
  let rackMm: number | null = null;
  let axleSteerDeg: number | null = null;
  if (corner) {
    rackMm = corner.steered && steerDeg !== null ? rackForAxleSteer(corner, steerDeg) : 0;
    axleSteerDeg = corner.steered && steerDeg !== null ? steerDeg : corner.steered ? 0 : null;
    kin = axleSummary(corner, { rackMm });
    if (Math.abs(kin.trackMm - axle.trackMm) > 0.01 * axle.trackMm) {
      notes.push(`the corner's track (${kin.trackMm.toFixed(0)} mm) differs from the vehicle's ${name}.trackMm (${axle.trackMm.toFixed(0)} mm) by more than 1 %; the vehicle's value is used`);
    }
  }
  const eps = pick(o?.rollSteerCoefficient, kin?.rollSteerCoefficient, axle.rollSteerCoefficient);
  const camber = pick(o?.rollCamberDegPerDeg, kin?.rollCamberDegPerDeg, axle.rollCamberDegPerDeg);
  const rc = pick(o?.rollCentreHeightMm, kin?.rollCentreHeightMm, axle.rollCentreHeightMm);
  axle.rollSteerCoefficient = eps.value ?? 0;
  axle.rollCamberDegPerDeg = camber.value ?? 0;
  axle.rollCentreHeightMm = rc.value!;
  let spring = { value: axle.spring?.motionRatio as number | undefined, source: (axle.spring ? 'vehicle' : 'not-applicable') as ValueSource };
  if (axle.spring && axle.rollStiffnessNmPerDeg === undefined) {
    spring = pick(o?.springMotionRatio, kin?.springMotionRatio, axle.spring.motionRatio);
    axle.spring.motionRatio = spring.value!;
  } else if (o?.springMotionRatio !== undefined || kin?.springMotionRatio !== undefined) {
    notes.push(`${name}.rollStiffnessNmPerDeg is entered directly, so the spring motion ratio is not used`);
    spring = { value: undefined, source: 'not-applicable' };
  }
  let bar = { value: undefined as number | undefined, source: 'not-applicable' as ValueSource };
  const b = axle.antiRollBar;
  if (b && 'linkMotionRatio' in b && axle.rollStiffnessNmPerDeg === undefined) {
    bar = pick(o?.barMotionRatio, kin?.barMotionRatio, b.linkMotionRatio);
    b.linkMotionRatio = bar.value!;
  } else if (o?.barMotionRatio !== undefined || kin?.barMotionRatio !== undefined) {
    notes.push(`${name} bar motion ratio not used: the bar is entered as a roll rate at the wheels, or the axle's roll stiffness directly`);
  }
  return {
    axle,
    link: {
      fromCorner: corner !== undefined,
      rackMm,
      axleSteerDeg,
      kinematics: kin,
      used: { rollSteerCoefficient: axle.rollSteerCoefficient, rollCamberDegPerDeg: axle.rollCamberDegPerDeg, rollCentreHeightMm: axle.rollCentreHeightMm, springMotionRatio: spring.value ?? null, barMotionRatio: bar.value ?? null },
      source: { rollSteerCoefficient: eps.source, rollCamberDegPerDeg: camber.source, rollCentreHeightMm: rc.source, springMotionRatio: spring.source, barMotionRatio: bar.source },
      notes,
    },
  };
}

/** A vehicle with its front and rear corners (and overrides), as `computeBalance` takes it. */
export type BalanceCase = Case;

/** The vehicle the balance model evaluates: entered values with the corners' kinematics written in, and where each came from. */
export interface LinkedVehicle {
  vehicle: Vehicle;
  front: AxleLink;
  rear: AxleLink;
}

/**
 * Links the corners' kinematics into the vehicle exactly as `computeBalance`
 * does. With a steered front corner and a corner radius, the rack is set to
 * the steer the car needs on that radius, δ = L/R + K·a_y at the budget's
 * lateral acceleration: K depends on the roll steer read there, so this is
 * iterated (a fixed point, three passes at most). Without a radius the
 * kinematics are read with the rack straight ahead. Errors name the request
 * field (`frontCorner`, `rearCorner`, `vehicle`, after `prefix`).
 */
export function linkVehicle(c: BalanceCase, options: Pick<BalanceOptions, 'lateralAccelerationG'> = {}, radiusM: number | null = null, prefix = ''): LinkedVehicle {
  const v = c.vehicle;
  const ackermannDeg = radiusM !== null ? (v.wheelbaseMm / 1000 / radiusM) / DEG : null;
  const lateralG = options.lateralAccelerationG ?? DEFAULT_BUDGET_LATERAL_G;
  const iterate = ackermannDeg !== null && c.frontCorner?.steered === true;
  const r = blame(`${prefix}rearCorner`, () => linkAxle(v, 'rear', c.rearCorner, c.overrides?.rear, null));
  let steerDeg = ackermannDeg;
  const linkFront = () => blame(`${prefix}frontCorner`, () => linkAxle(v, 'front', c.frontCorner, c.overrides?.front, steerDeg));
  let f = linkFront();
  for (let pass = 0; iterate && pass < 3; pass++) {
    const k = blame(`${prefix}vehicle`, () => understeerBudget(balanceCore({ ...v, front: f.axle, rear: r.axle }), lateralG).understeerBudget.total);
    const next = ackermannDeg! + k * lateralG;
    if (Math.abs(next - steerDeg!) < 1e-4) break;
    steerDeg = next;
    f = linkFront();
  }
  if (iterate) f.link.notes.push(`read at the rack position for ${steerDeg!.toFixed(3)} deg of mean steer: ${radiusM} m radius at ${lateralG} g (L/R + K·a_y)`);
  return { vehicle: { ...v, front: f.axle, rear: r.axle }, front: f.link, rear: r.link };
}

/**
 * The roll-steer term of the understeer budget, K_rs (deg/g), of a linked
 * vehicle: the very functions `evaluateBalance` reports
 * `understeerBudget.rollSteer` from (balanceCore → understeerBudget).
 */
export function rollSteerTermDegPerG(vehicle: Vehicle): number {
  return understeerBudget(balanceCore(vehicle)).understeerBudget.rollSteer;
}

/** Evaluates one vehicle with its corners linked in (`linkVehicle`). */
function evaluateCase(c: Case, options: BalanceOptions, radiusM: number | null, prefix = ''): { result: BalanceResult; front: AxleLink; rear: AxleLink; vehicle: Vehicle } {
  const linked = linkVehicle(c, options, radiusM, prefix);
  return { result: blame(`${prefix}vehicle`, () => evaluateBalance(linked.vehicle, options)), front: linked.front, rear: linked.rear, vehicle: linked.vehicle };
}

/**
 * Runs `body`, re-throwing its errors against the request field they belong
 * to: InputError paths get `where.` in front (the engine names paths inside
 * the vehicle or corner), SolveError messages and details name the corner.
 */
function blame<T>(where: string, body: () => T): T {
  try {
    return body();
  } catch (e) {
    if (e instanceof InputError) {
      const issues = e.issues.map((i) => ({ ...i, path: i.path === '(root)' ? where : `${where}.${i.path.replace(/^corner\./, '')}` }));
      throw new InputError(`${where}: ${e.message}`, issues);
    }
    if (e instanceof SolveError) throw new SolveError(e.code, `${where}: ${e.message}`, { ...e.details, field: where });
    throw e;
  }
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
