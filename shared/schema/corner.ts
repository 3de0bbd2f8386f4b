/**
 * The corner document: one LEFT suspension corner's hardpoints, Rollwise's own
 * JSON format (formatVersion 1). Points in mm, ISO 8855 vehicle axes (x
 * forward, y left, z up, origin on the ground under the front axle centre);
 * see docs/kinematics.md for every key.
 *
 * The zod schema checks shapes (every object is strict: an unknown key, such
 * as a misspelt point name, is an error naming the key and its path, never
 * silently dropped); `cornerSemanticIssues` (shared/schema/corner-rules.ts,
 * run by the schema, free of zod so the editor's page can run the same rules)
 * checks geometry that would leave a link, arm or axis undefined, and every
 * message names the point involved.
 */
import * as z from 'zod';
import { InputError, formatPath } from '../errors.js';
import { CORNER_RANGES } from './ranges.js';
import { inRange } from './ranged.js';
import { ATTACHMENTS, BUSHING_POINTS, MAX_RATE_N_PER_MM, STIFF_LINKS, cornerSemanticIssues } from './corner-rules.js';

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
export const attachmentSchema = z.enum(ATTACHMENTS);

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
