import { describe, expect, it } from 'vitest';
import { G } from '../../../shared/balance/constants.js';
import { RAD_PER_DEG } from '../../../shared/angles.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';
import { evaluateBalance } from '../../../shared/balance/index.js';
import { gainsAt, sideslipZeroSpeedKph, solveSteadyCornering, speedCharacteristic } from '../../../shared/balance/steady.js';
import {
  balanceCore,
  budgetFromCompliances,
  rollSteerUndersteerDegPerG,
  suspensionRollGradients,
  understeerBudget,
  understeerGradientAt,
  understeerSensitivity,
} from '../../../shared/balance/understeer.js';
import type { Vehicle } from '../../../shared/schema/vehicle.js';
import { kktseBicycle, vehicle } from './fixtures.js';

/** |x − ref| ≤ rel·|ref| */
const within = (x: number, ref: number, rel: number) => expect(Math.abs(x - ref)).toBeLessThanOrEqual(rel * Math.abs(ref));

describe('bicycle model against the kktse measured-car fixture', () => {
  // kktse.github.io, "Typical cornering compliances" (2019-06-01); values in check-values.md were
  // derived with g = 9.81 and 57.3, we use 9.80665 and 180/π: tolerance 0.3 % (check-values.md).
  const r = evaluateBalance(kktseBicycle(), { speedKph: 100, speedsKph: [100], sensitivity: false });

  it('on-centre K = Df − Dr = 3.6 deg/g, all from the tyres term; the budget adds load transfer at its a_y', () => {
    expect(r.onCentreUndersteerGradientDegPerG).toBeCloseTo(3.6, 12);
    expect(r.understeerBudget.tyres).toBeCloseTo(3.6, 12);
    expect(r.understeerBudget.rollSteer).toBe(0);
    expect(r.understeerBudget.total).toBeCloseTo(3.6 + r.understeerBudget.loadTransfer, 12);
    expect(r.budgetTermLateralAccelerationG).toEqual({ tyres: 0, loadTransfer: 0.4, rollSteer: 0, rollCamber: 0, complianceSteer: 0, alignTorque: 0 });
  });

  it('characteristic speed 73.5 km/h and peak yaw-rate gain 3.82 1/s', () => {
    expect(r.regime).toBe('understeer');
    expect(r.criticalSpeedKph).toBeNull();
    within(r.characteristicSpeedKph!, 73.5, 0.003);
    within(r.gains.peakYawRateGainPerS!, 3.82, 0.003);
  });

  it('gains at 100 km/h: r/δ 3.649 1/s, a_y/δ 0.1803 g/deg, β/δ −0.345', () => {
    const row = r.gains.rows[0]!;
    within(row.yawRateGainPerS!, 3.649, 0.003);
    within(row.lateralAccelerationGainGPerDeg!, 0.1803, 0.003);
    within(row.sideslipGain!, -0.345, 0.003);
  });

  it('the peak of the yaw gain lies at V_char (Gillespie)', () => {
    const p = { kDegPerG: 3.6, wheelbaseM: 2.67, cgToRearM: 1.629, rearComplianceDegPerG: 3.1 };
    const vc = r.characteristicSpeedKph!;
    const at = gainsAt(p, vc).yawRateGainPerS!;
    expect(at).toBeGreaterThan(gainsAt(p, vc * 0.97).yawRateGainPerS!);
    expect(at).toBeGreaterThan(gainsAt(p, vc * 1.03).yawRateGainPerS!);
  });

  it('sideslip crosses zero at √(b·g/D_r)', () => {
    const v0 = sideslipZeroSpeedKph(1.629, 3.1)!;
    expect(Math.abs(gainsAt({ kDegPerG: 3.6, wheelbaseM: 2.67, cgToRearM: 1.629, rearComplianceDegPerG: 3.1 }, v0).sideslipGain!)).toBeLessThan(1e-12);
    expect(r.gains.sideslipZeroSpeedKph).toBeCloseTo(v0, 9);
  });
});

