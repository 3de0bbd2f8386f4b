/**
 * Configuration results and inputs in words: the one label table of the
 * configuration results (label, group, the quantity kind that converts and
 * rounds it in the reader's unit system, or a fixed unit with its own
 * significant figures). The app's key figures, comparison, approval recompute
 * and "use the latest revisions" preview, and the server's review record (page
 * and PDF) all read it, so no screen or paper shows a raw result key.
 * Presentation only: no engineering here.
 */
import { pathWords } from './document-words.js';
import { kindForUnit, type QuantityKind } from '../units/quantities.js';

/**
 * What a configuration result is, in words: its label, the group it is
 * shown under, and how it is written (a quantity kind, converted to the
 * user's units with the kind's significant figures, or a fixed unit with its
 * own).
 */
export interface ResultWords {
  readonly label: string;
  readonly group: string;
  /** What it measures (its unit and rounding in the user's system); absent for a ratio, a count or text. */
  readonly kind?: QuantityKind;
  /** The unit written when no kind applies ('' for a plain ratio). */
  readonly unit?: string;
  /** Significant figures when no kind applies. */
  readonly sig?: number;
}

type Spec = Omit<ResultWords, 'group' | 'label'>;
const AXLES = [['front', 'front'], ['rear', 'rear']] as const;
const G = { unit: 'g', sig: 3 } as const;
const RATIO = { unit: '', sig: 3 } as const;
const TEXT = {} as const;
const UG = { kind: 'understeerGradient' } as const;

/** Understeer-budget terms in words (the budget chart's own names). */
const TERMS: readonly (readonly [string, string])[] = [
  ['tyres', 'tyres'],
  ['loadTransfer', 'load transfer'],
  ['rollSteer', 'roll steer'],
  ['rollCamber', 'roll camber'],
  ['complianceSteer', 'compliance steer'],
  ['alignTorque', 'aligning torque'],
];

/** What the balance takes from each axle's kinematics (`used`, and as measured under `kinematics`). */
const LINKED: readonly (readonly [string, string, Spec])[] = [
  ['rollSteerCoefficient', 'roll steer ε', { kind: 'rollSteer' }],
  ['rollCamberDegPerDeg', 'roll camber', { kind: 'rollSteer' }],
  ['rollCentreHeightMm', 'roll centre height', { kind: 'length' }],
  ['springMotionRatio', 'spring motion ratio', RATIO],
  ['barMotionRatio', 'anti-roll bar motion ratio', RATIO],
  ['barTwistRadPerM', 'anti-roll bar twist per wheel travel', { kind: 'twistPerLength' }],
  ['barLeverMm', 'anti-roll bar lever', { kind: 'length' }],
  ['mechanicalTrailMm', 'mechanical trail', { kind: 'length' }],
  ['bumpSteerDegPerM', 'bump steer at design', { kind: 'bumpSteer' }],
  ['trackMm', 'track', { kind: 'length' }],
];

const STEP: readonly (readonly [string, string, Spec])[] = [
  ['dampingRatio', 'damping ratio', RATIO],
  ['naturalFrequencyHz', 'natural frequency', { unit: 'Hz', sig: 3 }],
  ['overshootPct', 'yaw-rate overshoot', { unit: '%', sig: 3 }],
  ['peakTimeS', 'yaw-rate peak time', { unit: 's', sig: 3 }],
  ['responseTimeS', 'yaw-rate response time', { unit: 's', sig: 3 }],
  ['settlingTimeS', 'settling time', { unit: 's', sig: 3 }],
  ['steadyYawRateDegPerS', 'steady yaw rate', { unit: 'deg/s', sig: 4 }],
  ['steadyRollDeg', 'steady roll angle', { kind: 'angle' }],
  ['speedKph', 'speed', { kind: 'speed' }],
  ['steerDeg', 'road-wheel steer step', { kind: 'angle' }],
  ['durationS', 'time simulated', { unit: 's', sig: 3 }],
  ['odeSteps', 'solver steps', { unit: '', sig: 6 }],
  ['stable', 'stable', TEXT],
  ['model', 'model', TEXT],
];

