/**
 * Compiles a validated corner into the numeric model the pose solver works
 * on: body points, upright-local points (relative to the design wheel
 * centre, design rotation = identity), link lengths, the strut line, the
 * steering input and the spring / bar mechanisms. All lengths mm.
 */
import { cornerSchema, type Corner, type Vec3 } from '../schema/corner.js';
import { cornerSemanticIssues, type Attachment } from '../schema/corner-rules.js';
import { InputError, parseOrThrow } from '../errors.js';
import { cross, dot, norm, sub, unit, scale } from './vec.js';

/** Which wheel a solve describes: the left corner as entered, or the right one solved as its mirror. */
export type Side = 'left' | 'right';

export interface ArmModel {
  /** Front pivot (body), mm. */
  pivot: Vec3;
  /** Unit pivot axis. */
  axis: Vec3;
  /** Design outer ball joint's perpendicular offset from the axis, mm. */
  r0: Vec3;
}

/** A lever turning about a body-fixed axis, driven by a link from the suspension (rocker or bar lever). */
export interface LeverModel {
  /** Suspension-side end of the driving link at design, and what it rides on. */
  linkOuter: Vec3;
  linkOuterOn: Attachment;
  linkLength: number;
  pivot: Vec3;
  axis: Vec3;
  /** Lever point (link's inner end) at design: component along the axis from pivot, and perpendicular part. */
  leverPar: Vec3;
  leverPerp: Vec3;
  /** axis × leverPerp (per-pose code turns the lever as par + cosθ·perp + sinθ·perpX). */
  leverPerpX: Vec3;
  leverRadius: number;
  /** Spring's rocker end (rocker only): parallel and perpendicular parts, and axis × perpendicular. */
  springPar?: Vec3;
  springPerp?: Vec3;
  springPerpX?: Vec3;
  springBody?: Vec3;
  /** Names for error messages. */
  what: string;
  linkField: string;
}

export interface CornerModel {
  corner: Corner;
  /** Number of distance constraints (5, or 3 for a strut). */
  nDist: number;
  bodyPts: Float64Array;
  localPts: Float64Array;
  lengths: Float64Array;
  /** One name per constraint row 0..4 (the link that cannot close). */
  linkNames: string[];
  /** Row of the steering (tie-rod / toe-link) distance constraint. */
  steerRow: number;
  strut: null | { top: Float64Array; lowerLocal: Float64Array; e1: Float64Array; e2: Float64Array };
  wc0: Vec3;
  spin0: Vec3;
  /** Design contact patch (left frame), mm. */
  cp0: Vec3;
  radius: number;
  /** Steering input: rack (vehicle-frame unit axis) or arm (axis point, unit direction, radius of the tie-rod inner point). */
  steering: { kind: 'rack'; axis: Vec3 } | { kind: 'arm'; point: Vec3; dir: Vec3; radius: number } | null;
  /** Rack-equivalent stroke [min, max] in mm (arc travel for an arm), or [0, 0] if not steered. */
  rackStroke: [number, number];
  lowerArm: ArmModel | null;
  upperArm: ArmModel | null;
  /** Upright-local positions (from the design wheel centre) of the arms' outer joints, for the arm angles. */
  lowerOuterLocal: Vec3 | null;
  upperOuterLocal: Vec3 | null;
  /** Kingpin: two upright-local points (DW: lower → upper ball joint), or body top + local lower (strut), or null (five-link: instantaneous axis). */
  kingpin: { kind: 'points'; lowerLocal: Vec3; upperLocal: Vec3 } | { kind: 'strut'; lowerLocal: Vec3; top: Vec3 } | { kind: 'instant' };
  directSpring: null | { body: Vec3; outer: Vec3; on: Attachment };
  rocker: LeverModel | null;
  bar: LeverModel | null;
}

function armModel(front: Vec3, rear: Vec3, outer: Vec3): ArmModel {
  const axis = unit(sub(rear, front));
  const d = sub(outer, front);
  const r0 = sub(d, scale(axis, dot(d, axis)));
  return { pivot: front, axis, r0 };
}

function leverModel(
  linkOuter: Vec3,
  linkOuterOn: Attachment,
  leverPoint: Vec3,
  pivot: Vec3,
  axisRaw: Vec3,
  what: string,
  linkField: string,
  spring?: { rockerPoint: Vec3; body: Vec3 },
): LeverModel {
  const axis = unit(axisRaw);
  const split = (p: Vec3) => {
    const d = sub(p, pivot);
    const par = scale(axis, dot(d, axis));
    return [par, sub(d, par)] as const;
  };
  const [leverPar, leverPerp] = split(leverPoint);
  const m: LeverModel = {
    linkOuter,
    linkOuterOn,
    linkLength: norm(sub(linkOuter, leverPoint)),
    pivot,
    axis,
    leverPar,
    leverPerp,
    leverPerpX: cross(axis, leverPerp),
    leverRadius: norm(leverPerp),
    what,
    linkField,
  };
  if (spring) {
    const [sp, sq] = split(spring.rockerPoint);
    m.springPar = sp;
    m.springPerp = sq;
    m.springPerpX = cross(axis, sq);
    m.springBody = spring.body;
  }
  return m;
}

