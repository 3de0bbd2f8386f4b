/**
 * The vehicle balance model (issue 4): roll stiffness and load transfer,
 * the understeer budget and its sensitivity, the steady-state bicycle model
 * and the step-steer transient. Pure and synchronous; docs/balance.md
 * documents every formula and output.
 */
import { SAFETY_CAUTION } from '../cautions/cautions.js';
import { SolveError } from '../errors.js';
import type { Vehicle } from '../schema/vehicle.js';
import { KPH } from './constants.js';
import { evaluateRoll, type AxleLoadTransfer, type AxleRollStiffness, type MassProperties } from './roll.js';
import { gainsAt, sideslipZeroSpeedKph, speedCharacteristic, steerCurve, type GainRow, type SpeedCharacteristic, type SteerCurve } from './steady.js';
import { stepResponse, transientModels, type StepResponse } from './transient.js';
import { describeTyreLoadLaw } from './tyre.js';
import {
  balanceCore,
  BUDGET_TERMS,
  DEFAULT_BUDGET_LATERAL_G,
  understeerBudget,
  understeerGradientAt,
  understeerSensitivity,
  type AxleCompliance,
  type BudgetTerm,
  type SensitivityEntry,
  type UndersteerBudget,
  type Validity,
} from './understeer.js';
import { RAD_PER_DEG } from '../angles.js';
import { AXLE_NAMES } from '../schema/axle.js';

export { exampleVehicles, type ExampleVehicleName } from './examples.js';
export { rollSteerUndersteerDegPerG, suspensionRollGradients, understeerSensitivity, budgetFromCompliances, BUDGET_TERMS } from './understeer.js';
export { tyreLoadLaw, tyreStiffnessAt, describeTyreLoadLaw, DEGRESSIVE_PEAK_LOAD_RATIO, type TyreLoadLaw } from './tyre.js';
export { evaluateRoll, barTwistRadPerM, seriesStiffness, barTorsionalRateNmPerRad, springRollStiffnessNmPerRad, tyreRollStiffnessNmPerRad } from './roll.js';
export { compareBalance, type BalanceComparison } from './compare.js';

export const DEFAULT_SPEEDS_KPH: readonly number[] = Array.from({ length: 20 }, (_, i) => 10 * (i + 1));

export interface BalanceOptions {
  /** Lateral acceleration of the load-transfer term, g (default 0.4). */
  lateralAccelerationG?: number | undefined;
  /** Speed of the step steer, km/h (default 80). */
  speedKph?: number | undefined;
  /** Speeds of the gain table, km/h (default 10…200 in steps of 10). */
  speedsKph?: readonly number[] | undefined;
  /** Radius of the steer-angle curve, m (default 40). */
  cornerRadiusM?: number | undefined;
  /** Highest lateral acceleration of the steer curve, g (default 0.8, cut at the validity limit). */
  steerCurveMaxG?: number | undefined;
  steerCurvePoints?: number | undefined;
  /** Road-wheel step steer, deg (default 1). */
  stepSteerDeg?: number | undefined;
  /** Simulated time of the step, s (default 3). */
  stepDurationS?: number | undefined;
  /** Sampling interval of the step metrics, s (default 0.002; crossings interpolated); history rows every 10 ms. */
  stepSampleS?: number | undefined;
  /** Rank the inputs by their effect on K (default true). */
  sensitivity?: boolean | undefined;
  /** K points of K(a_y) (default 9, from 0 to the validity limit). */
  gradientPoints?: number;
}

