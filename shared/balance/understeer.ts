/**
 * Understeer budget of the steady-state bicycle model, term by term, as axle
 * cornering compliances D = (slip + steer out of the turn) per g, with
 * K = D_front − D_rear (Gillespie, Fundamentals of Vehicle Dynamics, from
 * memory; Bundorf & Leffert, SAE 760713, for the split). docs/balance.md §3.
 */
import { InputError } from '../errors.js';
import type { VehicleAxle, Vehicle } from '../schema/vehicle.js';
import { G } from './constants.js';
import type { AxleName } from '../schema/axle.js';
import { evaluateRoll, type RollModel } from './roll.js';
import { tyreLoadLaw, tyreStiffnessAt, tyreStiffnessSlope, type TyreLoadLaw } from './tyre.js';

/** Lateral acceleration at which the load-transfer term is evaluated by default, g (Bundorf: linear to about 0.4 g). */
export const DEFAULT_BUDGET_LATERAL_G = 0.4;
/** The linear analysis's stated range, g (Bundorf table, "valid to about 0.4 g"). */
export const LINEAR_RANGE_G = 0.4;

export const BUDGET_TERMS = ['tyres', 'loadTransfer', 'rollSteer', 'rollCamber', 'complianceSteer', 'alignTorque'] as const;
export type BudgetTerm = (typeof BUDGET_TERMS)[number];

/** Per-axle numbers the budget and the steer curve share. Forces N, stiffness N/deg, per g where stated. */
export interface AxleCore {
  staticLoadN: number;
  /** Lateral force the axle carries per g, with the aligning torques' shift of the yaw balance, N/g. */
  lateralForceNPerG: number;
  /** Axle cornering stiffness at static loads, N/deg. */
  corneringStiffnessNPerDeg: number;
  /** How each tyre's cornering stiffness changes with its load (./tyre.ts). */
  tyreLaw: TyreLoadLaw;
  loadTransferNPerG: number;
  /** Camber thrust stiffness of the axle (both tyres), N/deg. */
  camberStiffnessNPerDeg: number;
  /** Outward inclination of the wheels to the ground per g, deg/g. */
  inclinationDegPerG: number;
  rollSteerCoefficient: number;
  suspensionRollDegPerG: number;
  /** Steer out of the turn per g from everything but slip, deg/g. */
  steerOutDegPerG: number;
  pneumaticTrailM: number;
  /** Lever of the lateral force about the steering axis: mechanical plus pneumatic trail, m. */
  steeringTrailM: number;
}

export interface AxleCompliance extends Record<BudgetTerm, number> {
  /** Aligning torque's own effect (shift of the axle forces), deg/g; part of alignTorque. */
  alignTorqueMoment: number;
  /** Aligning-torque compliance steer, deg/g; part of alignTorque. */
  alignTorqueComplianceSteer: number;
  total: number;
}

export interface BalanceCore {
  vehicle: Vehicle;
  roll: RollModel;
  front: AxleCore;
  rear: AxleCore;
  wheelbaseM: number;
  cgToFrontM: number;
}

function axleCorneringStiffness(axle: VehicleAxle, staticLoadN: number, path: string): { c0: number; law: TyreLoadLaw } {
  const fz = staticLoadN / 2;
  const law = tyreLoadLaw(axle.tyre, fz);
  const c = tyreStiffnessAt(law, fz);
  if (!(c > 0)) throw new InputError(`${path}.tyre.loadSensitivity gives a non-positive cornering stiffness (${c.toFixed(1)} N/deg) at the static load ${fz.toFixed(0)} N`, [{ path: `${path}.tyre.loadSensitivity`, message: 'non-positive cornering stiffness at static load' }]);
  return { c0: 2 * c, law };
}