const cache = new WeakMap<object, CornerModel>();

/** Validates (InputError naming the field) and compiles a corner; cached per object. */
export function compileCorner(input: Corner | unknown): CornerModel {
  if (input && typeof input === 'object') {
    const hit = cache.get(input);
    if (hit) return hit;
  }
  const corner = parseOrThrow(cornerSchema, input, 'corner');
  const m = buildModel(corner);
  if (input && typeof input === 'object') cache.set(input, m);
  return m;
}

/** Coordinates an engine-built corner may move: points by name, and a steering-box arm's axis point. */
export interface CornerMoves {
  points?: Readonly<Record<string, Vec3>>;
  armAxisPoint?: Vec3;
}

/**
 * A copy of an already-validated corner with only coordinates moved, built
 * by the engine itself (the intent solver's trial geometries): the structure
 * is the validated corner's, so the zod parse is skipped; the moved values
 * must be finite and the semantic geometry checks (`cornerSemanticIssues`)
 * still run, with the InputError the parse would give. The compiled model is
 * cached for the copy. `base` itself is validated (once) by compileCorner.
 */
export function moveCornerPoints(base: Corner, moves: CornerMoves): Corner {
  const validated = compileCorner(base).corner;
  const issues: { path: string; message: string }[] = [];
  const finite = (v: Vec3, path: string) => {
    if (!Array.isArray(v) || v.length !== 3 || !v.every((x) => typeof x === 'number' && Number.isFinite(x))) issues.push({ path, message: `${path} must be three finite numbers (mm)` });
  };
  const points = { ...(validated.points as Record<string, Vec3>) };
  for (const [name, v] of Object.entries(moves.points ?? {})) {
    if (!(name in points)) throw new Error(`moveCornerPoints: ${name} is not a point of this ${validated.type} corner`);
    finite(v, `points.${name}`);
    points[name] = [v[0], v[1], v[2]];
  }
  let steering = validated.steering;
  if (moves.armAxisPoint) {
    if (steering?.kind !== 'arm') throw new Error('moveCornerPoints: armAxisPoint needs a steering-box arm');
    finite(moves.armAxisPoint, 'steering.armAxisPoint');
    steering = { ...steering, armAxisPoint: [moves.armAxisPoint[0], moves.armAxisPoint[1], moves.armAxisPoint[2]] };
  }
  const next = { ...validated, points, ...(steering ? { steering } : {}) } as Corner;
  if (!issues.length) issues.push(...cornerSemanticIssues(next));
  if (issues.length) throw new InputError(`Invalid corner: ${issues[0]!.path}: ${issues[0]!.message}`, issues);
  cache.set(next, buildModel(next));
  return next;
}

