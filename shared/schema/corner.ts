/**
 * The corner document: one LEFT suspension corner's hardpoints, Rollwise's own
 * JSON format (formatVersion 1). Points in mm, ISO 8855 vehicle axes (x
 * forward, y left, z up, origin on the ground under the front axle centre);
 * see docs/kinematics.md for every key.
 *
 * The zod schema checks shapes (every object is strict: an unknown key, such
 * as a misspelt point name, is an error naming the key and its path, never
 * silently dropped); `cornerSemanticIssues` (run by the schema) checks
 * geometry that would leave a link, arm or axis undefined, and every message
 * names the point involved.
 */
import * as z from 'zod';
import type { FieldIssue } from '../errors.js';
import { InputError, formatPath } from '../errors.js';
import { CORNER_RANGES } from './ranges.js';
import { cornerRangeIssues } from './corner-ranges.js';
import { inRange } from './ranged.js';

export const CORNER_FORMAT_VERSION = 1;

export type Vec3 = [number, number, number];

/** Edit distance (insertions, deletions, substitutions), case-insensitive, for "did you mean". */
function editDistance(a: string, b: string): number {
  const x = a.toLowerCase();
  const y = b.toLowerCase();
  let prev = Array.from({ length: y.length + 1 }, (_, j) => j);
  for (let i = 1; i <= x.length; i++) {
    const row = [i];
    for (let j = 1; j <= y.length; j++) row.push(Math.min(prev[j]! + 1, row[j - 1]! + 1, prev[j - 1]! + (x[i - 1] === y[j - 1] ? 0 : 1)));
    prev = row;
  }
  return prev[y.length]!;
}

/** The message of an unknown-key issue: each key with its full path, the nearest known key, and the keys accepted there. */
export function unknownKeysMessage(keys: readonly string[], path: ReadonlyArray<PropertyKey>, known: readonly string[]): string {
  const at = (k: string) => formatPath([...path, k]);
  const one = (k: string) => {
    let best = '';
    let bestD = Infinity;
    for (const n of known) {
      const d = editDistance(k, n);
      if (d < bestD) {
        best = n;
        bestD = d;
      }
    }
    return `${at(k)}${best && bestD <= Math.max(2, Math.floor(k.length / 4)) ? ` (did you mean ${at(best)}?)` : ''}`;
  };
  const where = path.length ? formatPath(path) : 'the corner';
  return `unknown key${keys.length > 1 ? 's' : ''} ${keys.map(one).join(', ')}: not part of the corner format (${where} takes ${known.join(', ')})`;
}

/** z.strictObject whose unknown-key issue names each key, its path and the accepted keys. */
function strictObject<T extends z.ZodRawShape>(shape: T) {
  const known = Object.keys(shape);
  return z.strictObject(shape, {
    error: (iss) => (iss.code === 'unrecognized_keys' ? unknownKeysMessage(iss.keys, iss.path ?? [], known) : undefined),
  });
}

const finite = z.number().finite();
// Coordinates and the other corner numbers are held to their plausible ranges (shared/schema/ranges.ts, docs/inputs.md).
const coordinate = inRange(z.number().finite(), CORNER_RANGES.coordinateMm);
export const vec3Schema = z.tuple([coordinate, coordinate, coordinate]);
const directionComponent = inRange(z.number().finite(), CORNER_RANGES.directionComponent);
/** A direction: only where it points counts (normalised on use). */
const directionSchema = z.tuple([directionComponent, directionComponent, directionComponent]);
const rackStrokeEnd = inRange(finite, CORNER_RANGES.rackStrokeMm);
const armStrokeEnd = inRange(finite, CORNER_RANGES.armStrokeDeg);

/** Body-mounted lever or rocker attachments say what they ride on. */
export const attachmentSchema = z.enum(['lowerArm', 'upperArm', 'upright']);
export type Attachment = z.infer<typeof attachmentSchema>;

const rackSteeringSchema = strictObject({
  kind: z.literal('rack'),
  /** Direction of rack travel in the vehicle frame (normalised on use). */
  rackAxis: directionSchema.default([0, 1, 0]),
  /** Rack travel limits [min, max] in mm; must contain 0. */
  rackStroke: z.tuple([rackStrokeEnd, rackStrokeEnd]),
});

