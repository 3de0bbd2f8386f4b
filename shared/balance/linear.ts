/**
 * Small dense linear algebra for the transient models (n ≤ 4): solving,
 * characteristic polynomials and their complex roots. Plain arrays, no
 * allocation beyond the results.
 */
import { SolveError } from '../errors.js';

export type Matrix = number[][];

export interface Complex {
  re: number;
  im: number;
}

/** Solves A·X = B (B a matrix of right-hand columns) by Gaussian elimination with partial pivoting. */
export function solveLinear(A: Matrix, B: Matrix): Matrix {
  const n = A.length;
  const m = B[0]!.length;
  const a = A.map((row) => row.slice());
  const b = B.map((row) => row.slice());
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i]![k]!) > Math.abs(a[p]![k]!)) p = i;
    if (Math.abs(a[p]![k]!) < 1e-300) throw new SolveError('singular_geometry', 'singular matrix in the transient model', { column: k });
    [a[k], a[p]] = [a[p]!, a[k]!];
    [b[k], b[p]] = [b[p]!, b[k]!];
    for (let i = k + 1; i < n; i++) {
      const f = a[i]![k]! / a[k]![k]!;
      if (f === 0) continue;
      for (let j = k; j < n; j++) a[i]![j]! -= f * a[k]![j]!;
      for (let j = 0; j < m; j++) b[i]![j]! -= f * b[k]![j]!;
    }
  }
  const x: Matrix = Array.from({ length: n }, () => new Array<number>(m).fill(0));
  for (let j = 0; j < m; j++) {
    for (let i = n - 1; i >= 0; i--) {
      let s = b[i]![j]!;
      for (let k = i + 1; k < n; k++) s -= a[i]![k]! * x[k]![j]!;
      x[i]![j] = s / a[i]![i]!;
    }
  }
  return x;
}

export function matVec(A: Matrix, x: ArrayLike<number>, out: number[] = new Array<number>(A.length)): number[] {
  for (let i = 0; i < A.length; i++) {
    const row = A[i]!;
    let s = 0;
    for (let j = 0; j < row.length; j++) s += row[j]! * x[j]!;
    out[i] = s;
  }
  return out;
}

/**
 * Characteristic polynomial det(sI − A) by the Faddeev–LeVerrier recursion
 * (from memory, re-derived): coefficients [1, c1, …, cn] of sⁿ + c1·sⁿ⁻¹ + … + cn.
 */
export function characteristicPolynomial(A: Matrix): number[] {
  const n = A.length;
  const coeffs = [1];
  let M: Matrix = A.map((_, i) => A.map((__, j) => (i === j ? 1 : 0)));
  for (let k = 1; k <= n; k++) {
    const AM = A.map((row) => M[0]!.map((_, j) => row.reduce((s, v, l) => s + v * M[l]![j]!, 0)));
    let trace = 0;
    for (let i = 0; i < n; i++) trace += AM[i]![i]!;
    const c = -trace / k;
    coeffs.push(c);
    M = AM.map((row, i) => row.map((v, j) => v + (i === j ? c : 0)));
  }
  return coeffs;
}

const cmul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const cdiv = (a: Complex, b: Complex): Complex => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};

/** Evaluates a real polynomial [1, c1, …] at a complex point (Horner). */
export function evalPolynomial(coeffs: number[], z: Complex): Complex {
  let v: Complex = { re: coeffs[0]!, im: 0 };
  for (let i = 1; i < coeffs.length; i++) {
    v = cmul(v, z);
    v.re += coeffs[i]!;
  }
  return v;
}