describe('understeer budget: Bundorf table and sign convention', () => {
  // Bundorf analysis table (Wikipedia, "Bundorf analysis", after Bundorf & Leffert, SAE 760713):
  // front 8.0 tyres, 0.2 aligning torque, 1.2 roll camber, 0.6 roll steer, 0.3 lateral-force compliance
  // steer, 0.7 aligning-torque compliance steer (total 11.0); rear 7.0, −0.2, 0, −0.4, −0.1, 0.6 (6.9);
  // K = 4.1 deg/g. We build a vehicle whose inputs give exactly these axle compliances and check that
  // the model reports each entry with its sign. The table is exact to 0.1; the construction is exact,
  // so the tolerance is round-off (1e-9).
  function bundorfCar(): Vehicle {
    const L = 2.7;
    const a = (7 / 15) * L; // W_f/W_r = 8/7 so that one trail gives +0.2 front and −0.2 rear
    const m = 1500;
    const W = m * G;
    const Wf = (W * (L - a)) / L;
    const Wr = (W * a) / L;
    const C0 = Wf / 8.0; // = Wr / 7.0
    const tp = (0.2 * C0 * L) / W; // (Fy_f − W_f)/C0 = W·tp/(L·C0)
    const fyF = (W * (L - a + tp)) / L;
    const fyR = (W * (a - tp)) / L;
    const base = vehicle({
      massKg: m,
      wheelbaseMm: L * 1000,
      cgToFrontAxleMm: a * 1000,
      cgHeightMm: 550,
      yawInertiaKgM2: 2500,
      front: { trackMm: 1550, rollCentreHeightMm: 50, rollStiffnessNmPerDeg: 900, tyre: { axleComplianceDegPerG: 8.0, pneumaticTrailMm: tp * 1000 } },
      rear: { trackMm: 1550, rollCentreHeightMm: 100, rollStiffnessNmPerDeg: 600, tyre: { axleComplianceDegPerG: 7.0, pneumaticTrailMm: tp * 1000 } },
    });
    const phi = evaluateBalance(base, { sensitivity: false }).rollGradientDegPerG; // rigid tyres: φ_s = φ
    return {
      ...base,
      front: {
        ...base.front,
        rollSteerCoefficient: 0.6 / phi,
        complianceSteerDegPerKN: (0.3 * 1000) / fyF,
        steeringStiffnessNmPerDeg: (fyF * tp) / 0.7,
        rollCamberDegPerDeg: 1,
        tyre: { ...base.front.tyre, camberStiffnessNPerDeg: (1.2 * C0) / (2 * phi) },
      },
      rear: {
        ...base.rear,
        rollSteerCoefficient: -0.4 / phi,
        complianceSteerDegPerKN: (-0.1 * 1000) / fyR,
        steeringStiffnessNmPerDeg: (fyR * tp) / 0.6,
        rollCamberDegPerDeg: 0,
        tyre: { ...base.rear.tyre, camberStiffnessNPerDeg: 25 },
      },
    };
  }

  it('reports every axle entry and K = 4.1', () => {
    // Bundorf's "tyres + load transfer" entry is entered as the static axle compliance, so the budget is read
    // on-centre (a_y = 0), where the model's own load-transfer term is zero by definition.
    const r = evaluateBalance(bundorfCar(), { sensitivity: false, lateralAccelerationG: 0 });
    const f = r.axleCompliance.front;
    const rr = r.axleCompliance.rear;
    const close = (x: number, y: number) => expect(Math.abs(x - y)).toBeLessThanOrEqual(1e-9);
    close(f.tyres, 8.0);
    close(f.alignTorqueMoment, 0.2);
    close(f.rollCamber, 1.2);
    close(f.rollSteer, 0.6);
    close(f.complianceSteer, 0.3);
    close(f.alignTorqueComplianceSteer, 0.7);
    close(f.total, 11.0);
    close(rr.tyres, 7.0);
    close(rr.alignTorqueMoment, -0.2);
    close(rr.rollCamber, 0);
    close(rr.rollSteer, -0.4);
    close(rr.complianceSteer, -0.1);
    close(rr.alignTorqueComplianceSteer, 0.6);
    close(rr.total, 6.9);
    close(r.understeerBudget.total, 4.1);
    // The rear roll-steer entry −0.4 (rear steering into the turn, ε_r < 0) ADDS understeer.
    close(r.understeerBudget.rollSteer, 1.0);
    expect(bundorfCar().rear.rollSteerCoefficient!).toBeLessThan(0);
  });

  it('budgetFromCompliances: K per term = front − rear', () => {
    const front = { tyres: 8.0, loadTransfer: 0, rollSteer: 0.6, rollCamber: 1.2, complianceSteer: 0.3, alignTorque: 0.9 };
    const rear = { tyres: 7.0, loadTransfer: 0, rollSteer: -0.4, rollCamber: 0, complianceSteer: -0.1, alignTorque: 0.4 };
    const b = budgetFromCompliances(front, rear);
    expect(b.total).toBeCloseTo(4.1, 12);
    expect(b.rollSteer).toBeCloseTo(1.0, 12);
  });
});

