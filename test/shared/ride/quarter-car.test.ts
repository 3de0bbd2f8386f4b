/**
 * The quarter car against closed forms and against a time-domain run on a
 * synthesised ISO 8608 road (docs/ride.md §2).
 */
import { describe, expect, it } from 'vitest';
import { classGd0M3, quarterCarOf, quarterCarRate, quarterCarSpectra, roadSpectrum, simulateQuarterCar, synthesiseProfile, velocityPsd, type QuarterCar, type RoadSpectrum } from '../../../shared/ride/index.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';
import { vehicleSchema } from '../../../shared/schema/vehicle.js';

/**
 * Closed-form variances of the linear two-mass quarter car under a road whose
 * vertical velocity is white noise of one-sided PSD Gv ((m/s)²/Hz), from the
 * table integral I4 of a fourth-order rational spectrum (Newton, Gould &
 * Kaiser's table, from memory, re-derived), with M = m_s + m_u:
 *   σ²(travel)     = Gv·M/(4c)
 *   σ²(body acc.)  = Gv·(k_t·c² + M·k²)/(4c·m_s²)
 *   σ²(tyre load)  = Gv·(m_u·m_s²·k_t² + M²·k_t·c² − 2·M·k·k_t·m_s·m_u + M³·k²)/(4c·m_s²)
 * (the travel and body-acceleration forms are the ones published by Gobbi &
 * Mastinu, J. Sound Vib. 2001, from memory).
 */
function closedForm(q: QuarterCar, gv: number) {
  const { sprungMassKg: ms, unsprungMassKg: mu, wheelRateNPerM: k, damperNsPerM: c, tyreRateNPerM: kt } = q;
  const M = ms + mu;
  return {
    travel: Math.sqrt((gv * M) / (4 * c)),
    acc: Math.sqrt((gv * (kt * c * c + M * k * k)) / (4 * c * ms * ms)),
    load: Math.sqrt((gv * (mu * ms * ms * kt * kt + M * M * kt * c * c - 2 * M * k * kt * ms * mu + M * M * M * k * k)) / (4 * c * ms * ms)),
  };
}

const b3 = exampleVehicles.brackenfieldB3;
const ember = exampleVehicles.tur26Ember;