/** Builds the per-axle numbers from a vehicle (and its roll model, computed when not given). */
export function balanceCore(v: Vehicle, roll: RollModel = evaluateRoll(v)): BalanceCore {
  const L = v.wheelbaseMm / 1000;
  const a = v.cgToFrontAxleMm / 1000;
  const b = L - a;
  const W = v.massKg * G;
  const tpf = (v.front.tyre.pneumaticTrailMm ?? 0) / 1000;
  const tpr = (v.rear.tyre.pneumaticTrailMm ?? 0) / 1000;
  // Yaw balance with each axle's force acting a pneumatic trail behind its contact patch.
  const fyPerG = { front: (W * (b + tpr)) / (L - tpf + tpr), rear: (W * (a - tpf)) / (L - tpf + tpr) };
  const phiPerG = roll.rollGradientDegPerG;
  const axle = (name: AxleName): AxleCore => {
    const ax = v[name];
    const load = name === 'front' ? roll.mass.frontLoadN : roll.mass.rearLoadN;
    const cs = axleCorneringStiffness(ax, load, name);
    const phiS = roll.suspensionRollDegPerG[name];
    const eps = ax.rollSteerCoefficient ?? 0;
    const fy = fyPerG[name];
    const tp = (ax.tyre.pneumaticTrailMm ?? 0) / 1000;
    // The lateral force acts a pneumatic trail behind the contact patch, which lies a mechanical trail behind the steering axis.
    const trail = tp + (ax.mechanicalTrailMm ?? 0) / 1000;
    const steerOut = eps * phiS + ((ax.complianceSteerDegPerKN ?? 0) * fy) / 1000 + (ax.steeringStiffnessNmPerDeg ? (fy * trail) / ax.steeringStiffnessNmPerDeg : 0);
    return {
      staticLoadN: load,
      lateralForceNPerG: fy,
      corneringStiffnessNPerDeg: cs.c0,
      tyreLaw: cs.law,
      loadTransferNPerG: roll.lateralLoadTransfer[name].totalNPerG,
      camberStiffnessNPerDeg: 2 * (ax.tyre.camberStiffnessNPerDeg ?? 0),
      // Suspension roll × roll camber, plus the axle's own tilt on its tyres (φ − φ_s) leaning both wheels out, plus compliance camber.
      inclinationDegPerG: (ax.rollCamberDegPerDeg ?? 0) * phiS + (phiPerG - phiS) + ((ax.complianceCamberDegPerKN ?? 0) * fy) / 1000,
      rollSteerCoefficient: eps,
      suspensionRollDegPerG: phiS,
      steerOutDegPerG: steerOut,
      pneumaticTrailM: tp,
      steeringTrailM: trail,
    };
  };
  return { vehicle: v, roll, front: axle('front'), rear: axle('rear'), wheelbaseM: L, cgToFrontM: a };
}

/** Axle cornering stiffness at lateral acceleration A (g), both tyres at W/2 ± ΔW on the tyre law, N/deg. */
export function axleStiffnessAt(c: AxleCore, lateralG: number): number {
  const dw = c.loadTransferNPerG * lateralG;
  const fz = c.staticLoadN / 2;
  return tyreStiffnessAt(c.tyreLaw, fz + dw) + tyreStiffnessAt(c.tyreLaw, fz - dw);
}

/** dC_axle/dA at A, N/deg per g: ΔW'·(C'(W/2 + ΔW) − C'(W/2 − ΔW)). */
function axleStiffnessSlope(c: AxleCore, lateralG: number): number {
  const dw = c.loadTransferNPerG * lateralG;
  const fz = c.staticLoadN / 2;
  return c.loadTransferNPerG * (tyreStiffnessSlope(c.tyreLaw, fz + dw) - tyreStiffnessSlope(c.tyreLaw, fz - dw));
}

/** Force the tyres must make by slip per g: the lateral force plus the outward camber thrust, N/g. */
function slipForceNPerG(c: AxleCore): number {
  return c.lateralForceNPerG + c.camberStiffnessNPerDeg * c.inclinationDegPerG;
}

/** Slip angle of the axle at lateral acceleration A, deg. */
export function axleSlipDeg(c: AxleCore, lateralG: number): number {
  return (slipForceNPerG(c) * lateralG) / axleStiffnessAt(c, lateralG);
}

/** d(slip)/dA at A: X·(C(A) − A·C'(A))/C(A)² (derivative of X·A/C(A)), deg/g. */
export function axleSlipGradientDegPerG(c: AxleCore, lateralG: number): number {
  const C = axleStiffnessAt(c, lateralG);
  return (slipForceNPerG(c) * (C - lateralG * axleStiffnessSlope(c, lateralG))) / (C * C);
}

/** The axle's compliance split into the budget's terms, deg/g; loadTransfer at lateral acceleration A. */
export function axleCompliance(c: AxleCore, ax: VehicleAxle, lateralG: number): AxleCompliance {
  const c0 = c.corneringStiffnessNPerDeg;
  const fy = c.lateralForceNPerG;
  const tyres = c.staticLoadN / c0;
  const alignTorqueMoment = (fy - c.staticLoadN) / c0;
  const alignTorqueComplianceSteer = ax.steeringStiffnessNmPerDeg ? (fy * c.steeringTrailM) / ax.steeringStiffnessNmPerDeg : 0;
  const rollCamber = (c.camberStiffnessNPerDeg * c.inclinationDegPerG) / c0;
  const rollSteer = c.rollSteerCoefficient * c.suspensionRollDegPerG;
  const complianceSteer = ((ax.complianceSteerDegPerKN ?? 0) * fy) / 1000;
  const loadTransfer = axleSlipGradientDegPerG(c, lateralG) - slipForceNPerG(c) / c0;
  const alignTorque = alignTorqueMoment + alignTorqueComplianceSteer;
  return {
    tyres,
    loadTransfer,
    rollSteer,
    rollCamber,
    complianceSteer,
    alignTorque,
    alignTorqueMoment,
    alignTorqueComplianceSteer,
    total: tyres + loadTransfer + rollSteer + rollCamber + complianceSteer + alignTorque,
  };
}