/**
 * Steering box with arms (pitman or idler): the tie-rod inner point swings
 * about a body-fixed axis. The steering input is the arc travel (mm) of the
 * tie-rod inner point, positive for rotation by the right-hand rule about
 * `armAxisDirection` on the left side.
 */
const armSteeringSchema = strictObject({
  kind: z.literal('arm'),
  armAxisPoint: vec3Schema,
  armAxisDirection: directionSchema,
  /** Arm rotation limits [min, max] in degrees; must contain 0. */
  angularStrokeDeg: z.tuple([armStrokeEnd, armStrokeEnd]),
});

export const steeringSchema = z.discriminatedUnion('kind', [rackSteeringSchema, armSteeringSchema]);

const directSpringSchema = strictObject({
  kind: z.literal('direct'),
  springBody: vec3Schema,
  springOuter: vec3Schema,
  springOuterOn: attachmentSchema,
});

/** Pushrod or pullrod to a body-mounted rocker; the spring runs rocker → body. */
const rockerSpringSchema = strictObject({
  kind: z.literal('rocker'),
  rockerPivot: vec3Schema,
  rockerAxis: directionSchema,
  rodOuter: vec3Schema,
  rodOuterOn: attachmentSchema,
  rodRocker: vec3Schema,
  springRocker: vec3Schema,
  springBody: vec3Schema,
});

export const springSchema = z.discriminatedUnion('kind', [directSpringSchema, rockerSpringSchema]);

/** Anti-roll bar: a drop link from the suspension to the bar's lever end. */
export const antiRollBarSchema = strictObject({
  dropLinkOuter: vec3Schema,
  dropLinkOuterOn: attachmentSchema,
  /** The drop link's inner end, on the end of the bar's lever. */
  dropLinkInner: vec3Schema,
  barAxisPoint: vec3Schema,
  barAxisDirection: directionSchema,
});

const wheelSchema = strictObject({
  /** Loaded radius, mm. */
  radius: inRange(
    finite.refine((r) => r > 0, { message: 'wheel.radius must be positive (loaded radius in mm)' }),
    CORNER_RANGES.wheelRadiusMm,
  ),
});

const common = {
  formatVersion: z.literal(CORNER_FORMAT_VERSION, { message: `formatVersion must be ${CORNER_FORMAT_VERSION}` }),
  name: z.string().max(200).optional(),
  /** false: the tie rod is a fixed toe link (no steering). */
  steered: z.boolean(),
  wheel: wheelSchema,
  steering: steeringSchema.optional(),
  spring: springSchema.optional(),
  antiRollBar: antiRollBarSchema.optional(),
};

const wheelPoints = { wheelCentre: vec3Schema, spindle: vec3Schema };
const tieRodPoints = { tieRodInner: vec3Schema, tieRodOuter: vec3Schema };
const lowerArmPoints = { lowerFront: vec3Schema, lowerRear: vec3Schema, lowerOuter: vec3Schema };

export const doubleWishbonePointsSchema = strictObject({
  ...wheelPoints,
  ...tieRodPoints,
  ...lowerArmPoints,
  upperFront: vec3Schema,
  upperRear: vec3Schema,
  upperOuter: vec3Schema,
});

export const strutPointsSchema = strictObject({
  ...wheelPoints,
  ...tieRodPoints,
  ...lowerArmPoints,
  /** Top mount (body). */
  strutTop: vec3Schema,
  /** A point on the strut axis fixed to the upright. */
  strutLower: vec3Schema,
});

export const fiveLinkPointsSchema = strictObject({
  ...wheelPoints,
  link1Inner: vec3Schema,
  link1Outer: vec3Schema,
  link2Inner: vec3Schema,
  link2Outer: vec3Schema,
  link3Inner: vec3Schema,
  link3Outer: vec3Schema,
  link4Inner: vec3Schema,
  link4Outer: vec3Schema,
  link5Inner: vec3Schema,
  link5Outer: vec3Schema,
});