describe('quarter car of an axle', () => {
  it('takes the masses, wheel rate, damper and tyre rate the issue defines', () => {
    // Issue 13: sprung (m·share − m_u)/2, unsprung m_u/2, wheel rate = spring rate × MR² (common practice).
    const { car, info } = quarterCarOf(b3, 'front');
    const share = (b3.wheelbaseMm - b3.cgToFrontAxleMm) / b3.wheelbaseMm;
    expect(car.sprungMassKg).toBeCloseTo((b3.massKg * share - 88) / 2, 12);
    expect(car.unsprungMassKg).toBe(44);
    expect(car.wheelRateNPerM).toBeCloseTo(28 * 0.95 * 0.95 * 1000, 9);
    expect(car.damperNsPerM).toBe(1800);
    expect(car.tyreRateNPerM).toBe(220000);
    expect(info.damperSource).toBe('vehicle');
  });

  it('names the missing field the ride model needs', () => {
    const v = vehicleSchema.parse({ ...structuredClone(b3), front: { ...structuredClone(b3.front), tyre: { loadSensitivity: { a: 0.38, b: 0.000025 } } } });
    expect(() => quarterCarOf(v, 'front')).toThrow(/vehicle\.front\.tyre\.verticalRateNPerMm/);
    const noDamper = vehicleSchema.parse({ ...structuredClone(b3), rear: { ...structuredClone(b3.rear), damper: undefined } });
    const d = quarterCarOf(noDamper, 'rear');
    // Default: body damping ratio 0.3 (common practice for passenger cars, 0.2–0.4, from memory).
    expect(d.info.damperSource).toBe('default');
    expect(d.info.bodyDampingRatio).toBeCloseTo(0.3, 12);
  });

  for (const [name, v, axle] of [
    ['hatchback front', b3, 'front'],
    ['Formula-Student rear', ember, 'rear'],
  ] as const) {
    it(`matches the closed-form RMS under white-noise road velocity (${name})`, () => {
      const { car } = quarterCarOf(v, axle);
      // A band wide enough that the tails beyond it hold less than 1e-5 of each variance.
      const road: RoadSpectrum = { roadClass: 'C', gd0M3: classGd0M3('C'), speedMps: 20, fromHz: 1e-4, toHz: 1e6 };
      const fd = quarterCarSpectra(car, road, 8192);
      const cf = closedForm(car, velocityPsd(road));
      expect(fd.travelRmsM / cf.travel).toBeCloseTo(1, 4);
      expect(fd.bodyAccelerationRmsMS2 / cf.acc).toBeCloseTo(1, 4);
      expect(fd.tyreLoadRmsN / cf.load).toBeCloseTo(1, 4);
    });
  }

  it('gives the same RMS with the production band and 512 intervals as with a fine grid (quadrature converged)', () => {
    const { car } = quarterCarOf(ember, 'front');
    const road = roadSpectrum('B', 80 / 3.6);
    const a = quarterCarSpectra(car, road);
    const b = quarterCarSpectra(car, road, 16384);
    expect(a.travelRmsM / b.travelRmsM).toBeCloseTo(1, 6);
    expect(a.tyreLoadRmsN / b.tyreLoadRmsN).toBeCloseTo(1, 6);
  });

  it('agrees with a time-domain run over a synthesised ISO 8608 road (sum of sinusoids, random phases)', () => {
    const { car } = quarterCarOf(b3, 'front');
    const V = 20;
    const road = roadSpectrum('C', V);
    const fd = quarterCarSpectra(car, road);
    let seed = 20261203;
    const random = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    const count = 600;
    const profile = synthesiseProfile(road.gd0M3, count, random);
    // RK4 at 0.5 ms; 4 s to forget the start (body mode decays as e^(−ζωt), ζω ≈ 2.4 1/s), then one period of the profile.
    const dt = 5e-4;
    const settle = 4;
    const period = profile.periodM / V;
    const n = Math.round((settle + period) / dt);
    const y = new Float64Array(4);
    const k1 = new Float64Array(4);
    const k2 = new Float64Array(4);
    const k3 = new Float64Array(4);
    const k4 = new Float64Array(4);
    const tmp = new Float64Array(4);
    let s2 = 0;
    let a2 = 0;
    let f2 = 0;
    let samples = 0;
    let zNext = profile.heightM(0);
    for (let i = 0; i < n; i++) {
      const t = i * dt;
      const z0 = zNext;
      const zm = profile.heightM(V * (t + dt / 2));
      zNext = profile.heightM(V * (t + dt));
      quarterCarRate(car, y, 0, z0, k1, 0);
      if (t >= settle) {
        const s = y[2]! - y[0]!;
        s2 += s * s;
        a2 += k1[1]! * k1[1]!;
        f2 += (car.tyreRateNPerM * (z0 - y[2]!)) ** 2;
        samples++;
      }
      for (let j = 0; j < 4; j++) tmp[j] = y[j]! + (dt / 2) * k1[j]!;
      quarterCarRate(car, tmp, 0, zm, k2, 0);
      for (let j = 0; j < 4; j++) tmp[j] = y[j]! + (dt / 2) * k2[j]!;
      quarterCarRate(car, tmp, 0, zm, k3, 0);
      for (let j = 0; j < 4; j++) tmp[j] = y[j]! + dt * k3[j]!;
      quarterCarRate(car, tmp, 0, zNext, k4, 0);
      for (let j = 0; j < 4; j++) y[j] = y[j]! + (dt / 6) * (k1[j]! + 2 * k2[j]! + 2 * k3[j]! + k4[j]!);
    }
    const td = { travel: Math.sqrt(s2 / samples), acc: Math.sqrt(a2 / samples), load: Math.sqrt(f2 / samples) };
    // Over one period the run's mean squares are the line sums Σ|H(f_k)|²·Gd(n_k)·Δn exactly (up to RK4 and the
    // decayed start); 600 lines 0.094 Hz apart at 20 m/s are a midpoint rule of a spectrum whose narrowest
    // peak (body mode) is about 0.8 Hz wide, so the sums lie within a few tenths of a per cent of the integral.
    expect(Math.abs(td.travel / fd.travelRmsM - 1)).toBeLessThan(0.005);
    expect(Math.abs(td.acc / fd.bodyAccelerationRmsMS2 - 1)).toBeLessThan(0.005);
    expect(Math.abs(td.load / fd.tyreLoadRmsN - 1)).toBeLessThan(0.005);
  });

  it('lands a soft spring on a stiff tyre as the undamped single-mass drop, x = v0·√(m/k)', () => {
    // Energy balance of a mass m dropping with v0 onto a spring k: x_max = v0·√(m/k) (common practice).
    // A very light wheel on a very stiff tyre with a negligible damper approaches it; the tyre's own
    // deflection takes the share k/(k + k_t) of the total. The wheel rings on the tyre at ω_hop with an
    // amplitude of about v0/ω_hop (0.11 mm here, 0.06 % of the peak), undamped.
    const car: QuarterCar = { sprungMassKg: 300, unsprungMassKg: 0.01, wheelRateNPerM: 30000, damperNsPerM: 1e-6, tyreRateNPerM: 3e6 };
    const h = simulateQuarterCar(car, { kind: 'landing', dropHeightMm: 200 }, 10, 3000);
    const v0 = Math.sqrt(2 * 9.80665 * 0.2);
    const kr = (car.wheelRateNPerM * car.tyreRateNPerM) / (car.wheelRateNPerM + car.tyreRateNPerM);
    const bodyPeak = v0 * Math.sqrt(car.sprungMassKg / kr);
    const travelPeak = (bodyPeak * kr) / car.wheelRateNPerM;
    let peak = 0;
    for (const s of h.travelMm) peak = Math.max(peak, s);
    // The ringing (0.06 %) and the wheel's mass (0.003 % of the body's) leave less than 0.1 %.
    expect(Math.abs(peak / 1000 / travelPeak - 1)).toBeLessThan(0.001);
  });
});