export type UndersteerBudget = Record<BudgetTerm | 'total', number>;

/** K per term = D_front − D_rear (deg/g; positive = understeer). */
export function budgetFromCompliances(front: Record<BudgetTerm, number>, rear: Record<BudgetTerm, number>): UndersteerBudget {
  const out = {} as UndersteerBudget;
  let total = 0;
  for (const k of BUDGET_TERMS) {
    out[k] = front[k] - rear[k];
    total += out[k];
  }
  out.total = total;
  return out;
}

/** Tangent understeer gradient dδ/da_y at lateral acceleration A, deg/g. */
export function understeerGradientAt(core: BalanceCore, lateralG: number): number {
  return axleSlipGradientDegPerG(core.front, lateralG) + core.front.steerOutDegPerG - axleSlipGradientDegPerG(core.rear, lateralG) - core.rear.steerOutDegPerG;
}

/**
 * Road-wheel steer beyond the kinematic L/R at steady lateral acceleration A
 * (g), deg: the axle slips and steer-outs of this model at A (its secant, not
 * the tangent K(A)·A). δ = L/R + this.
 */
export function steerBeyondKinematicDeg(core: BalanceCore, lateralG: number): number {
  return axleSlipDeg(core.front, lateralG) + core.front.steerOutDegPerG * lateralG - axleSlipDeg(core.rear, lateralG) - core.rear.steerOutDegPerG * lateralG;
}

export interface Validity {
  /** The linear analysis's stated range (Bundorf), g. */
  linearRangeG: number;
  /** Lateral acceleration at which the inner wheel of each axle unloads fully, g. */
  wheelLiftG: { front: number; rear: number };
  /** Where an axle's load-sensitive cornering stiffness would reach zero, g (null = load-insensitive). */
  stiffnessLimitG: { front: number | null; rear: number | null };
  /** The smallest of these: the model's limit, g. */
  limitG: number;
  basis: string;
}

export function validity(core: BalanceCore): Validity {
  const lift = (c: AxleCore) => c.staticLoadN / 2 / c.loadTransferNPerG;
  const stiff = (c: AxleCore): number | null => {
    // The degressive default law stays positive at every positive load; only an entered quadratic reaches zero.
    const law = c.tyreLaw;
    if (law.kind !== 'quadratic' || law.b === 0) return null;
    // Outer tyre: a·Fz − b·Fz² > 0 ⇒ Fz < a/b; axle: C0 − 2b·ΔW² > 0.
    const fzMax = law.a / law.b;
    const outer = (fzMax - c.staticLoadN / 2) / c.loadTransferNPerG;
    const axle = Math.sqrt(c.corneringStiffnessNPerDeg / (2 * law.b)) / c.loadTransferNPerG;
    return Math.min(outer, axle);
  };
  const wheelLiftG = { front: lift(core.front), rear: lift(core.rear) };
  const stiffnessLimitG = { front: stiff(core.front), rear: stiff(core.rear) };
  const limits = [LINEAR_RANGE_G, wheelLiftG.front, wheelLiftG.rear, ...[stiffnessLimitG.front, stiffnessLimitG.rear].filter((x): x is number => x !== null)];
  return {
    linearRangeG: LINEAR_RANGE_G,
    wheelLiftG,
    stiffnessLimitG,
    limitG: Math.min(...limits),
    basis: 'linear tyres and compliances, valid to about 0.4 g (Bundorf & Leffert); load-sensitive tyres until an inner wheel lifts',
  };
}

export interface BudgetResult {
  lateralAccelerationG: number;
  axleCompliance: { front: AxleCompliance; rear: AxleCompliance };
  understeerBudget: UndersteerBudget;
  /** Understeer gradient with constant cornering stiffness at static loads (budget total minus the load-transfer term), deg/g. */
  linearUndersteerGradientDegPerG: number;
  validity: Validity;
}