// ---------- elastic keys (compliance, docs/compliance.md) ----------

/** Largest rate accepted, N/mm (a short solid steel link is about 2e5 N/mm; leave a key out for rigid). */
export const MAX_RATE_N_PER_MM = 1e7;
const rate = (what: string) =>
  z
    .number({ message: `${what} must be a number (N/mm)` })
    .finite({ message: `${what} must be a finite rate in N/mm` })
    .positive({ message: `${what} must be a positive rate in N/mm (leave the key out for a rigid mount)` })
    .max(MAX_RATE_N_PER_MM, { message: `${what} above ${MAX_RATE_N_PER_MM} N/mm: leave the key out for a rigid mount` });

/**
 * One bushing (or a compliant ball joint): radial rate and axial rate, N/mm.
 * Axial is along the arm's pivot axis at a wishbone pivot, along the link at
 * a single link's end, along the strut at the top mount and along the
 * kingpin at an arm's outer ball joint.
 */
export const bushingSchema = strictObject({ radialNPerMm: rate('radialNPerMm'), axialNPerMm: rate('axialNPerMm') });
export type Bushing = z.infer<typeof bushingSchema>;

/** Bushing map keyed by the corner's own point names (body ends, and upright ball joints when they are compliant). */
function bushingsOf(names: readonly string[]) {
  return strictObject(Object.fromEntries(names.map((n) => [n, bushingSchema.optional()])) as Record<string, z.ZodOptional<typeof bushingSchema>>).optional();
}
function linkRatesOf(names: readonly string[]) {
  return strictObject(Object.fromEntries(names.map((n) => [n, rate(n)])) as Record<string, ReturnType<typeof rate>>).partial().optional();
}
/** Point names a bushing may sit at, per corner type. */
export const BUSHING_POINTS = {
  'double-wishbone': ['lowerFront', 'lowerRear', 'upperFront', 'upperRear', 'tieRodInner', 'lowerOuter', 'upperOuter', 'tieRodOuter'],
  strut: ['lowerFront', 'lowerRear', 'strutTop', 'tieRodInner', 'lowerOuter', 'tieRodOuter'],
  'five-link': [1, 2, 3, 4, 5].flatMap((i) => [`link${i}Inner`, `link${i}Outer`]),
} as const;
/** Single links whose own axial stiffness may be given, per corner type. */
export const STIFF_LINKS = { 'double-wishbone': ['tieRod'], strut: ['tieRod'], 'five-link': ['link1', 'link2', 'link3', 'link4', 'link5'] } as const;
const elastic = (type: keyof typeof BUSHING_POINTS) => ({
  /** Bushing rates by point name; a point not listed is rigid. */
  bushings: bushingsOf(BUSHING_POINTS[type]),
  /** Axial stiffness of single links (the link itself, in series with its end bushings), N/mm. */
  linkAxialNPerMm: linkRatesOf(STIFF_LINKS[type]),
  /** Steering system (rack mounts, column) as a rate at the rack along its travel, N/mm; steered corners only. */
  steeringStiffnessNPerMm: rate('steeringStiffnessNPerMm').optional(),
});

const doubleWishboneSchema = strictObject({ ...common, ...elastic('double-wishbone'), type: z.literal('double-wishbone'), points: doubleWishbonePointsSchema });
const strutSchema = strictObject({ ...common, ...elastic('strut'), type: z.literal('strut'), points: strutPointsSchema });
const fiveLinkSchema = strictObject({
  ...common,
  ...elastic('five-link'),
  type: z.literal('five-link'),
  points: fiveLinkPointsSchema,
  /** Which link (1–5) is the toe link; its ends play the tie rod's part. */
  toeLink: z.number().int().min(1).max(5),
});

const cornerShapeSchema = z.discriminatedUnion('type', [doubleWishboneSchema, strutSchema, fiveLinkSchema]);

/** Coincidence / collinearity tolerance, mm (a link shorter than this is undefined). */
export const GEOMETRY_TOLERANCE_MM = 0.5;

