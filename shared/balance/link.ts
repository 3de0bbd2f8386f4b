/**
 * The kinematics link of the balance model: writes what the front and rear
 * corners' kinematics give (roll steer ε, roll camber, roll-centre height,
 * spring and bar motion ratios, via `axleSummary`) into a copy of the
 * vehicle, each overridable, and says where each value came from. Used by
 * `computeBalance` and by the intent solver, so both read one geometry the
 * same way. Kept apart from api.ts (no request schemas, no transient model)
 * so the browser's kinematics worker can carry it cheaply.
 */
import { InputError, SolveError } from '../errors.js';
import { axleSummary, rackForAxleSteer, type AxleSummary } from '../kinematics/index.js';
import type { Corner } from '../schema/corner.js';
import type { Vehicle } from '../schema/vehicle.js';
import { barTwistRadPerM } from './roll.js';
import { balanceCore, DEFAULT_BUDGET_LATERAL_G, steerBeyondKinematicDeg, understeerBudget } from './understeer.js';
import { linkCompliance, type ComplianceLink } from './compliance-link.js';
import { RAD_PER_DEG } from '../angles.js';
import type { AxleName } from '../schema/axle.js';

/** Entered values that win over both the kinematics and the vehicle's own fields (`axleOverridesSchema` in api.ts). */
export interface AxleOverrides {
  rollSteerCoefficient?: number | undefined;
  rollCamberDegPerDeg?: number | undefined;
  rollCentreHeightMm?: number | undefined;
  springMotionRatio?: number | undefined;
  /** Drop-link travel per wheel travel, applied with the vehicle's own bar lever (leverLengthMm). */
  barMotionRatio?: number | undefined;
  /** Bar twist per wheel travel, rad/m (wins over barMotionRatio). */
  barTwistRadPerM?: number | undefined;
  /** Mechanical trail, mm (aligning-torque compliance steer). */
  mechanicalTrailMm?: number | undefined;
}

export type ValueSource = 'override' | 'kinematics' | 'vehicle' | 'not-applicable';

export interface AxleLink {
  /** The corner was given and its kinematics were read. */
  fromCorner: boolean;
  /** Rack position at which they were read, mm (0 for an unsteered axle). */
  rackMm: number | null;
  /** Mean road-wheel steer at that rack position, deg. */
  axleSteerDeg: number | null;
  /** Compliance steer and camber: computed from the corner's bushings, or entered in the vehicle (which wins). */
  compliance: ComplianceLink;
  kinematics: AxleSummary | null;
  used: {
    rollSteerCoefficient: number;
    rollCamberDegPerDeg: number;
    rollCentreHeightMm: number;
    springMotionRatio: number | null;
    /** Bar twist per unit wheel travel the bar's roll stiffness was computed with, rad/m (null: no bar geometry used). */
    barTwistRadPerM: number | null;
    mechanicalTrailMm: number | null;
  };
  source: {
    rollSteerCoefficient: ValueSource;
    rollCamberDegPerDeg: ValueSource;
    rollCentreHeightMm: ValueSource;
    springMotionRatio: ValueSource;
    barTwistRadPerM: ValueSource;
    mechanicalTrailMm: ValueSource;
  };
  notes: string[];
}

/** A vehicle with its front and rear corners (and overrides), as `computeBalance` takes it. */
export type BalanceCase = { vehicle: Vehicle; frontCorner?: Corner | undefined; rearCorner?: Corner | undefined; overrides?: { front?: AxleOverrides | undefined; rear?: AxleOverrides | undefined } | undefined };

function pick<T>(override: T | undefined, kin: T | undefined, own: T | undefined): { value: T | undefined; source: ValueSource } {
  if (override !== undefined) return { value: override, source: 'override' };
  if (kin !== undefined) return { value: kin, source: 'kinematics' };
  if (own !== undefined) return { value: own, source: 'vehicle' };
  return { value: undefined, source: 'not-applicable' };
}