describe('roll steer term (domain.md: K_rs = ε_f·dφs,f/da_y − ε_r·dφs,r/da_y)', () => {
  const v = exampleVehicles.brackenfieldB3;

  it('rollSteerUndersteerDegPerG equals the budget term and uses suspension roll', () => {
    const r = evaluateBalance(v, { sensitivity: false });
    const s = suspensionRollGradients(v);
    expect(s.frontDegPerG).toBeLessThan(r.rollGradientDegPerG); // compliant tyres take part of the roll
    const k = rollSteerUndersteerDegPerG(v, { front: v.front.rollSteerCoefficient!, rear: v.rear.rollSteerCoefficient! });
    expect(k).toBeCloseTo(r.understeerBudget.rollSteer, 12);
    expect(k).toBeCloseTo(v.front.rollSteerCoefficient! * s.frontDegPerG - v.rear.rollSteerCoefficient! * s.rearDegPerG, 12);
  });

  it('with rigid tyres reduces to (ε_f − ε_r)·dφ/da_y (Gillespie, from memory)', () => {
    const rigid: Vehicle = { ...v, front: { ...v.front, tyre: { ...v.front.tyre, verticalRateNPerMm: undefined } }, rear: { ...v.rear, tyre: { ...v.rear.tyre, verticalRateNPerMm: undefined } } };
    const phi = evaluateBalance(rigid, { sensitivity: false }).rollGradientDegPerG;
    expect(rollSteerUndersteerDegPerG(rigid, { front: 0.05, rear: -0.08 })).toBeCloseTo((0.05 + 0.08) * phi, 12);
  });

  it('swapping the signs of front and rear roll steer flips the term (property)', () => {
    for (const eps of [{ front: 0.06, rear: -0.03 }, { front: -0.02, rear: 0.11 }, { front: 0.1, rear: 0.1 }]) {
      const k = rollSteerUndersteerDegPerG(v, eps);
      expect(rollSteerUndersteerDegPerG(v, { front: -eps.front, rear: -eps.rear })).toBeCloseTo(-k, 12);
    }
    // Sign convention (domain.md): positive ε at the front is roll understeer, at the rear roll oversteer.
    expect(rollSteerUndersteerDegPerG(v, { front: 0.05, rear: 0 })).toBeGreaterThan(0);
    expect(rollSteerUndersteerDegPerG(v, { front: 0, rear: 0.05 })).toBeLessThan(0);
  });
});

