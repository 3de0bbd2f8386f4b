/**
 * The pose Jacobian of a corner at its design pose, built here from the
 * hardpoints alone (not the solver's code): the six unknowns are the wheel
 * centre's displacement (mm) and a small rotation of the upright (rad, as a
 * rotation vector, scaled by the wheel radius so every column is in mm); the
 * six residuals are the link lengths (double wishbone, five-link: five; strut:
 * three, plus the strut top's two distances from the strut axis) and the wheel
 * centre's height. Central differences, h = 1e-4 mm. The condition number is
 * √(λmax/λmin) of JᵀJ (mathjs eigs), i.e. the ratio of the extreme singular values.
 */
import { eigs } from 'mathjs';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';

type V = [number, number, number];
const sub = (a: readonly number[], b: readonly number[]): V => [a[0]! - b[0]!, a[1]! - b[1]!, a[2]! - b[2]!];
const dot = (a: readonly number[], b: readonly number[]) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
const cross = (a: readonly number[], b: readonly number[]): V => [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
const norm = (a: readonly number[]) => Math.sqrt(dot(a, a));

/** Rodrigues: rotate v by the rotation vector w. */
function rotate(w: V, v: readonly number[]): V {
  const t = norm(w);
  if (t === 0) return [v[0]!, v[1]!, v[2]!];
  const k: V = [w[0] / t, w[1] / t, w[2] / t];
  const c = Math.cos(t);
  const s = Math.sin(t);
  const kv = cross(k, v);
  const kd = dot(k, v);
  return [0, 1, 2].map((i) => v[i]! * c + kv[i]! * s + k[i]! * kd * (1 - c)) as V;
}

function residuals(corner: Corner, x: readonly number[]): number[] {
  const p = corner.points as Record<string, Vec3>;
  const wc0 = p['wheelCentre']!;
  const scale = corner.wheel.radius;
  const w: V = [x[3]! / scale, x[4]! / scale, x[5]! / scale];
  const moved = (u: Vec3): V => {
    const r = rotate(w, sub(u, wc0));
    return [wc0[0] + x[0]! + r[0], wc0[1] + x[1]! + r[1], wc0[2] + x[2]! + r[2]];
  };
  const link = (inner: string, outer: string) => norm(sub(moved(p[outer]!), p[inner]!)) - norm(sub(p[outer]!, p[inner]!));
  const out: number[] = [];
  if (corner.type === 'five-link') {
    for (let i = 1; i <= 5; i++) out.push(link(`link${i}Inner`, `link${i}Outer`));
  } else {
    out.push(link('lowerFront', 'lowerOuter'), link('lowerRear', 'lowerOuter'), link('tieRodInner', 'tieRodOuter'));
    if (corner.type === 'double-wishbone') out.push(link('upperFront', 'upperOuter'), link('upperRear', 'upperOuter'));
    else {
      const top = p['strutTop']!;
      const d0 = sub(top, p['strutLower']!);
      const helper: V = Math.abs(d0[0]) < 0.9 * norm(d0) ? [1, 0, 0] : [0, 1, 0];
      const e1 = cross(d0, helper);
      const n1 = norm(e1);
      const e1u: V = [e1[0] / n1, e1[1] / n1, e1[2] / n1];
      const e2 = cross(d0, e1u);
      const n2 = norm(e2);
      const e2u: V = [e2[0] / n2, e2[1] / n2, e2[2] / n2];
      const s = moved(p['strutLower']!);
      out.push(dot(sub(top, s), rotate(w, e1u)), dot(sub(top, s), rotate(w, e2u)));
    }
  }
  out.push(x[2]!);
  return out;
}

export function designJacobian(corner: Corner): number[][] {
  const h = 1e-4;
  const J = Array.from({ length: 6 }, () => new Array<number>(6).fill(0));
  for (let j = 0; j < 6; j++) {
    const xp = new Array<number>(6).fill(0);
    const xm = new Array<number>(6).fill(0);
    xp[j] = h;
    xm[j] = -h;
    const rp = residuals(corner, xp);
    const rm = residuals(corner, xm);
    for (let i = 0; i < 6; i++) J[i]![j] = (rp[i]! - rm[i]!) / (2 * h);
  }
  return J;
}

export function conditionNumber(J: number[][]): number {
  const JtJ = J[0]!.map((_, i) => J[0]!.map((__, k) => J.reduce((s, row) => s + row[i]! * row[k]!, 0)));
  const values = (eigs(JtJ).values as unknown as number[]).map((v) => Math.abs(v));
  const max = Math.max(...values);
  const min = Math.min(...values);
  return min > 0 ? Math.sqrt(max / min) : Infinity;
}
