/** Small 3-vector helpers on plain arrays (mm or unitless). Not for hot loops. */
import type { Vec3 } from '../schema/corner.js';

export const sub = (a: ArrayLike<number>, b: ArrayLike<number>): Vec3 => [a[0]! - b[0]!, a[1]! - b[1]!, a[2]! - b[2]!];
export const add = (a: ArrayLike<number>, b: ArrayLike<number>): Vec3 => [a[0]! + b[0]!, a[1]! + b[1]!, a[2]! + b[2]!];
export const scale = (a: ArrayLike<number>, s: number): Vec3 => [a[0]! * s, a[1]! * s, a[2]! * s];
export const dot = (a: ArrayLike<number>, b: ArrayLike<number>): number => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
export const cross = (a: ArrayLike<number>, b: ArrayLike<number>): Vec3 => [
  a[1]! * b[2]! - a[2]! * b[1]!,
  a[2]! * b[0]! - a[0]! * b[2]!,
  a[0]! * b[1]! - a[1]! * b[0]!,
];
export const norm = (a: ArrayLike<number>): number => Math.hypot(a[0]!, a[1]!, a[2]!);
export const unit = (a: ArrayLike<number>): Vec3 => scale(a, 1 / norm(a));

/**
 * Rodrigues rotation of the offset (p − origin) about the unit axis u by
 * angle th (rad), written to out[0..2] (still relative to origin). Scalar
 * code for per-pose use (no arrays created).
 */
export function rotateOffsetInto(out: Float64Array, u: ArrayLike<number>, p: ArrayLike<number>, origin: ArrayLike<number>, th: number): void {
  rotateOffsetCsInto(out, u, p, origin, Math.cos(th), Math.sin(th));
}

/** As rotateOffsetInto, given the angle's cosine `co` and sine `si` (no trig calls). */
export function rotateOffsetCsInto(out: Float64Array, u: ArrayLike<number>, p: ArrayLike<number>, origin: ArrayLike<number>, co: number, si: number): void {
  const ux = u[0]!;
  const uy = u[1]!;
  const uz = u[2]!;
  const qx = p[0]! - origin[0]!;
  const qy = p[1]! - origin[1]!;
  const qz = p[2]! - origin[2]!;
  const k = (ux * qx + uy * qy + uz * qz) * (1 - co);
  out[0] = qx * co + (uy * qz - uz * qy) * si + ux * k;
  out[1] = qy * co + (uz * qx - ux * qz) * si + uy * k;
  out[2] = qz * co + (ux * qy - uy * qx) * si + uz * k;
}