export const cornerSchema = cornerShapeSchema.superRefine((corner, ctx) => {
  for (const issue of cornerSemanticIssues(corner)) {
    ctx.addIssue({ code: 'custom', message: issue.message, path: issue.path.split('.') });
  }
});

export type Corner = z.infer<typeof cornerSchema>;
export type DoubleWishboneCorner = Extract<Corner, { type: 'double-wishbone' }>;

/**
 * Brings an older corner document to the current formatVersion. Version 1 is
 * the first published format, so there is nothing to migrate yet: a document
 * without `formatVersion` is read as version 1 (as vehicle documents are), and
 * one from a newer Rollwise is refused rather than silently misread.
 */
export function upgradeCornerDocument(doc: unknown): unknown {
  if (doc === null || typeof doc !== 'object' || Array.isArray(doc)) return doc;
  const v = (doc as { formatVersion?: unknown }).formatVersion;
  if (v === undefined) return { ...doc, formatVersion: CORNER_FORMAT_VERSION };
  if (typeof v === 'number' && Number.isInteger(v) && v > CORNER_FORMAT_VERSION) {
    throw new InputError(`formatVersion ${v} was written by a newer Rollwise; this engine reads up to ${CORNER_FORMAT_VERSION}`, [
      { path: 'formatVersion', message: `unsupported formatVersion ${v}` },
    ]);
  }
  return doc;
}

/**
 * A stored or sent corner document: upgraded to the current formatVersion,
 * then checked by `cornerSchema`. A document from a newer Rollwise becomes an
 * ordinary schema issue at its own `formatVersion` path (so callers see
 * `corner.formatVersion`, and `safeParse` reports it instead of throwing).
 */
export const cornerDocumentSchema = z.preprocess((doc, ctx) => {
  try {
    return upgradeCornerDocument(doc);
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    for (const issue of e.issues) ctx.addIssue({ code: 'custom', message: e.message, path: [issue.path] });
    return z.NEVER;
  }
}, cornerSchema);

// ---------- semantic validation ----------