describe('load-sensitive tyres and the steer curve', () => {
  const v = exampleVehicles.brackenfieldB3;
  const core = balanceCore(v);

  it('load transfer with Cα = a·Fz − b·Fz² adds understeer on a front-heavy car and vanishes at 0 g', () => {
    const b = understeerBudget(core, 0.4);
    expect(b.understeerBudget.loadTransfer).toBeGreaterThan(0);
    expect(understeerBudget(core, 0).understeerBudget.loadTransfer).toBeCloseTo(0, 12);
    expect(understeerGradientAt(core, 0.4)).toBeCloseTo(b.understeerBudget.total, 12);
  });

  it('tyres term at static loads uses Cα(Fz) per tyre (check by hand)', () => {
    const W = v.massKg * G;
    const Wf = (W * (v.wheelbaseMm - v.cgToFrontAxleMm)) / v.wheelbaseMm;
    const fz = Wf / 2;
    const c = 2 * (0.38 * fz - 0.000025 * fz * fz);
    expect(understeerBudget(core).axleCompliance.front.tyres).toBeCloseTo(Wf / c, 12);
  });

  it('K read from the slope of the numerically solved steer curve equals the budget total at 0.4 g', () => {
    const r = evaluateBalance(v, { sensitivity: false });
    // Central difference with h = 1e-3 g: truncation error O(h²) far below 1e-6 relative.
    within(r.steerCurve.kFromSlopeDegPerG, r.understeerBudget.total, 1e-6);
    // The linear curve is Ackermann + K_linear·a_y.
    const row = r.steerCurve.rows[5]!;
    expect(row.linearSteerDeg).toBeCloseTo((2.56 / 40) / RAD_PER_DEG + r.linearUndersteerGradientDegPerG * row.lateralAccelerationG, 9);
    expect(row.handwheelDeg).toBeCloseTo(row.steerDeg * v.steeringRatio!, 9);
    // Linear and load-sensitive curves meet at 0 g and part with lateral acceleration.
    expect(r.steerCurve.rows[0]!.steerDeg).toBeCloseTo(r.steerCurve.rows[0]!.linearSteerDeg, 9);
    const last = r.steerCurve.rows[r.steerCurve.rows.length - 1]!;
    expect(last.steerDeg).toBeGreaterThan(last.linearSteerDeg);
  });

  it('the Newton solution satisfies δ = L/R + (α_f + s_f) − (α_r + s_r) (Gillespie, re-derived)', () => {
    const R = 60;
    const s = solveSteadyCornering(core, R, 0.5);
    const sf = core.front.steerOutDegPerG * 0.5;
    const sr = core.rear.steerOutDegPerG * 0.5;
    // This car gives tyre.loadSensitivity {a, b}: each tyre at W/2 ± ΔW, C = a·Fz − b·Fz², so the axle has C0 − 2b·ΔW².
    const slip = (c: typeof core.front, A: number) => {
      const law = c.tyreLaw;
      if (law.kind !== 'quadratic') throw new Error('fixture must give loadSensitivity');
      return ((c.lateralForceNPerG + c.camberStiffnessNPerDeg * c.inclinationDegPerG) * A) / (c.corneringStiffnessNPerDeg - 2 * law.b * (c.loadTransferNPerG * A) ** 2);
    };
    expect(s.steerDeg).toBeCloseTo((2.56 / R) / RAD_PER_DEG + slip(core.front, 0.5) + sf - slip(core.rear, 0.5) - sr, 9);
  });

  it('validity: the steer curve stops before an inner wheel lifts', () => {
    const r = evaluateBalance(v, { sensitivity: false, steerCurveMaxG: 3 });
    expect(r.steerCurve.clampedToValidity).toBe(true);
    const lift = Math.min(r.validity.wheelLiftG.front, r.validity.wheelLiftG.rear);
    expect(r.steerCurve.maxLateralAccelerationG).toBeLessThan(lift);
    // wheel lift: ΔW = W_i/2
    expect(r.validity.wheelLiftG.front * r.lateralLoadTransfer.frontNPerG).toBeCloseTo(r.mass.frontLoadN / 2, 6);
    expect(r.validity.linearRangeG).toBe(0.4);
  });
});