/** Roots of a monic real polynomial: closed form for degree ≤ 2, Durand–Kerner iteration beyond. */
export function polynomialRoots(coeffs: number[]): Complex[] {
  const n = coeffs.length - 1;
  if (n === 1) return [{ re: -coeffs[1]!, im: 0 }];
  if (n === 2) {
    const p = coeffs[1]!;
    const q = coeffs[2]!;
    const disc = p * p - 4 * q;
    if (disc >= 0) {
      const s = Math.sqrt(disc);
      // Numerically stable pair: the larger root first, the other from the product q.
      const r1 = p >= 0 ? (-p - s) / 2 : (-p + s) / 2;
      const r2 = r1 !== 0 ? q / r1 : (p >= 0 ? (-p + s) / 2 : (-p - s) / 2);
      return [{ re: r1, im: 0 }, { re: r2, im: 0 }].sort((a, b) => a.re - b.re);
    }
    const im = Math.sqrt(-disc) / 2;
    return [{ re: -p / 2, im: -im }, { re: -p / 2, im }];
  }
  // Durand–Kerner from points on a circle of the Cauchy bound's radius.
  const radius = 1 + Math.max(...coeffs.slice(1).map(Math.abs));
  let z: Complex[] = Array.from({ length: n }, (_, k) => ({ re: radius * Math.cos((2 * Math.PI * k) / n + 0.4), im: radius * Math.sin((2 * Math.PI * k) / n + 0.4) }));
  for (let iter = 0; iter < 500; iter++) {
    let change = 0;
    const next = z.map((zi, i) => {
      let den: Complex = { re: 1, im: 0 };
      z.forEach((zj, j) => {
        if (j !== i) den = cmul(den, { re: zi.re - zj.re, im: zi.im - zj.im });
      });
      const step = cdiv(evalPolynomial(coeffs, zi), den);
      change = Math.max(change, Math.hypot(step.re, step.im) / Math.max(1, Math.hypot(zi.re, zi.im)));
      return { re: zi.re - step.re, im: zi.im - step.im };
    });
    z = next;
    if (change < 1e-15) break;
  }
  // Conjugate pairs come out with round-off: clean tiny imaginary parts.
  return z
    .map((r) => (Math.abs(r.im) < 1e-10 * Math.max(1, Math.abs(r.re)) ? { re: r.re, im: 0 } : r))
    .sort((a, b) => a.re - b.re || a.im - b.im);
}

export function eigenvalues(A: Matrix): Complex[] {
  return polynomialRoots(characteristicPolynomial(A));
}

export interface Mode {
  eigenvalue: Complex;
  /** 'oscillatory': a complex-conjugate pair (the root with Im λ > 0 stands for both); 'real': one real root, a first-order mode. */
  kind: 'oscillatory' | 'real';
  /** Undamped natural frequency |λ|/2π of a conjugate pair, Hz (null for a real root). */
  naturalFrequencyHz: number | null;
  /** Damping ratio −Re λ/|λ| of a conjugate pair (null for a real root). */
  dampingRatio: number | null;
  /** Time constant −1/λ of a real root, s (negative: a growing mode; null for a pair). */
  timeConstantS: number | null;
  oscillatory: boolean;
}

/**
 * Modes of a real matrix's eigenvalues. The roots of a real characteristic
 * polynomial come as complex-conjugate pairs and real roots: each pair (λ and
 * its conjugate, matched by conjugacy) is one oscillatory mode with
 * ω_n = |λ|, ζ = −Re λ/|λ|; each real root is a first-order mode of its own,
 * reported by its time constant τ = −1/λ. Real roots are never paired with
 * one another: two of them need not belong to one second-order motion (in
 * the yaw-roll model one may be the roll's, the other the yaw's), so a
 * frequency and damping made from them would describe nothing (common
 * practice). Oscillatory modes first, by frequency; then real roots, slowest
 * first.
 */
export function modesOf(eigs: Complex[]): Mode[] {
  const pairs: Mode[] = [];
  const reals: Mode[] = [];
  // The roots of a real polynomial: each root with Im λ > 0 stands for itself and its conjugate (Im λ < 0, skipped).
  for (const e of eigs.filter((x) => x.im > 0)) {
    const w = Math.hypot(e.re, e.im);
    pairs.push({ eigenvalue: e, kind: 'oscillatory', naturalFrequencyHz: w / (2 * Math.PI), dampingRatio: -e.re / w, timeConstantS: null, oscillatory: true });
  }
  for (const e of eigs) {
    if (e.im !== 0) continue;
    reals.push({ eigenvalue: e, kind: 'real', naturalFrequencyHz: null, dampingRatio: null, timeConstantS: e.re !== 0 ? -1 / e.re : null, oscillatory: false });
  }
  pairs.sort((x, y) => x.naturalFrequencyHz! - y.naturalFrequencyHz!);
  reals.sort((x, y) => Math.abs(x.eigenvalue.re) - Math.abs(y.eigenvalue.re));
  return [...pairs, ...reals];
}
