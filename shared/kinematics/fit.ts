/** Least-squares polynomial fits used by the sweep summaries. */

/** Fits y = b0 + b1·x (+ b2·x² when `quadratic`) by least squares; returns [b0, b1, b2]. */
export function polyFit(xs: ArrayLike<number>, ys: ArrayLike<number>, quadratic: boolean): [number, number, number] {
  const n = xs.length;
  // Centre x for conditioning, then shift back.
  let mx = 0;
  for (let i = 0; i < n; i++) mx += xs[i]!;
  mx /= n;
  const k = quadratic ? 3 : 2;
  // Normal equations from the power sums Σx⁰…Σx⁴ and Σy, Σxy, Σx²y (x centred).
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let s4 = 0;
  let b0 = 0;
  let b1 = 0;
  let b2 = 0;
  for (let i = 0; i < n; i++) {
    const x = xs[i]! - mx;
    const x2 = x * x;
    const y = ys[i]!;
    s1 += x;
    s2 += x2;
    s3 += x2 * x;
    s4 += x2 * x2;
    b0 += y;
    b1 += x * y;
    b2 += x2 * y;
  }
  const M = fitM;
  const x = fitX;
  // The symmetric normal matrix [n s1 s2; s1 s2 s3; s2 s3 s4] and the right-hand side, in place.
  M[0] = n;
  M[1] = M[3] = s1;
  M[2] = M[4] = M[6] = s2;
  M[5] = M[7] = s3;
  M[8] = s4;
  x[0] = b0;
  x[1] = b1;
  x[2] = b2;
  solveSmall(M, x, k);
  const c0 = x[0];
  const c1 = x[1];
  const c2 = k === 3 ? x[2] : 0;
  // y = c0 + c1 (x − m) + c2 (x − m)²
  return [c0 - c1 * mx + c2 * mx * mx, c1 - 2 * c2 * mx, c2];
}

// Scratch of polyFit's normal equations (single-threaded; no allocation per fit).
const fitM = new Float64Array(9);
const fitX = new Float64Array(3);

/** Solves the k×k system in the top-left of M (rows of 3) for x in place (partial pivoting); M is overwritten. */
function solveSmall(M: Float64Array, x: Float64Array, k: number): void {
  for (let c = 0; c < k; c++) {
    let p = c;
    for (let r = c + 1; r < k; r++) if (Math.abs(M[3 * r + c]!) > Math.abs(M[3 * p + c]!)) p = r;
    if (p !== c) {
      for (let j = 0; j < 3; j++) {
        const t = M[3 * c + j]!;
        M[3 * c + j] = M[3 * p + j]!;
        M[3 * p + j] = t;
      }
      const t = x[c]!;
      x[c] = x[p]!;
      x[p] = t;
    }
    for (let r = c + 1; r < k; r++) {
      const f = M[3 * r + c]! / M[3 * c + c]!;
      for (let j = c; j < k; j++) M[3 * r + j]! -= f * M[3 * c + j]!;
      x[r]! -= f * x[c]!;
    }
  }
  for (let c = k - 1; c >= 0; c--) {
    let s = x[c]!;
    for (let j = c + 1; j < k; j++) s -= M[3 * c + j]! * x[j]!;
    x[c] = s / M[3 * c + c]!;
  }
}

export interface ToeFit {
  /** Linear toe-in gradient, deg/m of bump (least squares). */
  bumpSteerDegPerM: number;
  /** Second derivative of toe with travel from a quadratic fit, deg/m². */
  curvatureDegPerM2: number;
  /** Largest |toe − linear fit| over the fitted rows, deg. */
  maxDeviationDeg: number;
  /** Linear camber gradient, deg/m of bump. */
  camberGainDegPerM: number;
}

/** Fits toe and camber (deg) against travel (mm); needs at least three points. */
export function fitToeCamber(travelMm: number[], toeDeg: number[], camberDeg: number[]): ToeFit {
  const x = new Float64Array(travelMm.length);
  for (let i = 0; i < x.length; i++) x[i] = travelMm[i]! / 1000;
  const [a0, a1] = polyFit(x, toeDeg, false);
  const [, , q2] = polyFit(x, toeDeg, true);
  const [, c1] = polyFit(x, camberDeg, false);
  let dev = 0;
  for (let i = 0; i < x.length; i++) dev = Math.max(dev, Math.abs(toeDeg[i]! - (a0 + a1 * x[i]!)));
  return { bumpSteerDegPerM: a1, curvatureDegPerM2: 2 * q2, maxDeviationDeg: dev, camberGainDegPerM: c1 };
}