export interface BalanceResult {
  vehicleName: string | null;
  caution: string;
  /** Which roll-gradient formula was used (options.rollGravityTerm). */
  rollGravityTerm: { included: boolean; note: string };
  mass: MassProperties;
  rollGradientDegPerG: number;
  rollStiffnessNmPerDeg: { front: number; rear: number; frontShare: number; detail: { front: AxleRollStiffness; rear: AxleRollStiffness } };
  suspensionRollDegPerG: { front: number; rear: number };
  lateralLoadTransfer: { frontNPerG: number; rearNPerG: number; frontShare: number; front: AxleLoadTransfer; rear: AxleLoadTransfer };
  /** The roll moments per g, as a breakdown (Σ ΔW_i·t_i = m·h·a_y + m_s·g·h₁·φ holds by construction of the formulas, so it is not a check). */
  rollMomentBalance: { loadTransferMomentNmPerG: number; appliedMomentNmPerG: number; gravityMomentNmPerG: number };
  rollCentreHeightMm: { front: number; rear: number };
  /** Terms of K; each taken at the lateral acceleration `budgetTermLateralAccelerationG` gives (only loadTransfer depends on it). */
  understeerBudget: UndersteerBudget;
  budgetLateralAccelerationG: number;
  /** Lateral acceleration at which each budget term is taken, g: 0 (on-centre) for all but loadTransfer. */
  budgetTermLateralAccelerationG: Record<BudgetTerm, number>;
  /** K without the load-transfer term (cornering stiffness at static loads), deg/g: equals the on-centre K. */
  linearUndersteerGradientDegPerG: number;
  /** On-centre understeer gradient K(a_y → 0), deg/g: the characteristic or critical speed, the gains and the step steer use it. */
  onCentreUndersteerGradientDegPerG: number;
  /** Axle compliances at the budget's lateral acceleration. */
  axleCompliance: { front: AxleCompliance; rear: AxleCompliance };
  /** Axle compliances on-centre (a_y → 0): the gains and the step steer use them. */
  onCentreAxleCompliance: { front: AxleCompliance; rear: AxleCompliance };
  /** How each axle's tyre cornering stiffness changes with load (load-transfer term, steer curve). */
  tyreLoadLaw: { front: string; rear: string };
  understeerGradientByLateralAcceleration: { lateralAccelerationG: number; understeerGradientDegPerG: number }[];
  validity: Validity;
  sensitivity: { fraction: number; entries: SensitivityEntry[] } | null;
  regime: SpeedCharacteristic['regime'];
  neutralSteer: boolean;
  characteristicSpeedKph: number | null;
  criticalSpeedKph: number | null;
  gains: { peakYawRateGainPerS: number | null; sideslipZeroSpeedKph: number | null; unstableAboveKph: number | null; rows: GainRow[] };
  steerCurve: SteerCurve;
  stepSteer: StepResponse & { withRoll: StepResponse | null };
}

