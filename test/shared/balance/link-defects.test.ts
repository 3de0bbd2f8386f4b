/**
 * Issue 13 §1: the balance-chain defects, each against a hand calculation
 * written out here (not the product's own formulas), named beside it.
 */
import { eigs } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { computeBalance } from '../../../shared/balance/api.js';
import { G, KPH } from '../../../shared/balance/constants.js';
import { RAD_PER_DEG } from '../../../shared/angles.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';
import { evaluateBalance } from '../../../shared/balance/index.js';
import { modesOf, eigenvalues } from '../../../shared/balance/linear.js';
import { solveSteadyCornering } from '../../../shared/balance/steady.js';
import { bicycleModel3, stepResponse } from '../../../shared/balance/transient.js';
import { tyreLoadLaw, tyreStiffnessAt } from '../../../shared/balance/tyre.js';
import { balanceCore } from '../../../shared/balance/understeer.js';
import { PoseCounter } from '../../../shared/intent/link.js';
import { cautionInputs } from '../../../shared/cautions/measure.js';
import { resolveTrackProfile } from '../../../shared/tracks/profiles.js';
import { axleSummary, exampleCorners, solvePose } from '../../../shared/kinematics/index.js';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import { kktseBicycle, vehicle } from './fixtures.js';

const rel = (x: number, ref: number) => Math.abs(x - ref) / Math.abs(ref);

