/**
 * The steering chain of the ride model: toe → side force (tyre lag) → yaw
 * and lateral response through the bicycle model (docs/ride.md §3–4).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluateRide, lateralGains, lateralModel, simulateLateral, ToeTable, type EventHistory } from '../../../shared/ride/index.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';
import { cornerDocumentSchema, type Corner } from '../../../shared/schema/corner.js';
import { sweepCorner } from '../../../shared/kinematics/index.js';
import { kktseBicycle } from '../balance/fixtures.js';

const RAD_PER_DEG = Math.PI / 180;
const corner = (name: string): Corner => cornerDocumentSchema.parse(JSON.parse(readFileSync(`test/fixtures/corners/${name}.json`, 'utf8')));

describe('lateral response to an axle steer disturbance', () => {
  it('reaches the published steady yaw-rate and lateral-acceleration gains at low frequency', () => {
    // kktse.github.io, "Typical cornering compliances" (check-values.md): at 100 km/h r/δ = 3.649 1/s,
    // a_y/δ = 0.1803 g/deg (derived there with g = 9.81: tolerance 0.3 %).
    const v = kktseBicycle();
    const V = 100 / 3.6;
    const m = lateralModel(v, 'front', V);
    const frontLoad = (v.massKg * 9.80665 * (v.wheelbaseMm - v.cgToFrontAxleMm)) / v.wheelbaseMm;
    const cEff = frontLoad / (6.7 * RAD_PER_DEG);
    const out = new Float64Array(3);
    lateralGains(m, cEff, 1e-6, out);
    expect(Math.abs(Math.sqrt(out[0]!) / cEff - 1)).toBeLessThan(1e-9);
    expect(Math.abs(Math.sqrt(out[1]!) / 3.649 - 1)).toBeLessThan(0.003);
    expect(Math.abs((Math.sqrt(out[2]!) / 9.81) * RAD_PER_DEG / 0.1803 - 1)).toBeLessThan(0.003);
  });

  it('lags the side force by the relaxation length: |F/Cδ| = 1/√(1 + (ωσ/V)²)', () => {
    // First-order tyre lag with relaxation length σ (Pacejka, Tyre and Vehicle Dynamics, from memory).
    const v = kktseBicycle();
    const V = 20;
    const m = lateralModel(v, 'rear', V);
    expect(m.relaxationLengthM).toBe(0.5);
    expect(m.relaxationSource).toBe('default');
    const out = new Float64Array(3);
    const w = V / m.relaxationLengthM; // ωσ/V = 1
    lateralGains(m, 1000, w, out);
    expect(Math.sqrt(out[0]!)).toBeCloseTo(1000 / Math.SQRT2, 9);
  });

  it('settles a held toe change at the steady yaw rate of the bicycle model (time domain)', () => {
    // One wheel toed by Δ: axle steer δ̄ = −Δ/2 (domain.md: δ_L = −toe_L); steady r = (r/δ)·δ̄ with the published gain 3.649 1/s at 100 km/h.
    const v = kktseBicycle();
    const V = 100 / 3.6;
    const m = lateralModel(v, 'front', V);
    const frontWheelLoad = (v.massKg * 9.80665 * (v.wheelbaseMm - v.cgToFrontAxleMm)) / v.wheelbaseMm / 2;
    const n = 8001;
    const h: EventHistory = { dtS: 5e-4, travelMm: new Float64Array(n).fill(10), tyreLoadN: new Float64Array(n).fill(frontWheelLoad), bodyAccelerationMS2: new Float64Array(n) };
    // Δtoe = +0.01 deg per mm of travel (10 deg/m), so 0.1° toe-in at 10 mm.
    const table = new ToeTable(-20, 20, Float64Array.from({ length: 41 }, (_, i) => 0.01 * (i - 20)));
    const r = simulateLateral(h, m, table, null);
    expect(r.peakToeChangeDeg).toBeCloseTo(0.1, 12);
    expect(r.peakAxleSteerDeg).toBeCloseTo(0.05, 12);
    // After 4 s of a step the 2-DOF yaw rate is within 1e-4 of its steady value (settling ≈ 1 s here, check-values.md).
    expect(Math.abs(r.finalYawRateDegPerS! / (-3.649 * 0.05) - 1)).toBeLessThan(0.003);
  });
});

describe('left/right correlation of the toe disturbance', () => {
  const ember = exampleVehicles.tur26Ember;
  const front = corner('fs-front-wishbone');
  const r = evaluateRide(ember, { axle: 'front', roadClass: 'C', speedKph: 60, corner: front, cornerRadiusM: 15, fullLock: false });
  const on = r.steering.find((s) => s.condition === 'on-centre')!;
  const op = r.steering.find((s) => s.condition === 'operating-steer')!;

  it('steers the axle by toeRms/√2 for uncorrelated tracks and not at all for in-phase tracks straight ahead', () => {
    // δ̄ = (−g·s_L + g·s_R)/2 with independent s_L, s_R of equal variance: RMS g·σ/√2; with s_L = s_R: 0 (derived, domain.md signs).
    expect(on.wheels.left.rmsDeg).toBeCloseTo(on.wheels.right.rmsDeg, 9);
    expect(on.uncorrelated.axleSteerRmsDeg / (on.toeRmsDeg / Math.SQRT2)).toBeCloseTo(1, 3);
    expect(on.inPhase.axleSteerRmsDeg).toBeLessThan(1e-9);
    expect(on.inPhase.yawRateRmsDegPerS).toBeLessThan(1e-9);
  });

  it('keeps an in-phase steer at the operating steer, where the two toe curves differ', () => {
    expect(op.cornerRadiusM).toBe(15);
    // Ackermann steer L/R (Gillespie, from memory): 1.55 m / 15 m.
    expect(op.axleSteerDeg).toBeCloseTo((1.55 / 15) / RAD_PER_DEG, 9);
    expect(Math.abs(op.wheels.left.gradientDegPerM - op.wheels.right.gradientDegPerM)).toBeGreaterThan(0.1);
    const expected = (Math.abs(op.wheels.right.equivalentGradientDegPerM - op.wheels.left.equivalentGradientDegPerM) / 2) * (r.wheelTravelRmsMm / 1000);
    expect(op.inPhase.axleSteerRmsDeg / expected).toBeCloseTo(1, 3);
  });

  it('reads the toe RMS through the kinematics: E[Δtoe²] over the Gaussian travel, curve and all', () => {
    const sigma = r.wheelTravelRmsMm;
    // Independent: the toe curve swept at 0.05σ steps over ±6σ, E[Δtoe²] by the trapezoidal rule against the normal density (common practice).
    const step = sigma / 20;
    const sw = sweepCorner(front, { travel: { from: -120 * step, to: 120 * step, step } });
    const t0 = sw.rows[120]!.toeDeg;
    let m2 = 0;
    for (const row of sw.rows) {
      const x = row.travelMm / sigma;
      const wgt = (Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI)) * (step / sigma);
      m2 += wgt * (row.toeDeg - t0) ** 2;
    }
    expect(on.toeRmsDeg / Math.sqrt(m2)).toBeCloseTo(1, 4);
    // The curvature counts: more than |bump steer| × RMS travel alone (E[(g·s + ½κs²)²] = g²σ² + ¾κ²σ⁴, from memory).
    expect(on.toeRmsDeg).toBeGreaterThan(Math.abs(on.wheels.left.gradientDegPerM) * (sigma / 1000));
  });
});