/** Writes the linked values into a copy of the vehicle's axle and says where each came from. */
function linkAxle(v: Vehicle, name: AxleName, corner: Corner | undefined, o: AxleOverrides | undefined, steerDeg: number | null): { axle: Vehicle['front']; link: AxleLink } {
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
      notes.push(`the corner's track (${kin.trackMm.toFixed(0)} mm) differs from the vehicle's ${name} track (${axle.trackMm.toFixed(0)} mm) by more than 1 %; the vehicle's value is used`);
    }
  }
  const compliance = linkCompliance(axle, name, corner, rackMm, notes);
  const eps = pick(o?.rollSteerCoefficient, kin?.rollSteerCoefficient, axle.rollSteerCoefficient);
  const camber = pick(o?.rollCamberDegPerDeg, kin?.rollCamberDegPerDeg, axle.rollCamberDegPerDeg);
  const rc = pick(o?.rollCentreHeightMm, kin?.rollCentreHeightMm, axle.rollCentreHeightMm);
  axle.rollSteerCoefficient = eps.value ?? 0;
  axle.rollCamberDegPerDeg = camber.value ?? 0;
  axle.rollCentreHeightMm = rc.value!;
  let spring = { value: axle.spring?.motionRatio, source: (axle.spring ? 'vehicle' : 'not-applicable') as ValueSource };
  if (axle.spring && axle.rollStiffnessNmPerDeg === undefined) {
    spring = pick(o?.springMotionRatio, kin?.springMotionRatio, axle.spring.motionRatio);
    axle.spring.motionRatio = spring.value!;
  } else if (o?.springMotionRatio !== undefined || kin?.springMotionRatio !== undefined) {
    notes.push(`${name}.rollStiffnessNmPerDeg is entered directly, so the spring motion ratio is not used`);
    spring = { value: undefined, source: 'not-applicable' };
  }
  const bar = linkBar(axle, name, kin, o, notes);
  const trail = pick(o?.mechanicalTrailMm, kin?.mechanicalTrailMm, axle.mechanicalTrailMm);
  if (trail.value !== undefined) axle.mechanicalTrailMm = trail.value;
  return {
    axle,
    link: {
      fromCorner: corner !== undefined,
      rackMm,
      axleSteerDeg,
      compliance,
      kinematics: kin,
      used: {
        rollSteerCoefficient: axle.rollSteerCoefficient,
        rollCamberDegPerDeg: axle.rollCamberDegPerDeg,
        rollCentreHeightMm: axle.rollCentreHeightMm,
        springMotionRatio: spring.value ?? null,
        barTwistRadPerM: bar.value ?? null,
        mechanicalTrailMm: trail.value ?? null,
      },
      source: {
        rollSteerCoefficient: eps.source,
        rollCamberDegPerDeg: camber.source,
        rollCentreHeightMm: rc.source,
        springMotionRatio: spring.source,
        barTwistRadPerM: bar.source,
        mechanicalTrailMm: trail.source,
      },
      notes,
    },
  };
}

/**
 * The bar twist per unit wheel travel (rad/m) the axle's bar roll stiffness
 * uses, written into the copied axle's bar geometry. In order: the override
 * `barTwistRadPerM`; the override `barMotionRatio` over the vehicle's own
 * lever; the corner's bar (its lever-end rotation per wheel travel, so its own
 * lever radius, and the vehicle's `leverLengthMm` and `linkMotionRatio` are
 * dropped from the evaluated vehicle); the vehicle's own figures.
 */
