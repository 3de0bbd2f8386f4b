/** ISO 8608 road input (ISO 8608:2016, as quoted in shared/docs/check-values.md). */
import { describe, expect, it } from 'vitest';
import { classGd0M3, ISO8608_BAND, ISO8608_N0, ROAD_CLASSES, roadSpectrum, spatialPsd, synthesiseProfile, temporalPsd, velocityPsd } from '../../../shared/ride/index.js';

describe('ISO 8608 road classes', () => {
  it('gives the geometric-mean Gd(n0) of every class, A 16 … H 262 144 × 10⁻⁶ m³', () => {
    // ISO 8608:2016 table (check-values.md): A 16, B 64, C 256, D 1024, E 4096, F 16 384, G 65 536, H 262 144 (10⁻⁶ m³).
    const published = [16, 64, 256, 1024, 4096, 16384, 65536, 262144];
    ROAD_CLASSES.forEach((c, i) => expect(classGd0M3(c) / 1e-6).toBeCloseTo(published[i]!, 9));
  });

  it('uses n0 = 0.1 cycles/m, waviness 2 and the band 0.011–2.83 cycles/m', () => {
    // ISO 8608:2016: Gd(n) = Gd(n0)·(n/n0)^−2, n0 = 0.1 cycles/m, band 0.011 ≤ n ≤ 2.83 cycles/m.
    expect(ISO8608_N0).toBe(0.1);
    expect(ISO8608_BAND).toEqual([0.011, 2.83]);
    const gd0 = classGd0M3('C');
    expect(spatialPsd(gd0, 0.1)).toBeCloseTo(gd0, 15);
    expect(spatialPsd(gd0, 1) / gd0).toBeCloseTo(0.01, 12);
    expect(spatialPsd(gd0, 0.05) / gd0).toBeCloseTo(4, 12);
  });

  it('maps the spatial PSD to time at speed V: f = V·n, G(f) = Gd(f/V)/V, zero outside the band', () => {
    // ISO 8608:2016 (check-values.md): f = V·n and G(f) = Gd(f/V)/V.
    const V = 25;
    const road = roadSpectrum('D', V);
    expect(road.fromHz).toBeCloseTo(0.011 * V, 12);
    expect(road.toHz).toBeCloseTo(2.83 * V, 12);
    for (const f of [0.5, 3, 20, 60]) expect(temporalPsd(road, f)).toBeCloseTo(spatialPsd(road.gd0M3, f / V) / V, 18);
    expect(temporalPsd(road, 0.1)).toBe(0);
    expect(temporalPsd(road, 100)).toBe(0);
    // With waviness 2 the road's vertical velocity is white: (2πf)²·G(f) = (2π·n0)²·Gd0·V at every f in the band (from memory, re-derived).
    for (const f of [0.5, 3, 20, 60]) expect((2 * Math.PI * f) ** 2 * temporalPsd(road, f)).toBeCloseTo(velocityPsd(road), 12);
  });

  it('synthesises a profile whose variance is the sum of its lines, and the lines sum to the band integral of Gd', () => {
    const gd0 = classGd0M3('B');
    let seed = 7;
    const random = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    const count = 400;
    const p = synthesiseProfile(gd0, count, random);
    // One spatial period of the line spectrum (lines at odd multiples of Δn/2) averages every cross term out.
    const dn = (2.83 - 0.011) / count;
    const period = p.periodM;
    expect(period).toBeCloseTo(1 / dn, 9);
    const steps = 40000;
    let s2 = 0;
    for (let i = 0; i < steps; i++) s2 += p.heightM((i * period) / steps) ** 2;
    let lines = 0;
    for (let k = 0; k < count; k++) lines += spatialPsd(gd0, p.lines[k]!) * dn;
    // Sum of sinusoids a_k·cos(…): mean square Σ a_k²/2 over a common period (common practice).
    expect(s2 / steps / lines).toBeCloseTo(1, 9);
    // ∫Gd dn over [n1, n2] = Gd0·n0²·(1/n1 − 1/n2) (closed form of the ISO 8608 PSD with waviness 2, from memory);
    // 20 000 lines bring the midpoint rule within 0.1 % of it.
    const fine = 20000;
    const dnf = (2.83 - 0.011) / fine;
    let sum = 0;
    for (let k = 0; k < fine; k++) sum += spatialPsd(gd0, 0.011 + (k + 0.5) * dnf) * dnf;
    expect(sum / (gd0 * 0.01 * (1 / 0.011 - 1 / 2.83))).toBeCloseTo(1, 3);
  });
});
