/**
 * Dense LU with partial pivoting for the small systems of the engines (the
 * pose solver's 5×5 Newton step, the compliance engine's 6×6 joint loads):
 * row-major n×n in a Float64Array, factored in place, pivots in an Int32Array.
 * Allocation-free (nothing is created per call), after the kernels of
 * gl-matrix and LAPACK's getrf/getrs (Golub & Van Loan, Matrix Computations,
 * §3.4, from memory).
 */

/**
 * Factors the n×n matrix A in place as P·A = L·U (A then holds L below the
 * diagonal, unit diagonal implied, and U on and above it); the row swapped in
 * at step k goes to piv[k]. Returns false (A partly factored) when a pivot is
 * not above `minPivot` in magnitude: the caller's singularity test, absolute
 * or scaled to its matrix.
 */
export function luFactor(A: Float64Array, n: number, piv: Int32Array, minPivot: number): boolean {
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(A[n * k + k]!);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(A[n * i + k]!);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    if (!(best > minPivot)) return false;
    piv[k] = p;
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t = A[n * k + j]!;
        A[n * k + j] = A[n * p + j]!;
        A[n * p + j] = t;
      }
    }
    const inv = 1 / A[n * k + k]!;
    for (let i = k + 1; i < n; i++) {
      const f = (A[n * i + k]! *= inv);
      if (f !== 0) for (let j = k + 1; j < n; j++) A[n * i + j]! -= f * A[n * k + j]!;
    }
  }
  return true;
}

/** Solves A·x = b for A factored by `luFactor`: b[off … off+n−1] is overwritten with x. */
export function luSolve(LU: Float64Array, n: number, piv: Int32Array, b: Float64Array, off = 0): void {
  // Row swaps were applied to whole rows (L included), so permute b first, then substitute.
  for (let k = 0; k < n; k++) {
    const p = piv[k]!;
    if (p !== k) {
      const t = b[off + k]!;
      b[off + k] = b[off + p]!;
      b[off + p] = t;
    }
  }
  for (let k = 0; k < n; k++) {
    const bk = b[off + k]!;
    for (let i = k + 1; i < n; i++) b[off + i]! -= LU[n * i + k]! * bk;
  }
  for (let k = n - 1; k >= 0; k--) {
    let s = b[off + k]!;
    for (let j = k + 1; j < n; j++) s -= LU[n * k + j]! * b[off + j]!;
    b[off + k] = s / LU[n * k + k]!;
  }
}

/** Solves Aᵀ·y = b for A factored by `luFactor` (P·A = L·U ⇒ Aᵀ = Uᵀ·Lᵀ·P): b[off … off+n−1] is overwritten with y. */
export function luSolveTransposed(LU: Float64Array, n: number, piv: Int32Array, b: Float64Array, off = 0): void {
  for (let k = 0; k < n; k++) {
    let s = b[off + k]!;
    for (let j = 0; j < k; j++) s -= LU[n * j + k]! * b[off + j]!;
    b[off + k] = s / LU[n * k + k]!;
  }
  for (let k = n - 1; k >= 0; k--) {
    let s = b[off + k]!;
    for (let j = k + 1; j < n; j++) s -= LU[n * j + k]! * b[off + j]!;
    b[off + k] = s;
  }
  for (let k = n - 1; k >= 0; k--) {
    const p = piv[k]!;
    if (p !== k) {
      const t = b[off + k]!;
      b[off + k] = b[off + p]!;
      b[off + p] = t;
    }
  }
}