function linkBar(axle: Vehicle['front'], name: AxleName, kin: AxleSummary | null, o: AxleOverrides | undefined, notes: string[]): { value: number | undefined; source: ValueSource } {
  const b = axle.antiRollBar;
  const offered = o?.barTwistRadPerM !== undefined || o?.barMotionRatio !== undefined || kin?.barTwistRadPerM !== undefined;
  if (!b || !('outerDiameterMm' in b) || axle.rollStiffnessNmPerDeg !== undefined) {
    if (offered) notes.push(`${name} bar geometry not used: the bar is entered as a roll rate at the wheels, or the axle's roll stiffness directly`);
    return { value: undefined, source: 'not-applicable' };
  }
  const { leverLengthMm, linkMotionRatio: _mr, twistRadPerM: _own, ...section } = b;
  // The evaluated bar carries its section and the twist used; lever figures that were not used are dropped.
  const write = (twist: number) => {
    axle.antiRollBar = { ...section, twistRadPerM: twist };
  };
  if (o?.barTwistRadPerM !== undefined) {
    write(o.barTwistRadPerM);
    return { value: o.barTwistRadPerM, source: 'override' };
  }
  if (o?.barMotionRatio !== undefined) {
    if (leverLengthMm !== undefined) {
      const twist = o.barMotionRatio / (leverLengthMm / 1000);
      write(twist);
      return { value: twist, source: 'override' };
    }
    notes.push(`overrides.${name}.barMotionRatio not used: the vehicle's bar gives its twist per wheel travel, not a lever length; override barTwistRadPerM instead`);
  }
  if (kin?.barTwistRadPerM !== undefined) {
    write(kin.barTwistRadPerM);
    notes.push(
      `${name} bar twist ${kin.barTwistRadPerM.toFixed(3)} rad/m from the corner's bar geometry (lever ${kin.barLeverMm!.toFixed(1)} mm); ` +
        `the vehicle's bar section and length are used, its leverLengthMm and linkMotionRatio are not`,
    );
    return { value: kin.barTwistRadPerM, source: 'kinematics' };
  }
  return { value: barTwistRadPerM(b), source: 'vehicle' };
}

/** The vehicle the balance model evaluates: entered values with the corners' kinematics written in, and where each came from. */
export interface LinkedVehicle {
  vehicle: Vehicle;
  front: AxleLink;
  rear: AxleLink;
}

/**
 * Links the corners' kinematics into the vehicle exactly as `computeBalance`
 * does. With a steered front corner and a corner radius, the rack is set to
 * the steer the car needs on that radius at the budget's lateral
 * acceleration, δ = L/R + the steady axle slips and steer-outs there
 * (`steerBeyondKinematicDeg`, the secant of the steer curve, not the tangent
 * K·a_y): they depend on the roll steer read there, so this is iterated (a
 * fixed point, three passes at most). Without a radius the
 * kinematics are read with the rack straight ahead. Errors name the request
 * field (`frontCorner`, `rearCorner`, `vehicle`, after `prefix`).
 */
export function linkVehicle(c: BalanceCase, options: { lateralAccelerationG?: number | undefined } = {}, radiusM: number | null = null, prefix = ''): LinkedVehicle {
  const v = c.vehicle;
  const ackermannDeg = radiusM !== null ? (v.wheelbaseMm / 1000 / radiusM) / RAD_PER_DEG : null;
  const lateralG = options.lateralAccelerationG ?? DEFAULT_BUDGET_LATERAL_G;
  const iterate = ackermannDeg !== null && c.frontCorner?.steered === true;
  const r = blame(`${prefix}rearCorner`, () => linkAxle(v, 'rear', c.rearCorner, c.overrides?.rear, null));
  let steerDeg = ackermannDeg;
  const linkFront = () => blame(`${prefix}frontCorner`, () => linkAxle(v, 'front', c.frontCorner, c.overrides?.front, steerDeg));
  let f = linkFront();
  for (let pass = 0; iterate && pass < 3; pass++) {
    const beyond = blame(`${prefix}vehicle`, () => steerBeyondKinematicDeg(balanceCore({ ...v, front: f.axle, rear: r.axle }), lateralG));
    const next = ackermannDeg + beyond;
    if (Math.abs(next - steerDeg!) < 1e-4) break;
    steerDeg = next;
    f = linkFront();
  }
  if (iterate) f.link.notes.push(`read at the rack position for ${steerDeg!.toFixed(3)} deg of mean steer: ${radiusM} m radius at ${lateralG} g (L/R plus the steady axle slips and steer at that lateral acceleration)`);
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

/**
 * Runs `body`, re-throwing its errors against the request field they belong
 * to: InputError paths get `where.` in front (the engine names paths inside
 * the vehicle or corner), SolveError messages and details name the corner.
 */
export function blame<T>(where: string, body: () => T): T {
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

