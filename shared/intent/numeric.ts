/**
 * One-dimensional numerics of the back-solver: a safeguarded secant root
 * finder (the roll steer coefficient is very nearly linear in small height
 * changes, so it converges in two or three steps) and Brent's minimiser
 * (golden section with parabolic steps; Brent, "Algorithms for Minimization
 * without Derivatives", 1973, ch. 5, from memory and re-derived).
 */
import { polyFit } from '../kinematics/index.js';

export interface RootResult {
  x: number;
  fx: number;
  /** false when no root lies in [lo, hi]; x is then the end with the smaller |f|. */
  found: boolean;
  evaluations: number;
}

/**
 * Root of f in [lo, hi], starting from x0 with an estimated slope. Secant
 * steps, clamped to the interval; once the root is bracketed, a step that
 * leaves the bracket falls back to bisection. When a step is pushed against a
 * bound whose f has the same sign, there is no root inside: `found` is false.
 */
export function secantRoot(f: (x: number) => number, x0: number, slope: number, lo: number, hi: number, tolF: number, maxIter = 40): RootResult {
  let evaluations = 0;
  const ev = (x: number) => {
    evaluations++;
    return f(x);
  };
  const clamp = (x: number) => Math.min(hi, Math.max(lo, x));
  let x = clamp(x0);
  let fx = ev(x);
  let m = slope !== 0 && Number.isFinite(slope) ? slope : 1e-6;
  // Bracket: xNeg has f < 0, xPos has f > 0 (NaN until seen).
  let xNeg = fx < 0 ? x : NaN;
  let xPos = fx > 0 ? x : NaN;
  let best = { x, fx };
  for (let i = 0; i < maxIter && Math.abs(fx) > tolF; i++) {
    let xn = clamp(x - fx / m);
    const bracketed = !Number.isNaN(xNeg) && !Number.isNaN(xPos);
    if (bracketed && !(xn > Math.min(xNeg, xPos) && xn < Math.max(xNeg, xPos))) xn = 0.5 * (xNeg + xPos);
    if (xn === x) break; // pushed against a bound: no root on this side
    const fn = ev(xn);
    if (fn < 0) xNeg = xn;
    else if (fn > 0) xPos = xn;
    const dm = (fn - fx) / (xn - x);
    if (Number.isFinite(dm) && dm !== 0) m = dm;
    x = xn;
    fx = fn;
    if (Math.abs(fx) < Math.abs(best.fx)) best = { x, fx };
    if (bracketed && Math.abs(xPos - xNeg) < 1e-10) break;
  }
  if (Math.abs(best.fx) > tolF && (best.x === lo || best.x === hi)) {
    // Stopped on a bound: a root may still lie across the interval (a wrong-signed slope estimate). Check the other end.
    const other = best.x === lo ? hi : lo;
    const fo = ev(other);
    if (fo * best.fx < 0) {
      const r = illinois(ev, best.x, best.fx, other, fo, tolF, maxIter);
      if (Math.abs(r.fx) < Math.abs(best.fx)) best = r;
    } else if (Math.abs(fo) < Math.abs(best.fx)) best = { x: other, fx: fo };
  }
  return { x: best.x, fx: best.fx, found: Math.abs(best.fx) <= tolF, evaluations };
}

/** Root in a bracket [a, b] with f(a)·f(b) < 0 by the Illinois variant of regula falsi (common practice). */
function illinois(f: (x: number) => number, a: number, fa: number, b: number, fb: number, tolF: number, maxIter: number): { x: number; fx: number } {
  let side = 0;
  let x = a;
  let fx = fa;
  for (let i = 0; i < maxIter; i++) {
    x = (a * fb - b * fa) / (fb - fa);
    fx = f(x);
    if (Math.abs(fx) <= tolF) break;
    if (fx * fb > 0) {
      b = x;
      fb = fx;
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      a = x;
      fa = fx;
      if (side === 1) fb /= 2;
      side = 1;
    }
  }
  return { x, fx };
}

export interface MinResult {
  x: number;
  fx: number;
  evaluations: number;
}

/** Brent's minimiser of f on [a, b] (f unimodal there), to absolute x tolerance `tol`. */
export function brentMinimise(f: (x: number) => number, a: number, b: number, tol: number, maxIter = 60, start?: { x: number; fx: number }): MinResult {
  const golden = 0.381966011250105;
  let evaluations = 0;
  const ev = (x: number) => {
    evaluations++;
    return f(x);
  };
  let x: number;
  let fx: number;
  if (start && start.x > a && start.x < b) {
    x = start.x;
    fx = start.fx;
  } else {
    x = a + golden * (b - a);
    fx = ev(x);
  }
  let w = x;
  let v = x;
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  for (let iter = 0; iter < maxIter; iter++) {
    const xm = 0.5 * (a + b);
    const tol1 = tol + 1e-10 * Math.abs(x);
    const tol2 = 2 * tol1;
    if (Math.abs(x - xm) <= tol2 - 0.5 * (b - a)) break;
    let useGolden = true;
    if (Math.abs(e) > tol1) {
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      q = Math.abs(q);
      const etemp = e;
      e = d;
      if (!(Math.abs(p) >= Math.abs(0.5 * q * etemp) || p <= q * (a - x) || p >= q * (b - x))) {
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = xm >= x ? tol1 : -tol1;
        useGolden = false;
      }
    }
    if (useGolden) {
      e = x >= xm ? a - x : b - x;
      d = golden * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d >= 0 ? tol1 : -tol1);
    const fu = ev(u);
    if (fu <= fx) {
      if (u >= x) a = x;
      else b = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, fx, evaluations };
}

/** Least-squares line through (x, y) (the kinematics engine's fit) and the RMS and largest |deviation| from it. */
export function linearFitDeviation(xs: ArrayLike<number>, ys: ArrayLike<number>): { slope: number; intercept: number; rms: number; max: number } {
  const [intercept, slope] = polyFit(xs, ys, false);
  const n = xs.length;
  let ss = 0;
  let max = 0;
  for (let i = 0; i < n; i++) {
    const r = ys[i]! - (intercept + slope * xs[i]!);
    ss += r * r;
    max = Math.max(max, Math.abs(r));
  }
  return { slope, intercept, rms: Math.sqrt(ss / n), max };
}