function sub(a: readonly number[], b: readonly number[]): Vec3 {
  return [a[0]! - b[0]!, a[1]! - b[1]!, a[2]! - b[2]!];
}
function norm(a: readonly number[]): number {
  return Math.hypot(a[0]!, a[1]!, a[2]!);
}
function cross(a: readonly number[], b: readonly number[]): Vec3 {
  return [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
}
/** Distance (mm) of p from the line through a and b. */
function distanceToLine(p: readonly number[], a: readonly number[], b: readonly number[]): number {
  const d = sub(b, a);
  return norm(cross(sub(p, a), d)) / norm(d);
}
/** Distance (mm) of p from the line through a with direction d. */
function distanceToAxis(p: readonly number[], a: readonly number[], d: readonly number[]): number {
  return norm(cross(sub(p, a), d)) / norm(d);
}
const fmt = (p: readonly number[]) => `[${p.map((v) => +v.toFixed(3)).join(', ')}]`;

type NamedPoints = Record<string, Vec3>;

/**
 * Geometry rules a corner must satisfy before it can be solved. Returns one
 * issue per broken rule; each path and message names the point.
 */
export function cornerSemanticIssues(corner: z.infer<typeof cornerShapeSchema>): FieldIssue[] {
  const issues: FieldIssue[] = [];
  const tol = GEOMETRY_TOLERANCE_MM;
  const pts = corner.points as NamedPoints;
  const add = (path: string, message: string) => issues.push({ path, message });

  const link = (inner: string, outer: string, what: string) => {
    if (norm(sub(pts[outer]!, pts[inner]!)) < tol) {
      add(`points.${outer}`, `points.${outer} coincides with points.${inner}: the ${what} has no length`);
    }
  };
  const arm = (front: string, rear: string, outer: string, what: string) => {
    if (norm(sub(pts[rear]!, pts[front]!)) < tol) {
      add(`points.${rear}`, `points.${rear} coincides with points.${front}: the ${what}'s pivot axis is undefined`);
    } else if (distanceToLine(pts[outer]!, pts[front]!, pts[rear]!) < tol) {
      add(`points.${outer}`, `points.${outer} lies on the ${what}'s pivot axis (${front}–${rear}): the arm cannot hold the upright`);
    }
  };

  // Wheel and spin axis.
  const wc = pts['wheelCentre']!;
  const sp = pts['spindle']!;
  if (norm(sub(wc, sp)) < tol) add('points.spindle', 'points.spindle coincides with points.wheelCentre: the spin axis is undefined');
  else if (sp[1] >= wc[1]) add('points.spindle', `points.spindle (y ${sp[1]}) must be inboard of points.wheelCentre (y ${wc[1]}) so the spin axis points outboard`);

  if (corner.type === 'double-wishbone') {
    arm('lowerFront', 'lowerRear', 'lowerOuter', 'lower arm');
    arm('upperFront', 'upperRear', 'upperOuter', 'upper arm');
    link('tieRodInner', 'tieRodOuter', 'tie rod');
    link('lowerOuter', 'upperOuter', 'kingpin (lower to upper ball joint)');
    // The steering axis runs through both ball joints; the tie rod needs a lever about it.
    if (norm(sub(pts['upperOuter']!, pts['lowerOuter']!)) >= tol && distanceToLine(pts['tieRodOuter']!, pts['lowerOuter']!, pts['upperOuter']!) < tol) {
      add('points.tieRodOuter', 'points.tieRodOuter lies on the steering axis (lowerOuter–upperOuter, collinear with both ball joints): the tie rod has no lever to hold the steer');
    }
  } else if (corner.type === 'strut') {
    arm('lowerFront', 'lowerRear', 'lowerOuter', 'lower arm');
    link('tieRodInner', 'tieRodOuter', 'tie rod');
    link('strutLower', 'strutTop', 'strut axis');
    // A lower ball joint on the strut axis is well posed (the steering axis is then the strut axis): not refused.
    // The steering axis runs from the lower ball joint to the top mount; the tie rod needs a lever about it.
    if (norm(sub(pts['strutTop']!, pts['lowerOuter']!)) >= tol && distanceToLine(pts['tieRodOuter']!, pts['lowerOuter']!, pts['strutTop']!) < tol) {
      add('points.tieRodOuter', 'points.tieRodOuter lies on the steering axis (lowerOuter–strutTop): the tie rod has no lever to hold the steer');
    }
  } else {
    for (let i = 1; i <= 5; i++) {
      link(`link${i}Inner`, `link${i}Outer`, `link ${i}`);
    }
    for (let i = 1; i <= 5; i++) {
      for (let j = i + 1; j <= 5; j++) {
        if (norm(sub(pts[`link${i}Inner`]!, pts[`link${j}Inner`]!)) < tol && norm(sub(pts[`link${i}Outer`]!, pts[`link${j}Outer`]!)) < tol) {
          add(`points.link${j}Outer`, `points.link${j}Inner/link${j}Outer duplicate link ${i}: five independent links are needed`);
        }
      }
    }
  }

  // Not refused (well posed, the pose Jacobian stays regular; test/shared/kinematics/jacobian.test.ts): a body-side
  // point at the same place as an upright point (a packaging clash, not a singularity), and a body-side point
  // outboard of the wheel centre. Only the side convention is checked: the LEFT corner is entered (y > 0).
  if (!(wc[1] > 0)) add('points.wheelCentre', `points.wheelCentre (y ${wc[1]}) must be on the left (y > 0); enter the LEFT corner`);

  // Steering.
  if (corner.steeringStiffnessNPerMm !== undefined && !corner.steered) {
    add('steeringStiffnessNPerMm', 'steeringStiffnessNPerMm applies to a steered corner only (this corner has a fixed toe link: give its rate as linkAxialNPerMm or a bushing)');
  }
  if (corner.steered && !corner.steering) add('steering', 'steering is required when steered is true (a rack or a steering-box arm)');
  if (corner.steering?.kind === 'rack') {
    const [lo, hi] = corner.steering.rackStroke;
    if (!(lo < hi)) add('steering.rackStroke', `steering.rackStroke [${lo}, ${hi}] must have min < max`);
    else if (lo > 0 || hi < 0) add('steering.rackStroke', `steering.rackStroke [${lo}, ${hi}] does not contain 0 (the design position)`);
    if (norm(corner.steering.rackAxis) < 1e-9) add('steering.rackAxis', 'steering.rackAxis has zero length');
  } else if (corner.steering?.kind === 'arm') {
    const s = corner.steering;
    const [lo, hi] = s.angularStrokeDeg;
    if (!(lo < hi)) add('steering.angularStrokeDeg', `steering.angularStrokeDeg [${lo}, ${hi}] must have min < max`);
    else if (lo > 0 || hi < 0) add('steering.angularStrokeDeg', `steering.angularStrokeDeg [${lo}, ${hi}] does not contain 0 (the design position)`);
    if (norm(s.armAxisDirection) < 1e-9) add('steering.armAxisDirection', 'steering.armAxisDirection has zero length');
    else {
      const tri = corner.type === 'five-link' ? `link${corner.toeLink}Inner` : 'tieRodInner';
      if (distanceToAxis(pts[tri]!, s.armAxisPoint, s.armAxisDirection) < tol) {
        add(`points.${tri}`, `points.${tri} lies on the steering arm axis (steering.armAxisPoint): the arm has no length`);
      }
    }
  }

  const checkOn = (path: string, on: Attachment) => {
    if (on === 'upperArm' && corner.type !== 'double-wishbone') add(path, `${path} is upperArm but a ${corner.type} corner has no upper arm`);
    if (on === 'lowerArm' && corner.type === 'five-link') add(path, `${path} is lowerArm but a five-link corner has no arm; attach to the upright`);
  };

  // Springs.
  const sp2 = corner.spring;
  if (sp2?.kind === 'direct') {
    checkOn('spring.springOuterOn', sp2.springOuterOn);
    if (norm(sub(sp2.springOuter, sp2.springBody)) < tol) add('spring.springOuter', 'spring.springOuter coincides with spring.springBody: the spring has no length');
  } else if (sp2?.kind === 'rocker') {
    checkOn('spring.rodOuterOn', sp2.rodOuterOn);
    if (norm(sp2.rockerAxis) < 1e-9) add('spring.rockerAxis', 'spring.rockerAxis has zero length');
    else {
      if (distanceToAxis(sp2.rodRocker, sp2.rockerPivot, sp2.rockerAxis) < tol) add('spring.rodRocker', 'spring.rodRocker lies on the rocker axis: the rocker has no lever for the rod');
      if (distanceToAxis(sp2.springRocker, sp2.rockerPivot, sp2.rockerAxis) < tol) add('spring.springRocker', 'spring.springRocker lies on the rocker axis: the rocker has no lever for the spring');
    }
    if (norm(sub(sp2.rodOuter, sp2.rodRocker)) < tol) add('spring.rodOuter', 'spring.rodOuter coincides with spring.rodRocker: the rod has no length');
    if (norm(sub(sp2.springRocker, sp2.springBody)) < tol) add('spring.springBody', 'spring.springBody coincides with spring.springRocker: the spring has no length');
  }

  // Anti-roll bar.
  const bar = corner.antiRollBar;
  if (bar) {
    checkOn('antiRollBar.dropLinkOuterOn', bar.dropLinkOuterOn);
    if (norm(sub(bar.dropLinkOuter, bar.dropLinkInner)) < tol) add('antiRollBar.dropLinkOuter', 'antiRollBar.dropLinkOuter coincides with antiRollBar.dropLinkInner: the drop link has no length');
    if (norm(bar.barAxisDirection) < 1e-9) add('antiRollBar.barAxisDirection', 'antiRollBar.barAxisDirection has zero length');
    else if (distanceToAxis(bar.dropLinkInner, bar.barAxisPoint, bar.barAxisDirection) < tol) {
      add('antiRollBar.dropLinkInner', `antiRollBar.dropLinkInner ${fmt(bar.dropLinkInner)} lies on the bar axis: the bar has no lever`);
    }
  }
  // Plausible sizes: a kingpin metres long, a point far from its wheel (shared/schema/corner-ranges.ts).
  issues.push(...cornerRangeIssues(corner));
  return issues;
}
