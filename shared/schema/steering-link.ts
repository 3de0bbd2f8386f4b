/**
 * Which points play the steering link on a corner and how far the steering
 * strokes: plain functions of a corner, with no validator attached, so the
 * cautions beside the editor's results (and the browser bundles that show
 * them) need not load the intent schema or zod. shared/schema/intent.ts
 * re-exports them.
 */
import type { Corner } from './corner.js';

/**
 * A movable coordinate: `<point>.<axis>` for a tie-rod (or five-link toe-link)
 * end, or `rack.z`: the rack's height change (both tie-rod inner points, and
 * the steering-box arm axis with arm steering, move together). Its bounds are
 * an offset from the current height; every other bound is an absolute
 * coordinate in mm.
 */
export const MOVABLE_COORDINATE_PATTERN = /^(?:(tieRodInner|tieRodOuter|link[1-5]Inner|link[1-5]Outer)\.([xyz])|rack\.z)$/;

/** The point that plays the tie-rod inner part: `tieRodInner`, or `link<k>Inner` of a five-link's toe link. */
export function innerName(corner: Corner): string {
  return corner.type === 'five-link' ? `link${corner.toeLink}Inner` : 'tieRodInner';
}
export function outerName(corner: Corner): string {
  return corner.type === 'five-link' ? `link${corner.toeLink}Outer` : 'tieRodOuter';
}

/** Steering stroke in mm: the rack stroke, or a steering-box arm's arc travel; null when not steered. */
export function steeringStrokeMm(corner: Corner): [number, number] | null {
  const st = corner.steering;
  if (!corner.steered || !st) return null;
  return st.kind === 'rack' ? [st.rackStroke[0], st.rackStroke[1]] : armStrokeMm(corner);
}

/** Arc travel limits (mm) of a steering-box arm, from its angular stroke. */
export function armStrokeMm(corner: Corner): [number, number] | null {
  const st = corner.steering;
  if (st?.kind !== 'arm') return null;
  const p = corner.points as Record<string, [number, number, number]>;
  const tri = p[innerName(corner)]!;
  const d = st.armAxisDirection;
  const n = Math.hypot(d[0], d[1], d[2]);
  const r: [number, number, number] = [tri[0] - st.armAxisPoint[0], tri[1] - st.armAxisPoint[1], tri[2] - st.armAxisPoint[2]];
  const along = (r[0] * d[0] + r[1] * d[1] + r[2] * d[2]) / n;
  const radius = Math.sqrt(Math.max(0, r[0] ** 2 + r[1] ** 2 + r[2] ** 2 - along ** 2));
  const k = (radius * Math.PI) / 180;
  return [st.angularStrokeDeg[0] * k, st.angularStrokeDeg[1] * k];
}
