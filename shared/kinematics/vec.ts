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
export const mirrorY = (a: ArrayLike<number>): Vec3 => [a[0]!, -a[1]!, a[2]!];

/** Rotation of v about unit axis u by angle t (rad), Rodrigues. */
export function rotateAbout(v: ArrayLike<number>, u: ArrayLike<number>, t: number): Vec3 {
  const c = Math.cos(t);
  const s = Math.sin(t);
  const k = dot(u, v) * (1 - c);
  const x = cross(u, v);
  return [v[0]! * c + x[0] * s + u[0]! * k, v[1]! * c + x[1] * s + u[1]! * k, v[2]! * c + x[2] * s + u[2]! * k];
}

export const RAD = 180 / Math.PI;