describe('1. anti-roll bar from the corner: its own twist per wheel travel, not the vehicle lever', () => {
  // A corner whose bar lever is 130 mm: the drop link runs vertically up 200 mm from the wheel centre (on the
  // upright) to the lever end, the lever is horizontal (along y) and the bar axis runs along x.
  // Hand calculation (derived): a link of fixed length passes on its axial velocity, so the lever end rises with the
  // wheel centre, 1 mm per mm of travel (the wheel centre's fore-aft and lateral drift is perpendicular to the
  // vertical link); the lever end moves at ω·r, so the twist is ω = 1/0.130 = 7.692 rad/m.
  const base = exampleCorners.roadFrontStrut;
  const wc = base.points.wheelCentre;
  const inner: Vec3 = [wc[0], wc[1], wc[2] + 200];
  const corner: Corner = {
    ...base,
    antiRollBar: { dropLinkOuter: [...wc] as Vec3, dropLinkOuterOn: 'upright', dropLinkInner: inner, barAxisPoint: [inner[0], inner[1] - 130, inner[2]], barAxisDirection: [1, 0, 0] },
  };
  const track = axleSummary(corner).trackMm;
  // The vehicle states a 200 mm lever with a drop-link ratio of 1: the figures the old link divided the corner's
  // lever-end ratio by. Solid bar 20 mm, 900 mm active length, steel 79.3 GPa (Shigley table A-5).
  const car = vehicle({
    name: 'bar test car (invented)',
    massKg: 1400,
    wheelbaseMm: 2600,
    cgToFrontAxleMm: 1040,
    cgHeightMm: 520,
    yawInertiaKgM2: 2200,
    front: {
      trackMm: track,
      rollCentreHeightMm: 80,
      tyre: { corneringStiffnessNPerDeg: 1500 },
      spring: { rateNPerMm: 30, motionRatio: 1 },
      antiRollBar: { outerDiameterMm: 20, activeLengthMm: 900, leverLengthMm: 200, linkMotionRatio: 1 },
    },
    rear: { trackMm: 1500, rollCentreHeightMm: 120, tyre: { corneringStiffnessNPerDeg: 1500 }, rollStiffnessNmPerDeg: 600 },
  });
  // Springs and roll centre are held (overrides) so that only the bar comes from the corner.
  const o = computeBalance({ vehicle: car, frontCorner: corner, overrides: { front: { springMotionRatio: 1, rollCentreHeightMm: 80 } }, sensitivity: false });

  const kTheta = (Math.PI * 0.02 ** 4 * 79.3e9) / (32 * 0.9); // π·D⁴·G/(32·l) (kktse, "Simplified lateral load transfer analysis")
  const t = track / 1000;
  const barCorner = kTheta * (1 / 0.13) ** 2 * t * t * RAD_PER_DEG; // N·m/deg with the corner's 130 mm lever
  const barVehicleLever = kTheta * (1 / 0.2) ** 2 * t * t * RAD_PER_DEG; // what dividing by the vehicle's 200 mm lever gave

  it('the corner gives 1/0.130 rad/m of bar twist per wheel travel', () => {
    expect(o.kinematicsLink.front.used.barTwistRadPerM!).toBeCloseTo(1 / 0.13, 9);
    expect(o.kinematicsLink.front.source.barTwistRadPerM).toBe('kinematics');
    expect(o.kinematicsLink.front.notes.join(' ')).toMatch(/leverLengthMm and linkMotionRatio are not/);
  });

  it('bar roll stiffness k_θ·θ_w²·t² with the corner lever, (200/130)² above the vehicle-lever figure', () => {
    expect(rel(o.rollStiffnessNmPerDeg.detail.front.barNmPerDeg, barCorner)).toBeLessThan(1e-9);
    expect(barCorner / barVehicleLever).toBeCloseTo((200 / 130) ** 2, 12);
    expect(rel(o.rollStiffnessNmPerDeg.detail.front.barNmPerDeg, barVehicleLever)).toBeGreaterThan(1);
  });

  it('roll gradient and front load-transfer share follow by hand from that bar rate', () => {
    // domain.md / Barton & Fieldhouse: φ/a_y = m_s·h₁/(ΣKφ − m_s·g·h₁); LLT_i = Kφ_i·φ/t_i + m_s,i·g·h_rc,i/t_i (kktse).
    const kf = (0.5 * 30000 * t * t + barCorner / RAD_PER_DEG); // N·m/rad: springs ½·k·MR²·t² plus bar
    const kr = 600 / RAD_PER_DEG;
    const L = 2.6;
    const a = 1.04;
    const hra = 0.08 + ((0.12 - 0.08) * a) / L;
    const h1 = 0.52 - hra;
    const phiPerG = (1400 * G * h1) / (kf + kr - 1400 * G * h1); // rad per g (rigid tyres, no unsprung mass)
    const lltF = (kf * phiPerG) / t + (1400 * ((L - a) / L) * G * 0.08) / t;
    const lltR = (kr * phiPerG) / 1.5 + (1400 * (a / L) * G * 0.12) / 1.5;
    expect(rel(o.rollGradientDegPerG, phiPerG / RAD_PER_DEG)).toBeLessThan(1e-9);
    expect(rel(o.lateralLoadTransfer.frontShare, lltF / (lltF + lltR))).toBeLessThan(1e-9);
  });

  it('an override of the twist wins and says so; a bar entered as a roll rate notes that the corner bar is not used', () => {
    const ov = computeBalance({ vehicle: car, frontCorner: corner, overrides: { front: { barTwistRadPerM: 5 } }, sensitivity: false });
    expect(ov.kinematicsLink.front.source.barTwistRadPerM).toBe('override');
    expect(rel(ov.rollStiffnessNmPerDeg.detail.front.barNmPerDeg, barVehicleLever)).toBeLessThan(1e-9);
    const rate = computeBalance({ vehicle: { ...car, front: { ...car.front, antiRollBar: { rollRateNmPerDeg: 500 } } }, frontCorner: corner, sensitivity: false });
    expect(rate.kinematicsLink.front.source.barTwistRadPerM).toBe('not-applicable');
    expect(rate.rollStiffnessNmPerDeg.detail.front.barNmPerDeg).toBeCloseTo(500, 9);
  });
});

describe('2. characteristic speed, gains and step steer use the on-centre K', () => {
  // A car with load-sensitive tyres, so K(a_y) rises with a_y (the load-transfer term).
  const v = exampleVehicles.brackenfieldB3;
  const r = evaluateBalance(v, { sensitivity: false, speedsKph: [100], speedKph: 100 });
  const core = balanceCore(v);
  // Second route to the on-centre K: the slope of the steady steer of the force and yaw balance (Newton) at
  // a_y → 0 on a large radius, by central difference (Gillespie, δ = L/R + K·a_y, re-derived).
  const R = 1000;
  const h = 1e-4;
  const k0 = (solveSteadyCornering(core, R, 2 * h).steerDeg - solveSteadyCornering(core, R, 0).steerDeg) / (2 * h);
  const L = v.wheelbaseMm / 1000;

  it('on-centre K equals the slope of the steer curve at zero lateral acceleration, and differs from K(0.4 g)', () => {
    expect(Math.abs(r.onCentreUndersteerGradientDegPerG - k0)).toBeLessThan(1e-6);
    expect(Math.abs(r.understeerBudget.total - k0)).toBeGreaterThan(0.05);
    expect(r.budgetTermLateralAccelerationG.loadTransfer).toBe(0.4);
    expect(r.budgetTermLateralAccelerationG.tyres).toBe(0);
  });

  it('V_char = √(57.3·L·g/K) and r/δ = (V/L)/(1 + K·V²/(57.3·L·g)) with that K (Gillespie, check-values.md)', () => {
    expect(k0).toBeGreaterThan(0);
    const vchar = Math.sqrt((L * G) / (k0 * RAD_PER_DEG)) / KPH;
    expect(rel(r.characteristicSpeedKph!, vchar)).toBeLessThan(1e-6);
    const V = 100 * KPH;
    const gain = V / L / (1 + (k0 * RAD_PER_DEG * V * V) / (L * G));
    expect(rel(r.gains.rows[0]!.yawRateGainPerS!, gain)).toBeLessThan(1e-6);
    // The step steer settles on the same steady gain.
    expect(rel(r.stepSteer.steadyYawRateDegPerS * RAD_PER_DEG, gain * r.stepSteer.steerDeg * RAD_PER_DEG)).toBeLessThan(1e-6);
  });
});

