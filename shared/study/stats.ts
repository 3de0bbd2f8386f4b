/**
 * Statistics of a study's samples: percentiles, histograms, breach
 * probabilities with Wilson score intervals, linear least squares (the
 * tornado's standardized regression coefficients and the sweep's quadratic
 * response surfaces), the Latin-hypercube strata and the Pareto front.
 * Linear algebra through mathjs (lusolve).
 */
import { lup, lusolve } from 'mathjs';

export interface Summary {
  n: number;
  mean: number;
  sd: number;
  min: number;
  max: number;
  p5: number;
  p50: number;
  p95: number;
}

/** Percentile of sorted values, linear between order statistics (Hyndman & Fan type 7, the spreadsheet default; from memory). */
export function percentile(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

export function summarise(sorted: Float64Array): Summary {
  const n = sorted.length;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += sorted[i]!;
  const mean = sum / n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (sorted[i]! - mean) ** 2;
  return {
    n,
    mean,
    sd: n > 1 ? Math.sqrt(ss / (n - 1)) : 0,
    min: sorted[0]!,
    max: sorted[n - 1]!,
    p5: percentile(sorted, 0.05),
    p50: percentile(sorted, 0.5),
    p95: percentile(sorted, 0.95),
  };
}

export interface Histogram {
  /** Left edge of the first bin and the bin width (0 when every value is equal: one bin). */
  from: number;
  width: number;
  counts: number[];
}

/** Equal-width bins from the smallest to the largest value (the largest falls in the last bin). */
export function histogram(sorted: Float64Array, bins = 30): Histogram {
  const n = sorted.length;
  const lo = sorted[0]!;
  const hi = sorted[n - 1]!;
  if (!(hi > lo)) return { from: lo, width: 0, counts: [n] };
  const width = (hi - lo) / bins;
  const counts = new Array<number>(bins).fill(0);
  for (let i = 0; i < n; i++) counts[Math.min(bins - 1, Math.floor((sorted[i]! - lo) / width))]!++;
  return { from: lo, width, counts };
}

/** Wilson score interval of a proportion k/n at z (1.96: 95 %) (Wilson 1927, from memory). */
export function wilson(k: number, n: number, z = 1.96): [number, number] {
  if (n === 0) return [0, 1];
  const p = k / n;
  const z2 = z * z;
  const d = 1 + z2 / n;
  const c = (p + z2 / (2 * n)) / d;
  const h = (z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n))) / d;
  return [Math.max(0, c - h), Math.min(1, c + h)];
}

/** Solves the symmetric system A·x = b (A row-major p×p); null when singular. */
export function solveSymmetric(A: Float64Array, b: Float64Array[], p: number): Float64Array[] | null {
  const M: number[][] = [];
  for (let i = 0; i < p; i++) M.push(Array.from(A.subarray(i * p, i * p + p)));
  try {
    // One LU decomposition (with partial pivoting) for every right-hand side.
    const d = lup(M);
    return b.map((rhs) => {
      const r = lusolve(d, Array.from(rhs).map((v) => [v]));
      const x = (Array.isArray(r) ? r : r.valueOf()) as number[][];
      const out = Float64Array.from(x.map((r) => r[0]!));
      if (!out.every(Number.isFinite)) throw new Error('singular');
      return out;
    });
  } catch {
    return null;
  }
}

export interface LinearFit {
  /** Coefficients of the centred regressors. */
  coefficients: Float64Array;
  /** Share of the output's variance the fit explains. */
  r2: number;
}

/**
 * Least squares of each y column on the regressor rows X (n × p), both
 * centred (the intercept is the means). Rows are the samples in `rows`.
 */
export function leastSquares(X: Float64Array, p: number, rows: Int32Array, ys: Float64Array[]): { fits: (LinearFit | null)[]; xMean: Float64Array; xSd: Float64Array; ySd: number[] } {
  const n = rows.length;
  const xMean = new Float64Array(p);
  for (const r of rows) for (let j = 0; j < p; j++) xMean[j]! += X[r * p + j]!;
  for (let j = 0; j < p; j++) xMean[j]! /= n;
  const A = new Float64Array(p * p);
  const xc = new Float64Array(p);
  for (const r of rows) {
    for (let j = 0; j < p; j++) xc[j] = X[r * p + j]! - xMean[j]!;
    for (let j = 0; j < p; j++) {
      const v = xc[j]!;
      if (v === 0) continue;
      const o = j * p;
      for (let k = j; k < p; k++) A[o + k]! += v * xc[k]!;
    }
  }
  for (let j = 0; j < p; j++) for (let k = 0; k < j; k++) A[j * p + k] = A[k * p + j]!;
  const xSd = new Float64Array(p);
  for (let j = 0; j < p; j++) xSd[j] = Math.sqrt(A[j * p + j]! / Math.max(1, n - 1));
  const rhs: Float64Array[] = [];
  const ySd: number[] = [];
  const syy: number[] = [];
  for (const y of ys) {
    let m = 0;
    for (const r of rows) m += y[r]!;
    m /= n;
    const b = new Float64Array(p);
    let s = 0;
    for (const r of rows) {
      const d = y[r]! - m;
      s += d * d;
      const o = r * p;
      for (let j = 0; j < p; j++) b[j]! += (X[o + j]! - xMean[j]!) * d;
    }
    rhs.push(b);
    syy.push(s);
    ySd.push(Math.sqrt(s / Math.max(1, n - 1)));
  }
  const sol = solveSymmetric(A, rhs, p);
  const fits = ys.map((_, i) => {
    if (!sol || !(syy[i]! > 0)) return null;
    const c = sol[i]!;
    let explained = 0;
    for (let j = 0; j < p; j++) explained += c[j]! * rhs[i]![j]!;
    return { coefficients: c, r2: Math.min(1, Math.max(0, explained / syy[i]!)) };
  });
  return { fits, xMean, xSd, ySd };
}

/**
 * Indices on the Pareto front of (gain: more is better, cost: less is
 * better): no other point has gain ≥ and cost ≤ with one strict. Equal
 * points keep the lowest index. Sorted by cost.
 */
export function paretoFront(gain: ArrayLike<number>, cost: ArrayLike<number>, indices: ArrayLike<number>): number[] {
  const list = Array.from(indices);
  list.sort((a, b) => cost[a]! - cost[b]! || gain[b]! - gain[a]! || a - b);
  const out: number[] = [];
  let best = -Infinity;
  for (const i of list) {
    if (gain[i]! > best) {
      out.push(i);
      best = gain[i]!;
    }
  }
  return out;
}