export function understeerBudget(core: BalanceCore, lateralG = DEFAULT_BUDGET_LATERAL_G): BudgetResult {
  const front = axleCompliance(core.front, core.vehicle.front, lateralG);
  const rear = axleCompliance(core.rear, core.vehicle.rear, lateralG);
  const budget = budgetFromCompliances(front, rear);
  return {
    lateralAccelerationG: lateralG,
    axleCompliance: { front, rear },
    understeerBudget: budget,
    linearUndersteerGradientDegPerG: budget.total - budget.loadTransfer,
    validity: validity(core),
  };
}

/** K_rs = ε_f·dφs,f/da_y − ε_r·dφs,r/da_y (domain.md), deg/g, for the given coefficients. */
export function rollSteerUndersteerDegPerG(vehicle: Vehicle, eps: { front: number; rear: number }): number {
  const g = suspensionRollGradients(vehicle);
  return eps.front * g.frontDegPerG - eps.rear * g.rearDegPerG;
}

/** Suspension roll gradients (body relative to each axle, tyres in series), deg/g. */
export function suspensionRollGradients(vehicle: Vehicle): { frontDegPerG: number; rearDegPerG: number } {
  const r = evaluateRoll(vehicle);
  return { frontDegPerG: r.suspensionRollDegPerG.front, rearDegPerG: r.suspensionRollDegPerG.rear };
}

export interface SensitivityEntry {
  /** Dotted path of the vehicle input, e.g. `rear.rollSteerCoefficient`. */
  path: string;
  value: number;
  /** K with the input +10 % and −10 %, deg/g (null where that vehicle is invalid). */
  kPlusDegPerG: number | null;
  kMinusDegPerG: number | null;
  /** Largest |ΔK| of the two, deg/g: the ranking key. */
  maxAbsChangeDegPerG: number;
}

const NOT_PERTURBED = new Set(['formatVersion']);
/** Inputs that do not enter the steady-state K (inertias, damping, steering ratio): listed with no change, not re-evaluated. */
const NOT_IN_K = new Set(['yawInertiaKgM2', 'rollInertiaKgM2', 'rollDampingNmsPerDeg', 'steeringRatio']);

function numericLeaves(obj: unknown, prefix: string, out: { path: string; parent: Record<string, unknown>; key: string }[]): void {
  if (obj === null || typeof obj !== 'object') return;
  for (const [k, val] of Object.entries(obj as Record<string, unknown>)) {
    const path = prefix ? `${prefix}.${k}` : k;
    if (typeof val === 'number' && !NOT_PERTURBED.has(path) && val !== 0) out.push({ path, parent: obj as Record<string, unknown>, key: k });
    else if (typeof val === 'object') numericLeaves(val, path, out);
  }
}

/**
 * Change of the budget total K for ±10 % of each non-zero numeric input,
 * ranked by the larger change. Inputs with no effect on K rank last.
 */
export function understeerSensitivity(vehicle: Vehicle, lateralG = DEFAULT_BUDGET_LATERAL_G, fraction = 0.1): { baseKDegPerG: number; fraction: number; entries: SensitivityEntry[] } {
  const kOf = (v: Vehicle): number | null => {
    if (v.cgToFrontAxleMm >= v.wheelbaseMm) return null;
    if ((v.front.unsprungMassKg ?? 0) + (v.rear.unsprungMassKg ?? 0) >= v.massKg) return null;
    try {
      return understeerBudget(balanceCore(v), lateralG).understeerBudget.total;
    } catch (e) {
      if (e instanceof InputError) return null;
      throw e;
    }
  };
  const base = kOf(vehicle);
  if (base === null) throw new InputError('vehicle cannot be evaluated', [{ path: '(root)', message: 'invalid vehicle' }]);
  const work = structuredClone(vehicle);
  const leaves: { path: string; parent: Record<string, unknown>; key: string }[] = [];
  numericLeaves(work, '', leaves);
  const entries: SensitivityEntry[] = leaves.map(({ path, parent, key }) => {
    const value = parent[key] as number;
    if (NOT_IN_K.has(path)) return { path, value, kPlusDegPerG: base, kMinusDegPerG: base, maxAbsChangeDegPerG: 0 };
    parent[key] = value * (1 + fraction);
    const kPlus = kOf(work);
    parent[key] = value * (1 - fraction);
    const kMinus = kOf(work);
    parent[key] = value;
    const changes = [kPlus, kMinus].filter((k): k is number => k !== null).map((k) => Math.abs(k - base));
    return { path, value, kPlusDegPerG: kPlus, kMinusDegPerG: kMinus, maxAbsChangeDegPerG: changes.length ? Math.max(...changes) : 0 };
  });
  entries.sort((x, y) => y.maxAbsChangeDegPerG - x.maxAbsChangeDegPerG);
  return { baseKDegPerG: base, fraction, entries };
}