function buildModel(corner: Corner): CornerModel {
  const p = corner.points as Record<string, Vec3>;
  const wc0 = p['wheelCentre']!;
  const local = (n: string) => sub(p[n]!, wc0);
  const links: Array<{ inner: string; outer: string; name: string }> = [];
  let strut: CornerModel['strut'] = null;
  let lowerArm: ArmModel | null = null;
  let upperArm: ArmModel | null = null;
  let kingpin: CornerModel['kingpin'];
  let steerInner: string;
  let steerRow: number;
  const names: string[] = [];

  if (corner.type === 'double-wishbone' || corner.type === 'strut') {
    links.push({ inner: 'lowerFront', outer: 'lowerOuter', name: 'lower arm front leg (lowerFront–lowerOuter)' });
    links.push({ inner: 'lowerRear', outer: 'lowerOuter', name: 'lower arm rear leg (lowerRear–lowerOuter)' });
    lowerArm = armModel(p['lowerFront']!, p['lowerRear']!, p['lowerOuter']!);
    if (corner.type === 'double-wishbone') {
      links.push({ inner: 'upperFront', outer: 'upperOuter', name: 'upper arm front leg (upperFront–upperOuter)' });
      links.push({ inner: 'upperRear', outer: 'upperOuter', name: 'upper arm rear leg (upperRear–upperOuter)' });
      upperArm = armModel(p['upperFront']!, p['upperRear']!, p['upperOuter']!);
      kingpin = { kind: 'points', lowerLocal: local('lowerOuter'), upperLocal: local('upperOuter') };
    } else {
      const top = p['strutTop']!;
      const d = unit(sub(top, p['strutLower']!));
      // Two unit vectors perpendicular to the strut axis, fixed in the upright.
      const helper: Vec3 = Math.abs(d[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
      const e1 = unit(cross(d, helper));
      const e2 = cross(d, e1);
      strut = { top: Float64Array.from(top), lowerLocal: Float64Array.from(local('strutLower')), e1: Float64Array.from(e1), e2: Float64Array.from(e2) };
      kingpin = { kind: 'strut', lowerLocal: local('lowerOuter'), top };
    }
    links.push({ inner: 'tieRodInner', outer: 'tieRodOuter', name: corner.steered ? 'tie rod (tieRodInner–tieRodOuter)' : 'toe link (tieRodInner–tieRodOuter)' });
    steerInner = 'tieRodInner';
    steerRow = links.length - 1;
  } else {
    for (let i = 1; i <= 5; i++) {
      links.push({ inner: `link${i}Inner`, outer: `link${i}Outer`, name: `link ${i}${i === corner.toeLink ? ' (toe link)' : ''} (link${i}Inner–link${i}Outer)` });
    }
    steerInner = `link${corner.toeLink}Inner`;
    steerRow = corner.toeLink - 1;
    kingpin = { kind: 'instant' };
  }

  const n = links.length;
  const bodyPts = new Float64Array(3 * n);
  const localPts = new Float64Array(3 * n);
  const lengths = new Float64Array(n);
  links.forEach((l, i) => {
    bodyPts.set(p[l.inner]!, 3 * i);
    localPts.set(local(l.outer), 3 * i);
    lengths[i] = norm(sub(p[l.outer]!, p[l.inner]!));
    names.push(l.name);
  });
  if (strut) names.push('strut (strutTop on the strut axis)', 'strut (strutTop on the strut axis)');

  const spin0 = unit(sub(wc0, p['spindle']!));
  const dn: Vec3 = [spin0[2] * spin0[0], spin0[2] * spin0[1], -1 + spin0[2] * spin0[2]];
  const cp0: Vec3 = (() => {
    const u = unit(dn);
    return [wc0[0] + corner.wheel.radius * u[0], wc0[1] + corner.wheel.radius * u[1], wc0[2] + corner.wheel.radius * u[2]];
  })();

  let steering: CornerModel['steering'] = null;
  let rackStroke: [number, number] = [0, 0];
  if (corner.steered && corner.steering) {
    const s = corner.steering;
    if (s.kind === 'rack') {
      steering = { kind: 'rack', axis: unit(s.rackAxis) };
      rackStroke = [s.rackStroke[0], s.rackStroke[1]];
    } else {
      const dir = unit(s.armAxisDirection);
      const d = sub(p[steerInner]!, s.armAxisPoint);
      const radius = norm(sub(d, scale(dir, dot(d, dir))));
      steering = { kind: 'arm', point: s.armAxisPoint, dir, radius };
      rackStroke = [(s.angularStrokeDeg[0] * Math.PI * radius) / 180, (s.angularStrokeDeg[1] * Math.PI * radius) / 180];
    }
  }

  let directSpring: CornerModel['directSpring'] = null;
  let rocker: LeverModel | null = null;
  const sp = corner.spring;
  if (sp?.kind === 'direct') directSpring = { body: sp.springBody, outer: sp.springOuter, on: sp.springOuterOn };
  else if (sp?.kind === 'rocker') {
    rocker = leverModel(sp.rodOuter, sp.rodOuterOn, sp.rodRocker, sp.rockerPivot, sp.rockerAxis, 'pushrod/pullrod (rodOuter–rodRocker)', 'spring.rodOuter', {
      rockerPoint: sp.springRocker,
      body: sp.springBody,
    });
  }
  const b = corner.antiRollBar;
  const bar = b ? leverModel(b.dropLinkOuter, b.dropLinkOuterOn, b.dropLinkInner, b.barAxisPoint, b.barAxisDirection, 'anti-roll bar drop link', 'antiRollBar.dropLinkOuter') : null;

  return {
    corner,
    nDist: n,
    bodyPts,
    localPts,
    lengths,
    linkNames: names,
    steerRow,
    strut,
    wc0,
    spin0,
    cp0,
    radius: corner.wheel.radius,
    steering,
    rackStroke,
    lowerArm,
    upperArm,
    lowerOuterLocal: lowerArm ? local('lowerOuter') : null,
    upperOuterLocal: upperArm ? local('upperOuter') : null,
    kingpin,
    directSpring,
    rocker,
    bar,
  };
}