describe('4. aligning-torque compliance steer: mechanical plus pneumatic trail about the steering axis', () => {
  // A front corner linked in: its mechanical trail from the kinematics (pose output at design), the tyre's
  // pneumatic trail 30 mm. Moment about the steering axis M = F_f·(t_m + t_p) per g; steer = M/K_steer (from memory,
  // Gillespie; Bundorf's aligning-torque compliance steer).
  const v = exampleVehicles.brackenfieldB3;
  const corner = exampleCorners.roadFrontStrut;
  const o = computeBalance({ vehicle: v, frontCorner: corner, sensitivity: false });
  const tm = solvePose(corner, { travelMm: 0, rackMm: 0 }).mechanicalTrailMm / 1000;

  it('uses the corner trail and the tyre trail together', () => {
    expect(tm).toBeGreaterThan(0.005);
    expect(o.kinematicsLink.front.source.mechanicalTrailMm).toBe('kinematics');
    const W = v.massKg * G;
    const L = v.wheelbaseMm / 1000;
    const a = v.cgToFrontAxleMm / 1000;
    const tpf = v.front.tyre.pneumaticTrailMm! / 1000;
    const tpr = v.rear.tyre.pneumaticTrailMm! / 1000;
    // Front force per g from the yaw balance with each force a pneumatic trail behind its axle (derived).
    const ff = (W * (L - a + tpr)) / (L - tpf + tpr);
    const expected = (ff * (tm + tpf)) / v.front.steeringStiffnessNmPerDeg!;
    expect(rel(o.axleCompliance.front.alignTorqueComplianceSteer, expected)).toBeLessThan(1e-9);
  });
});

