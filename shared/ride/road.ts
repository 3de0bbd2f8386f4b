/**
 * Road inputs of the ride model: the ISO 8608 displacement PSD by road
 * class, its temporal form at a speed, a synthesised profile for checks, and
 * the discrete events (single-wheel half-sine bump, landing). docs/ride.md.
 *
 * ISO 8608:2016 (mechanical vibration, road surface profiles):
 * Gd(n) = Gd(n0)·(n/n0)^−2, n0 = 0.1 cycles/m, classes A–H by the geometric
 * mean of Gd(n0) (A 16 × 10⁻⁶ m³, ×4 per class), spatial band
 * 0.011 ≤ n ≤ 2.83 cycles/m; at speed V, f = V·n and G(f) = Gd(f/V)/V.
 */

export const ROAD_CLASSES = ['A', 'B', 'C', 'D', 'E', 'F', 'G', 'H'] as const;
export type RoadClass = (typeof ROAD_CLASSES)[number];

/** Reference spatial frequency n0, cycles/m. */
export const ISO8608_N0 = 0.1;
/** Spatial frequency band of the standard, cycles/m. */
export const ISO8608_BAND: readonly [number, number] = [0.011, 2.83];

/** Geometric mean of Gd(n0) for a class, m³ (A 16 × 10⁻⁶ m³, each class ×4 the one before). */
export function classGd0M3(roadClass: RoadClass): number {
  return 16e-6 * Math.pow(4, ROAD_CLASSES.indexOf(roadClass));
}

/** The class in words for screens and reports. */
export const ROAD_CLASS_WORDS: Readonly<Record<RoadClass, string>> = {
  A: 'very good road (ISO 8608 class A)',
  B: 'good road (ISO 8608 class B)',
  C: 'average road (ISO 8608 class C)',
  D: 'poor road (ISO 8608 class D)',
  E: 'very poor road (ISO 8608 class E)',
  F: 'rough track (ISO 8608 class F)',
  G: 'very rough track (ISO 8608 class G)',
  H: 'extremely rough track (ISO 8608 class H)',
};

/** A road of a class at a speed: temporal displacement PSD G(f) = Gd0·n0²·V/f² inside the band, m²/Hz. */
export interface RoadSpectrum {
  roadClass: RoadClass;
  gd0M3: number;
  speedMps: number;
  /** Temporal band f = V·n, Hz. */
  fromHz: number;
  toHz: number;
}

export function roadSpectrum(roadClass: RoadClass, speedMps: number, band: readonly [number, number] = ISO8608_BAND): RoadSpectrum {
  return { roadClass, gd0M3: classGd0M3(roadClass), speedMps, fromHz: band[0] * speedMps, toHz: band[1] * speedMps };
}

/** Spatial displacement PSD Gd(n), m³. */
export function spatialPsd(gd0M3: number, n: number): number {
  const r = n / ISO8608_N0;
  return gd0M3 / (r * r);
}

/** Temporal displacement PSD G(f) = Gd(f/V)/V, m²/Hz (zero outside the band). */
export function temporalPsd(road: RoadSpectrum, fHz: number): number {
  if (fHz < road.fromHz || fHz > road.toHz) return 0;
  return spatialPsd(road.gd0M3, fHz / road.speedMps) / road.speedMps;
}

/**
 * One-sided PSD of the road's vertical velocity, (m/s)²/Hz: (2πf)²·G(f) =
 * (2π·n0)²·Gd0·V, the same at every frequency in the band (white noise).
 */
export function velocityPsd(road: RoadSpectrum): number {
  const w = 2 * Math.PI * ISO8608_N0;
  return w * w * road.gd0M3 * road.speedMps;
}

/**
 * A profile synthesised as a sum of sinusoids with the class's PSD:
 * z(x) = Σ √(2·Gd(n_k)·Δn)·cos(2π·n_k·x + θ_k), θ_k from `random` (uniform
 * in [0, 1)). The lines sit at odd multiples of Δn/2 (Δn = band/count, the
 * first near the band's start), so the profile repeats every 1/Δn metres and
 * its mean square over one period is exactly Σ Gd(n_k)·Δn.
 */
export function synthesiseProfile(gd0M3: number, count: number, random: () => number, band: readonly [number, number] = ISO8608_BAND) {
  const dn = (band[1] - band[0]) / count;
  const n = new Float64Array(count);
  const amp = new Float64Array(count);
  const phase = new Float64Array(count);
  const k0 = Math.round(band[0] / dn);
  for (let k = 0; k < count; k++) {
    n[k] = (k0 + k + 0.5) * dn;
    amp[k] = Math.sqrt(2 * spatialPsd(gd0M3, n[k]!) * dn);
    phase[k] = 2 * Math.PI * random();
  }
  return {
    /** Spatial frequencies of the lines, cycles/m, and the period of the profile, m. */
    lines: n,
    periodM: 1 / dn,
    /** Height at distance x, m. */
    heightM(x: number): number {
      let z = 0;
      for (let k = 0; k < count; k++) z += amp[k]! * Math.cos(2 * Math.PI * n[k]! * x + phase[k]!);
      return z;
    },
    /** Slope dz/dx at x. */
    slope(x: number): number {
      let d = 0;
      for (let k = 0; k < count; k++) d -= amp[k]! * 2 * Math.PI * n[k]! * Math.sin(2 * Math.PI * n[k]! * x + phase[k]!);
      return d;
    },
  };
}