function buildResultWords(): ReadonlyMap<string, ResultWords> {
  const m = new Map<string, ResultWords>();
  const add = (group: string, path: string, label: string, spec: Spec) => m.set(path, { label, group, ...spec });
  const cap = (t: string) => t[0]!.toUpperCase() + t.slice(1);

  let g = 'Balance';
  add(g, 'balance.understeerBudget.total', 'Understeer gradient K', UG);
  add(g, 'balance.linearUndersteerGradientDegPerG', 'Understeer gradient K, linear range', UG);
  add(g, 'balance.onCentreUndersteerGradientDegPerG', 'Understeer gradient K, on centre', UG);
  add(g, 'balance.characteristicSpeedKph', 'Characteristic speed', { kind: 'speed' });
  add(g, 'balance.gains.peakYawRateGainPerS', 'Peak yaw-rate gain', { unit: '1/s', sig: 3 });
  add(g, 'balance.gains.sideslipZeroSpeedKph', 'Speed of zero sideslip', { kind: 'speed' });
  add(g, 'balance.regime', 'Steady-state balance', TEXT);
  add(g, 'balance.neutralSteer', 'Neutral steer', TEXT);
  add(g, 'balance.vehicleName', 'Vehicle', TEXT);

  g = 'Understeer budget';
  add(g, 'balance.budgetLateralAccelerationG', 'Lateral acceleration of the budget', G);
  for (const [key, words] of TERMS) {
    add(g, `balance.understeerBudget.${key}`, key === 'rollSteer' ? 'Understeer-gradient change from roll steer' : `Understeer budget: ${words}`, UG);
    add(g, `balance.budgetTermLateralAccelerationG.${key}`, `Lateral acceleration of the ${words} term`, G);
  }

  g = 'Axle cornering compliance';
  for (const [axle, side] of AXLES) {
    for (const [base, words] of [['axleCompliance', ''], ['onCentreAxleCompliance', ' on centre']] as const) {
      for (const [key, term] of [...TERMS, ['alignTorqueComplianceSteer', 'aligning-torque compliance steer'], ['alignTorqueMoment', 'aligning-torque moment'], ['total', 'total']] as const) {
        add(g, `balance.${base}.${axle}.${key}`, `Cornering compliance${words}, ${side}: ${term}`, UG);
      }
    }
  }

  g = 'Roll';
  add(g, 'balance.rollGradientDegPerG', 'Roll gradient', UG);
  add(g, 'balance.rollStiffnessNmPerDeg.frontShare', 'Front share of the roll stiffness', RATIO);
  add(g, 'balance.rollGravityTerm.included', "Roll gradient includes the sprung mass's gravity term", TEXT);
  add(g, 'balance.rollGravityTerm.note', 'Gravity term', TEXT);
  add(g, 'balance.rollMomentBalance.appliedMomentNmPerG', 'Roll moment applied, per g', { kind: 'momentPerG' });
  add(g, 'balance.rollMomentBalance.gravityMomentNmPerG', 'Roll moment of gravity, per g', { kind: 'momentPerG' });
  add(g, 'balance.rollMomentBalance.loadTransferMomentNmPerG', 'Roll moment of the load transfer, per g', { kind: 'momentPerG' });
  add(g, 'balance.rollMomentBalance.relativeError', 'Roll moment balance, relative error', RATIO);
  for (const [axle, side] of AXLES) {
    add(g, `balance.rollStiffnessNmPerDeg.${axle}`, `Roll stiffness, ${side}`, { kind: 'rollStiffness' });
    add(g, `balance.suspensionRollDegPerG.${axle}`, `Suspension roll gradient, ${side}`, UG);
    add(g, `balance.rollCentreHeightMm.${axle}`, `Roll centre height, ${side}`, { kind: 'length' });
    add(g, `balance.rollStiffnessNmPerDeg.detail.${axle}.source`, `Roll stiffness, ${side}: from`, TEXT);
    for (const [key, words] of [['bar', 'anti-roll bar'], ['springs', 'springs'], ['suspension', 'suspension'], ['tyres', 'tyres'], ['total', 'total with the tyres']] as const) {
      add(g, `balance.rollStiffnessNmPerDeg.detail.${axle}.${key}NmPerDeg`, `Roll stiffness, ${side}: ${words}`, { kind: 'rollStiffness' });
    }
  }

  g = 'Lateral load transfer';
  add(g, 'balance.lateralLoadTransfer.frontShare', 'Front share of the lateral load transfer', RATIO);
  for (const [axle, side] of AXLES) {
    add(g, `balance.lateralLoadTransfer.${axle}NPerG`, `Lateral load transfer, ${side}`, { kind: 'forcePerG' });
    for (const [key, words] of [['elastic', 'elastic'], ['geometric', 'geometric'], ['unsprung', 'unsprung'], ['total', 'total']] as const) {
      add(g, `balance.lateralLoadTransfer.${axle}.${key}NPerG`, `Lateral load transfer, ${side}: ${words}`, { kind: 'forcePerG' });
    }
  }

  g = 'Mass and centre of gravity';
  add(g, 'balance.mass.massKg', 'Mass', { kind: 'mass' });
  add(g, 'balance.mass.sprungMassKg', 'Sprung mass', { kind: 'mass' });
  add(g, 'balance.mass.sprungFrontKg', 'Sprung mass on the front axle', { kind: 'mass' });
  add(g, 'balance.mass.sprungRearKg', 'Sprung mass on the rear axle', { kind: 'mass' });
  add(g, 'balance.mass.frontLoadN', 'Load on the front axle', { kind: 'force' });
  add(g, 'balance.mass.rearLoadN', 'Load on the rear axle', { kind: 'force' });
  add(g, 'balance.mass.sprungCgHeightM', 'Sprung centre of gravity, height', { kind: 'distance' });
  add(g, 'balance.mass.sprungCgToFrontM', 'Sprung centre of gravity, behind the front axle', { kind: 'distance' });
  add(g, 'balance.mass.sprungCgAboveRollAxisM', 'Sprung centre of gravity above the roll axis', { kind: 'distance' });
  add(g, 'balance.mass.rollAxisHeightAtCgM', 'Roll axis height at the centre of gravity', { kind: 'distance' });

  g = 'Kinematics used by the balance';
  for (const [axle, side] of AXLES) {
    const k = `balance.kinematicsLink.${axle}`;
    for (const [key, words, spec] of LINKED) {
      add(g, `${k}.used.${key}`, key === 'rollSteerCoefficient' ? `Roll steer ε, ${side}` : `${cap(words)}, ${side}, used`, spec);
      add(g, `${k}.kinematics.${key}`, `${cap(words)}, ${side}, from the kinematics`, spec);
      add(g, `${k}.source.${key}`, `${cap(words)}, ${side}: from`, TEXT);
    }
    add(g, `${k}.fromCorner`, `Kinematics from the ${side} axle design`, TEXT);
    add(g, `${k}.axleSteerDeg`, `Axle steer read, ${side}`, { kind: 'angle' });
    add(g, `${k}.rackMm`, `Rack position read, ${side}`, { kind: 'length' });
    for (const [key, words, spec] of [
      ['complianceSteerDegPerKN', 'compliance steer', { kind: 'anglePerForce' }],
      ['complianceCamberDegPerKN', 'compliance camber', { kind: 'anglePerForce' }],
      ['steeringStiffnessNmPerDeg', 'steering stiffness', { kind: 'rollStiffness' }],
    ] as const) {
      add(g, `${k}.compliance.used.${key}`, `${cap(words)}, ${side}, used`, spec);
      add(g, `${k}.compliance.source.${key}`, `${cap(words)}, ${side}: from`, TEXT);
    }
  }
  add(g, 'balance.kinematicsLink.cornerRadiusM', 'Corner radius the kinematics are read at', { kind: 'distance' });
  for (const [axle, side] of AXLES) add(g, `balance.tyreLoadLaw.${axle}`, `Tyre load law, ${side}`, TEXT);

  g = 'Steer curve';
  add(g, 'balance.steerCurve.linearKDegPerG', 'Understeer gradient of the steer curve, linear', UG);
  add(g, 'balance.steerCurve.kFromSlopeDegPerG', 'Understeer gradient from the steer curve slope', UG);
  add(g, 'balance.steerCurve.maxLateralAccelerationG', 'Steer curve up to', G);
  add(g, 'balance.steerCurve.radiusM', 'Steer curve radius', { kind: 'distance' });
  add(g, 'balance.steerCurve.clampedToValidity', 'Steer curve clamped to the valid range', TEXT);

  g = 'Step steer';
  for (const [key, words, spec] of STEP) {
    add(g, `balance.stepSteer.${key}`, `Step steer: ${words}`, spec);
    add(g, `balance.stepSteer.withRoll.${key}`, `Step steer with roll: ${words}`, spec);
  }

  g = 'Model validity';
  add(g, 'balance.validity.basis', 'Validity of the model', TEXT);
  add(g, 'balance.validity.limitG', 'Valid up to', G);
  add(g, 'balance.validity.linearRangeG', 'Linear range up to', G);
  for (const [axle, side] of AXLES) {
    add(g, `balance.validity.stiffnessLimitG.${axle}`, `Roll stiffness limit, ${side}`, G);
    add(g, `balance.validity.wheelLiftG.${axle}`, `Inner wheel lift, ${side}`, G);
  }

  g = 'Bump steer and camber over the profile';
  for (const [axle, side] of AXLES) {
    const b = `bumpSteer.${axle}`;
    add(g, `${b}.bumpSteerDegPerM`, `Bump steer, ${side}`, { kind: 'bumpSteer' });
    add(g, `${b}.toeGradientAtDesignDegPerM`, `Toe gradient at design height, ${side}`, { kind: 'bumpSteer' });
    add(g, `${b}.curvatureDegPerM2`, `Toe curvature, ${side}`, { kind: 'curvature' });
    add(g, `${b}.maxDeviationDeg`, `Largest toe departure from a straight line, ${side}`, { kind: 'angle' });
    add(g, `${b}.camberGainDegPerM`, `Camber gain, ${side}`, { kind: 'camberGain' });
    add(g, `${b}.fromMm`, `Fitted travel from, ${side}`, { kind: 'length' });
    add(g, `${b}.toMm`, `Fitted travel to, ${side}`, { kind: 'length' });
    add(g, `${b}.rackMm`, `Rack position of the fit, ${side}`, { kind: 'length' });
  }
  return m;
}

const RESULT_WORDS = buildResultWords();

/** A result path in words; a path the table does not name yet is written in words from its keys (never the raw key). */
export function resultWords(path: string): ResultWords {
  const known = RESULT_WORDS.get(path);
  if (known) return known;
  const w = pathWords(path);
  const kind = w.unit ? kindForUnit(w.unit) : null;
  return { label: w.label, group: 'Other results', ...(kind ? { kind } : { unit: w.unit ?? '', sig: 4 }) };
}

/** An input path (vehicle, corner, track profile) in words, grouped by the document it belongs to. */
export function inputWords(path: string): ResultWords {
  const w = pathWords(path);
  const kind = w.unit ? kindForUnit(w.unit) : null;
  const group = w.label.split(' · ')[0] ?? 'Inputs';
  return { label: w.label, group, ...(kind ? { kind } : { unit: w.unit ?? '', sig: 6 }) };
}