export function evaluateBalance(vehicle: Vehicle, options: BalanceOptions = {}): BalanceResult {
  const lateralG = options.lateralAccelerationG ?? DEFAULT_BUDGET_LATERAL_G;
  const roll = evaluateRoll(vehicle);
  const core = balanceCore(vehicle, roll);
  const budget = understeerBudget(core, lateralG);
  // The speed characteristic, gains and step steer are small-signal properties about straight running: on-centre K.
  const onCentre = understeerBudget(core, 0);
  const K0 = onCentre.understeerBudget.total;
  const L = core.wheelbaseM;
  const b = L - core.cgToFrontM;
  const sc = speedCharacteristic(K0, L);
  const gainInputs = { kDegPerG: K0, wheelbaseM: L, cgToRearM: b, rearComplianceDegPerG: onCentre.axleCompliance.rear.total, steeringRatio: vehicle.steeringRatio };
  const gradientPoints = options.gradientPoints ?? 9;
  refuseNoValidRange(core, budget.validity);
  const kOfAyMaxG = Math.min(1, 0.98 * physicalLimit(budget.validity));
  const kOfAy = Array.from({ length: gradientPoints }, (_, i) => {
    const A = (kOfAyMaxG * i) / Math.max(1, gradientPoints - 1);
    return { lateralAccelerationG: A, understeerGradientDegPerG: understeerGradientAt(core, A) };
  });
  const curve = steerCurve(core, {
    radiusM: options.cornerRadiusM ?? 40,
    maxG: options.steerCurveMaxG ?? 0.8,
    points: options.steerCurvePoints ?? 20,
    slopeAtG: lateralG,
    linearKDegPerG: budget.linearUndersteerGradientDegPerG,
    limitG: physicalLimit(budget.validity),
  });
  const speedMps = (options.speedKph ?? 80) * KPH;
  const models = transientModels(core, onCentre.axleCompliance, speedMps);
  const stepOpts = { steerRad: (options.stepSteerDeg ?? 1) * RAD_PER_DEG, durationS: options.stepDurationS ?? 3, sampleS: options.stepSampleS ?? 0.002, historyEvery: Math.max(1, Math.round(0.01 / (options.stepSampleS ?? 0.002))) };
  const step2 = stepResponse(models.twoDof, stepOpts);
  const step3 = models.threeDof ? stepResponse(models.threeDof, stepOpts) : null;
  const mb = roll.rollMomentBalance;
  const sens = options.sensitivity === false ? null : understeerSensitivity(vehicle, lateralG);
  return {
    vehicleName: vehicle.name ?? null,
    caution: SAFETY_CAUTION,
    rollGravityTerm: {
      included: roll.gravityTerm,
      note: roll.gravityTerm
        ? "roll gradient includes the sprung mass's gravity term m_s·g·h₁"
        : "gravity term omitted (options.rollGravityTerm = false), as in simplified published analyses; roll gradient and elastic load transfer are lower",
    },
    mass: roll.mass,
    rollGradientDegPerG: roll.rollGradientDegPerG,
    rollStiffnessNmPerDeg: {
      front: roll.rollStiffness.front.totalNmPerDeg,
      rear: roll.rollStiffness.rear.totalNmPerDeg,
      frontShare: roll.rollStiffnessFrontShare,
      detail: roll.rollStiffness,
    },
    suspensionRollDegPerG: roll.suspensionRollDegPerG,
    lateralLoadTransfer: {
      frontNPerG: roll.lateralLoadTransfer.front.totalNPerG,
      rearNPerG: roll.lateralLoadTransfer.rear.totalNPerG,
      frontShare: roll.lateralLoadTransfer.frontShare,
      front: roll.lateralLoadTransfer.front,
      rear: roll.lateralLoadTransfer.rear,
    },
    rollMomentBalance: {
      loadTransferMomentNmPerG: mb.loadTransferMomentNm,
      appliedMomentNmPerG: mb.appliedMomentNm,
      gravityMomentNmPerG: mb.gravityMomentNm,
    },
    rollCentreHeightMm: roll.rollCentreHeightMm,
    understeerBudget: budget.understeerBudget,
    budgetLateralAccelerationG: lateralG,
    budgetTermLateralAccelerationG: Object.fromEntries(BUDGET_TERMS.map((t) => [t, t === 'loadTransfer' ? lateralG : 0])) as Record<BudgetTerm, number>,
    linearUndersteerGradientDegPerG: budget.linearUndersteerGradientDegPerG,
    onCentreUndersteerGradientDegPerG: K0,
    axleCompliance: budget.axleCompliance,
    onCentreAxleCompliance: onCentre.axleCompliance,
    tyreLoadLaw: { front: describeTyreLoadLaw(core.front.tyreLaw), rear: describeTyreLoadLaw(core.rear.tyreLaw) },
    understeerGradientByLateralAcceleration: kOfAy,
    validity: budget.validity,
    sensitivity: sens ? { fraction: sens.fraction, entries: sens.entries } : null,
    regime: sc.regime,
    neutralSteer: sc.neutral,
    characteristicSpeedKph: sc.characteristicSpeedKph,
    criticalSpeedKph: sc.criticalSpeedKph,
    gains: {
      peakYawRateGainPerS: sc.peakYawRateGainPerS,
      sideslipZeroSpeedKph: sideslipZeroSpeedKph(b, onCentre.axleCompliance.rear.total),
      unstableAboveKph: sc.criticalSpeedKph,
      rows: (options.speedsKph ?? DEFAULT_SPEEDS_KPH).map((s) => gainsAt(gainInputs, s)),
    },
    steerCurve: curve,
    stepSteer: { ...step2, withRoll: step3 },
  };
}

/**
 * An axle whose lateral load transfer is not positive (e.g. a roll centre far
 * above the CG) leaves the model no lateral acceleration at which it holds:
 * the wheel-lift limit comes out ≤ 0 and the steer curve would be NaN.
 */
function refuseNoValidRange(core: ReturnType<typeof balanceCore>, v: Validity): void {
  const limit = physicalLimit(v);
  if (limit > 0) return;
  const axle = AXLE_NAMES.find((a) => !(v.wheelLiftG[a] > 0) || !((v.stiffnessLimitG[a] ?? Infinity) > 0)) ?? 'front';
  const transfer = core[axle].loadTransferNPerG;
  throw new SolveError(
    'singular_geometry',
    `${axle}: lateral load transfer ${transfer.toFixed(0)} N/g leaves the model no valid lateral acceleration (limit ${limit.toFixed(2)} g); ` +
      `check ${axle}.rollCentreHeightMm (a roll centre far above the CG, entered or read from the corner; front ${core.roll.rollCentreHeightMm.front.toFixed(0)} mm, rear ${core.roll.rollCentreHeightMm.rear.toFixed(0)} mm) and the roll stiffnesses`,
    { axle, field: `${axle}.rollCentreHeightMm`, loadTransferNPerG: transfer, limitG: limit },
  );
}

/** Where the load-sensitive model itself ends (wheel lift, stiffness reaching zero), g. */
function physicalLimit(v: Validity): number {
  return Math.min(v.wheelLiftG.front, v.wheelLiftG.rear, v.stiffnessLimitG.front ?? Infinity, v.stiffnessLimitG.rear ?? Infinity);
}
