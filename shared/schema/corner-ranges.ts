/**
 * Plausible-range rules of a corner that no single number shows (issue 12
 * §6): a kingpin 4.9 m long or a hardpoint 30 m from its wheel is refused
 * (`cornerRangeIssues`, run by the corner schema with the other geometry
 * rules), and `cornerUnusualValues` lists what is possible but unusual,
 * for the screens to show beside the field without refusing. The ranges
 * are in shared/schema/ranges.ts and docs/inputs.md.
 */
import type { FieldIssue } from '../errors.js';
import { CORNER_RANGES, impossibleValue, unusualValue, type InputRange } from './ranges.js';

type Vec = readonly [number, number, number];

/** The shape the rules read (a corner that passed its shape schema). */
interface CornerShape {
  type: string;
  wheel: { radius: number };
  points: Record<string, Vec>;
  steering?: { kind: 'rack'; rackStroke: readonly [number, number] } | { kind: 'arm'; armAxisPoint: Vec; angularStrokeDeg: readonly [number, number] } | undefined;
  spring?: Record<string, unknown> | undefined;
  antiRollBar?: Record<string, unknown> | undefined;
}

const dist = (a: Vec, b: Vec) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
const isVec = (v: unknown): v is Vec => Array.isArray(v) && v.length === 3 && v.every((x) => typeof x === 'number');
/** Keys of directions (where they point counts, not where they are). */
const DIRECTIONS = new Set(['rackAxis', 'armAxisDirection', 'rockerAxis', 'barAxisDirection']);

/** Every position in the corner with its path: the points, then spring, bar and steering-arm positions. */
export function cornerPositions(corner: CornerShape): Array<[string, Vec]> {
  const out: Array<[string, Vec]> = Object.entries(corner.points).map(([k, v]) => [`points.${k}`, v]);
  for (const [group, obj] of [['spring', corner.spring], ['antiRollBar', corner.antiRollBar], ['steering', corner.steering]] as const) {
    for (const [k, v] of Object.entries(obj ?? {})) if (!DIRECTIONS.has(k) && isVec(v)) out.push([`${group}.${k}`, v]);
  }
  return out;
}

function kingpinLength(corner: CornerShape): number | null {
  if (corner.type !== 'double-wishbone') return null;
  const lo = corner.points['lowerOuter'];
  const up = corner.points['upperOuter'];
  return lo && up ? dist(lo, up) : null;
}

/** Refusals: distances no real corner has. */
export function cornerRangeIssues(corner: CornerShape): FieldIssue[] {
  const issues: FieldIssue[] = [];
  const check = (path: string, range: InputRange, value: number) => {
    const why = impossibleValue(range, value);
    if (why) issues.push({ path, message: `${path}: ${why}` });
  };
  const kp = kingpinLength(corner);
  // Coincident ball joints are reported by the link rule; here only an implausibly long kingpin.
  if (kp !== null && kp > CORNER_RANGES.kingpinLengthMm.max) check('points.upperOuter', CORNER_RANGES.kingpinLengthMm, kp);
  const wc = corner.points['wheelCentre'];
  if (wc) for (const [path, p] of cornerPositions(corner)) check(path, CORNER_RANGES.pointFromWheelCentreMm, dist(p, wc));
  return issues;
}

/** Warnings: every corner number outside its typical band, by path, in the user's words. */
export function cornerUnusualValues(corner: CornerShape): FieldIssue[] {
  const out: FieldIssue[] = [];
  const warn = (path: string, range: InputRange, value: number) => {
    const why = unusualValue(range, value);
    if (why) out.push({ path, message: why });
  };
  warn('wheel.radius', CORNER_RANGES.wheelRadiusMm, corner.wheel.radius);
  const kp = kingpinLength(corner);
  if (kp !== null) warn('points.upperOuter', CORNER_RANGES.kingpinLengthMm, kp);
  const wc = corner.points['wheelCentre'];
  for (const [path, p] of cornerPositions(corner)) {
    const before = out.length;
    p.forEach((v, i) => warn(`${path}[${i}]`, CORNER_RANGES.coordinateMm, v));
    if (wc && out.length === before) warn(path, CORNER_RANGES.pointFromWheelCentreMm, dist(p, wc));
  }
  const st = corner.steering;
  if (st?.kind === 'rack') st.rackStroke.forEach((v, i) => warn(`steering.rackStroke[${i}]`, CORNER_RANGES.rackStrokeMm, v));
  if (st?.kind === 'arm') st.angularStrokeDeg.forEach((v, i) => warn(`steering.angularStrokeDeg[${i}]`, CORNER_RANGES.armStrokeDeg, v));
  return out;
}

