// Pure frame geometry, free of zod so the browser's import dialog can use it
// without loading the validator; the upload's schema is in cad-frame-schema.ts.
import type { Vec3 } from '../schema/corner.js';

/** Where a CAD axis points in Rollwise's frame (x forward, y left, z up). */
export type AxisDirection = '+x' | '-x' | '+y' | '-y' | '+z' | '-z';
export const AXIS_DIRECTIONS: readonly AxisDirection[] = ['+x', '-x', '+y', '-y', '+z', '-z'];

export type LengthUnit = 'mm' | 'cm' | 'm' | 'in';
export const LENGTH_UNITS: Readonly<Record<LengthUnit, { label: string; mm: number }>> = {
  mm: { label: 'millimetre', mm: 1 },
  cm: { label: 'centimetre', mm: 10 },
  m: { label: 'metre', mm: 1000 },
  in: { label: 'inch', mm: 25.4 },
};

/**
 * How points in a CAD model's frame become Rollwise points:
 * p_rollwise = origin + A · (p_cad · unit), then mirrored y → −y when the
 * points describe the right-hand corner.
 */
export interface CadFrame {
  /** Direction in Rollwise's frame of the CAD x, y and z axes. */
  readonly axes: readonly [AxisDirection, AxisDirection, AxisDirection];
  readonly unit: LengthUnit;
  /** Position of the CAD origin in Rollwise's frame, mm. */
  readonly originMm: Vec3;
  /** Which corner the CAD points describe. */
  readonly side: 'left' | 'right';
}

export const IDENTITY_FRAME: CadFrame = { axes: ['+x', '+y', '+z'], unit: 'mm', originMm: [0, 0, 0], side: 'left' };

/** Axis conventions met in CAD models, in our own words. */
export const FRAME_PRESETS: readonly { readonly label: string; readonly axes: CadFrame['axes'] }[] = [
  { label: 'x forward, y left, z up (as Rollwise)', axes: ['+x', '+y', '+z'] },
  { label: 'x rearward, y right, z up', axes: ['-x', '-y', '+z'] },
  { label: 'x forward, y right, z down', axes: ['+x', '-y', '-z'] },
  { label: 'x rearward, y left, z down', axes: ['-x', '+y', '-z'] },
];

function unitVector(d: AxisDirection): Vec3 {
  const s = d[0] === '-' ? -1 : 1;
  const i = 'xyz'.indexOf(d[1]!);
  const v: Vec3 = [0, 0, 0];
  v[i] = s;
  return v;
}

/** Problems with a frame, in words; empty when it can be applied. */
export function frameProblems(frame: CadFrame): string[] {
  const problems: string[] = [];
  const used = frame.axes.map((a) => a[1]);
  if (new Set(used).size !== 3) {
    problems.push('Each of the CAD x, y and z axes must point along a different Rollwise axis.');
    return problems;
  }
  if (!frame.originMm.every(Number.isFinite)) problems.push('The origin offset must be three numbers in mm.');
  return problems;
}

/** True when the CAD axes as chosen form a right-handed frame (CAD frames are right-handed). */
export function isRightHanded(frame: CadFrame): boolean {
  const [a, b, c] = frame.axes.map(unitVector) as [Vec3, Vec3, Vec3];
  const det =
    a[0] * (b[1] * c[2] - b[2] * c[1]) - a[1] * (b[0] * c[2] - b[2] * c[0]) + a[2] * (b[0] * c[1] - b[1] * c[0]);
  return det > 0;
}

/** One CAD point in Rollwise's frame (mm, left corner). */
export function mapCadPoint(p: Vec3, frame: CadFrame): Vec3 {
  const k = LENGTH_UNITS[frame.unit].mm;
  const out: Vec3 = [frame.originMm[0], frame.originMm[1], frame.originMm[2]];
  frame.axes.forEach((axis, i) => {
    const u = unitVector(axis);
    const pi = p[i]!;
    out[0] += u[0] * pi * k;
    out[1] += u[1] * pi * k;
    out[2] += u[2] * pi * k;
  });
  if (frame.side === 'right') out[1] = -out[1];
  // Round away float noise from unit conversion (1e-9 mm is far below any tolerance).
  return out.map((v) => Math.round(v * 1e9) / 1e9 + 0) as Vec3;
}

export function mapCadPoints(points: ReadonlyMap<string, Vec3>, frame: CadFrame): Map<string, Vec3> {
  return new Map([...points].map(([k, p]) => [k, mapCadPoint(p, frame)]));
}