describe('speed characteristic', () => {
  it('neutral steer (K = 0): no characteristic speed, a flag, and yaw gain V/L at all speeds (property)', () => {
    const v = kktseBicycle({ front: { tyre: { axleComplianceDegPerG: 4.2 } }, rear: { tyre: { axleComplianceDegPerG: 4.2 } } });
    const r = evaluateBalance(v, { sensitivity: false });
    expect(r.neutralSteer).toBe(true);
    expect(r.regime).toBe('neutral');
    expect(r.characteristicSpeedKph).toBeNull();
    expect(r.criticalSpeedKph).toBeNull();
    for (const row of r.gains.rows) expect(row.yawRateGainPerS).toBeCloseTo(row.speedKph / 3.6 / 2.67, 12);
  });

  it('oversteer: critical speed √(L·g/|K|) and no steady state above it', () => {
    const v = kktseBicycle({ front: { tyre: { axleComplianceDegPerG: 3.0 } }, rear: { tyre: { axleComplianceDegPerG: 4.0 } } });
    const r = evaluateBalance(v, { sensitivity: false, speedKph: 60 });
    expect(r.regime).toBe('oversteer');
    expect(r.characteristicSpeedKph).toBeNull();
    const vcrit = Math.sqrt((2.67 * G) / (1.0 * RAD_PER_DEG)) * 3.6;
    expect(r.criticalSpeedKph).toBeCloseTo(vcrit, 9);
    const above = r.gains.rows.filter((x) => x.speedKph > vcrit);
    expect(above.length).toBeGreaterThan(0);
    for (const row of above) expect(row.stable).toBe(false);
    for (const row of r.gains.rows.filter((x) => x.speedKph < vcrit)) expect(row.stable).toBe(true);
    // Above V_crit the transient model is unstable too.
    const fast = evaluateBalance(v, { sensitivity: false, speedKph: vcrit * 1.2 });
    expect(fast.stepSteer.stable).toBe(false);
    expect(fast.stepSteer.responseTimeS).toBeNull();
  });

  it('speedCharacteristic treats |K| ≤ 1e-9 as neutral', () => {
    expect(speedCharacteristic(1e-12, 2.5).neutral).toBe(true);
    expect(speedCharacteristic(1e-3, 2.5).regime).toBe('understeer');
  });
});

describe('sensitivity ranking', () => {
  const v = exampleVehicles.tur26Ember;
  const s = understeerSensitivity(v);

  it('is ranked by the larger |ΔK| of ±10 %', () => {
    for (let i = 1; i < s.entries.length; i++) expect(s.entries[i - 1]!.maxAbsChangeDegPerG).toBeGreaterThanOrEqual(s.entries[i]!.maxAbsChangeDegPerG);
    expect(s.entries.find((e) => e.path === 'yawInertiaKgM2')!.maxAbsChangeDegPerG).toBe(0);
    expect(s.entries.find((e) => e.path === 'massKg')!.maxAbsChangeDegPerG).toBeGreaterThan(0);
  });

  it('roll steer is linear in ε: ±10 % of ε_r moves K by 10 % of its rear term', () => {
    const b = understeerBudget(balanceCore(v));
    const e = s.entries.find((x) => x.path === 'rear.rollSteerCoefficient')!;
    expect(e.maxAbsChangeDegPerG).toBeCloseTo(0.1 * Math.abs(b.axleCompliance.rear.rollSteer), 12);
    expect(e.kPlusDegPerG! - s.baseKDegPerG).toBeCloseTo(-0.1 * b.axleCompliance.rear.rollSteer, 12);
  });

  it('marks a perturbation that makes the vehicle invalid instead of failing', () => {
    const tight = { ...v, cgToFrontAxleMm: v.wheelbaseMm * 0.95 };
    const e = understeerSensitivity(tight).entries.find((x) => x.path === 'cgToFrontAxleMm')!;
    expect(e.kPlusDegPerG).toBeNull();
    expect(e.kMinusDegPerG).not.toBeNull();
  });
});