describe('5. tyre cornering stiffness at other loads: one degressive law', () => {
  // Magic Formula cornering stiffness C = p1·Fz0·sin(2·atan(Fz/(p2·Fz0))) (Pacejka, Tyre and Vehicle Dynamics,
  // from memory), scaled to the entered C0 at the static load, p2 = 2: evaluated here in its trigonometric form.
  const mf = (c0: number, fz0: number, fz: number) => (c0 * Math.sin(2 * Math.atan(fz / (2 * fz0)))) / Math.sin(2 * Math.atan(1 / 2));

  it('twice the static load gives 1.25·C0, not 2·C0; the law matches the trigonometric form at any load', () => {
    const law = tyreLoadLaw({ corneringStiffnessNPerDeg: 1500 }, 4000);
    for (const fz of [500, 2000, 4000, 6000, 8000, 12000]) expect(rel(tyreStiffnessAt(law, fz), mf(1500, 4000, fz))).toBeLessThan(1e-12);
    expect(tyreStiffnessAt(law, 8000) / 1500).toBeCloseTo(1.25, 12);
  });

  it('the bump side-force index takes the stiffness at the landing load from that law', () => {
    const v = kktseBicycle({ front: { tyre: { corneringStiffnessNPerDeg: 1200 } } });
    const profile = resolveTrackProfile('rough-road');
    const fit = { rackMm: 0, bumpSteerDegPerM: 0, curvatureDegPerM2: 0, maxDeviationDeg: 0, bumpToeChangeDeg: 0 };
    const i = cautionInputs(new PoseCounter(), { axle: 'front', vehicle: v, gradients: null }, profile, exampleCorners.roadFrontStrut, 0, [fit], []);
    const wheel = (1619 * G * (1.629 / 2.67)) / 2;
    const landing = wheel * profile.landingLoadFactor;
    expect(i.landingLoadN!).toBeCloseTo(landing, 6);
    expect(rel(i.corneringCoefficientPerDeg, mf(1200, wheel, landing) / landing)).toBeLessThan(1e-12);
    // Linear scaling would have given C0/Fz0 per unit load at any load.
    expect(rel(i.corneringCoefficientPerDeg, 1200 / wheel)).toBeGreaterThan(0.2);
    expect(i.corneringCoefficientSource).toMatch(/degressive/);
  });

  it('the balance load-transfer term uses the same law (axle slip X·A/C(A), slope by central difference)', () => {
    const v = kktseBicycle();
    const r = evaluateBalance(v, { sensitivity: false });
    const core = balanceCore(v);
    const term = (c: typeof core.front) => {
      const fz0 = c.staticLoadN / 2;
      const c0 = fz0 / (c.staticLoadN / c.corneringStiffnessNPerDeg); // per tyre, from the entered axle compliance
      const slip = (A: number) => (c.lateralForceNPerG * A) / (mf(c0, fz0, fz0 + c.loadTransferNPerG * A) + mf(c0, fz0, fz0 - c.loadTransferNPerG * A));
      const d = 1e-5;
      return (slip(0.4 + d) - slip(0.4 - d)) / (2 * d) - c.lateralForceNPerG / c.corneringStiffnessNPerDeg;
    };
    expect(Math.abs(r.understeerBudget.loadTransfer - (term(core.front) - term(core.rear)))).toBeLessThan(1e-7);
    expect(Math.abs(r.understeerBudget.loadTransfer)).toBeGreaterThan(1e-3);
    expect(r.tyreLoadLaw.front).toMatch(/degressive/);
  });
});

describe('6. modes: conjugate pairs as oscillations, real roots as time constants', () => {
  it('a yaw-roll model with real roots reports each as a time constant −1/λ, never a pair of them as a mode', () => {
    // Heavily damped roll (ζ far above 1) at low speed: all four roots real.
    const model = bicycleModel3(
      { massKg: 1500, yawInertiaKgM2: 2500, cgToFrontM: 1.1, cgToRearM: 1.5, frontCorneringStiffnessNPerRad: 80000, rearCorneringStiffnessNPerRad: 90000 },
      { sprungMassKg: 1350, sprungCgAboveRollAxisM: 0.45, rollInertiaKgM2: 500, rollDampingNmsPerRad: 60000, rollStiffnessNmPerRad: 90000, gravityTerm: true, frontRollSteer: 0, rearRollSteer: 0 },
      5,
    );
    const ev = eigenvalues(model.A);
    // Independent eigenvalues (mathjs eigs).
    const ref = (eigs(model.A).values as unknown as Array<number | { re: number; im: number }>).map((x) => (typeof x === 'number' ? { re: x, im: 0 } : x));
    expect(ref.every((x) => Math.abs(x.im) < 1e-9)).toBe(true);
    const modes = modesOf(ev);
    expect(modes).toHaveLength(4);
    for (const m of modes) {
      expect(m.kind).toBe('real');
      expect(m.naturalFrequencyHz).toBeNull();
      expect(m.dampingRatio).toBeNull();
      const match = ref.find((x) => Math.abs(x.re - m.eigenvalue.re) < 1e-6 * Math.abs(x.re))!;
      expect(m.timeConstantS!).toBeCloseTo(-1 / match.re, 9);
    }
    const s = stepResponse(model, { steerRad: RAD_PER_DEG, durationS: 1, sampleS: 0.01, historyEvery: 10 });
    expect(s.naturalFrequencyHz).toBeNull();
  });

  it('a conjugate pair gives ω_n = |λ|, ζ = −Re λ/|λ| against mathjs eigenvalues', () => {
    const A = [
      [-1, 4, 0],
      [-4, -1, 0],
      [0, 0, -7],
    ];
    const modes = modesOf(eigenvalues(A));
    expect(modes.map((m) => m.kind)).toEqual(['oscillatory', 'real']);
    expect(modes[0]!.naturalFrequencyHz! * 2 * Math.PI).toBeCloseTo(Math.hypot(1, 4), 9);
    expect(modes[0]!.dampingRatio!).toBeCloseTo(1 / Math.hypot(1, 4), 9);
    expect(modes[1]!.timeConstantS!).toBeCloseTo(1 / 7, 9);
  });
});
