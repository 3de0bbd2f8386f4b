/**
 * Study requests and specs (docs/studies.md). A request is what a user sends
 * over HTTP (its target named by id); a spec is the fully resolved,
 * self-contained study the server builds from it by loading the documents
 * (the CLI reads a spec, or a spec-shaped file with the documents embedded).
 * A worker needs nothing but the spec. Lengths in mm, angles in degrees,
 * ISO 8855 axes of the LEFT corner (shared/docs/domain.md).
 */
import * as z from 'zod';
import { cornerDocumentSchema } from '../schema/corner.js';
import { vehicleSchema, upgradeVehicleDocument } from '../schema/vehicle.js';
import { TRACK_PROFILE_IDS } from '../tracks/profiles.js';
import { CAUTION_RULES } from '../cautions/cautions.js';

/** Most samples (tolerance study) or variants (design sweep) one study may hold. */
export const MAX_STUDY_SAMPLES = 100_000;
/** Samples per chunk when the spec does not say. */
export const DEFAULT_CHUNK_SAMPLES = 500;
/** Most tolerance entries and sweep factors. */
export const MAX_TOLERANCES = 24;
export const MAX_SWEEP_FACTORS = 8;
/** Most rack positions of the bump-steer fits. */
export const MAX_STUDY_RACKS = 5;

const finite = (what: string) => z.number({ error: `${what} must be a number` }).finite();
const axisSchema = z.enum(['x', 'y', 'z']);

/** Points whose position may carry a tolerance or be swept: every corner point but the wheel axis (wheelCentre, spindle), which the upright's other points are measured from. */
export const FIXED_POINTS: readonly string[] = ['wheelCentre', 'spindle'];

export const toleranceSchema = z.strictObject({
  /** Corner point name (`lowerFront`, `tieRodInner`, …). */
  point: z.string().min(1).max(40),
  /** One coordinate, or `sphere`: the point anywhere within a ball of radius plusMinusMm. */
  axis: z.enum(['x', 'y', 'z', 'sphere']),
  /** Tolerance band ±mm (a sphere's radius). */
  plusMinusMm: finite('plusMinusMm').positive('plusMinusMm must be > 0').max(50, 'plusMinusMm must be at most 50 mm'),
  /** `normal`: the band is ± normalSigmas standard deviations; `uniform`: equally likely anywhere in the band (or ball). */
  distribution: z.enum(['normal', 'uniform']),
});

/** Workshop set-up after assembly: static camber by shims, then static toe by the tie-rod / toe-link adjuster, back to the nominal values. */
export const setupSchema = z.strictObject({
  /** Camber shim thickness, mm (shims under the upper-arm pickups; the camber plate step on a strut); 0 = continuous; absent = no camber set-up. */
  camberShimMm: finite('camberShimMm').min(0).max(10).optional(),
  /** Tie-rod (toe-link) length resolution of the adjuster, mm (e.g. a quarter turn of a 1.5 mm thread: 0.375); 0 = continuous; absent = no toe set-up. */
  toeAdjusterStepMm: finite('toeAdjusterStepMm').min(0).max(10).optional(),
});

/** What each sample measures: the bump-steer fits, the roll sweep. */
export const studyAnalysisSchema = z.strictObject({
  /** Travel range of the bump-steer fits [droop, bump], mm; default the track profile's. */
  travelMm: z.tuple([finite('travelMm[0]'), finite('travelMm[1]')]).optional(),
  /** Travel points of each fit (odd, so design height is one), default 11. */
  travelPoints: z.number().int().min(5).max(41).default(11),
  /** Rack positions of the bump-steer fits, mm (0 first is added when missing). */
  rackMm: z.array(finite('rackMm[]')).min(1).max(MAX_STUDY_RACKS).default([0]),
  /** Body roll of the roll sweep (±rollDeg), deg. */
  rollDeg: finite('rollDeg').positive().max(10).default(2),
});

export const sweepFactorSchema = z.strictObject({
  point: z.string().min(1).max(40),
  axis: axisSchema,
  /** Bounds of the coordinate, mm (vehicle frame, left corner). */
  fromMm: finite('fromMm'),
  toMm: finite('toMm'),
  /** Levels of a full-factorial design (ignored by a Latin hypercube). */
  levels: z.number().int().min(2).max(101).default(5),
});

const trackProfileSchema = z.union([
  z.enum(TRACK_PROFILE_IDS),
  z.strictObject({
    id: z.enum(TRACK_PROFILE_IDS),
    travelMm: z.tuple([finite('travelMm[0]'), finite('travelMm[1]')]).optional(),
    bumpHeightMm: finite('bumpHeightMm').positive().max(1000).optional(),
  }),
]);

const levelThresholdsSchema = z.strictObject({ info: finite('info').optional(), warning: finite('warning').optional(), critical: finite('critical').optional() });
const thresholdsSchema = z.partialRecord(z.enum(Object.keys(CAUTION_RULES) as [string, ...string[]]), levelThresholdsSchema);

const seedSchema = z.number().int().min(0).max(0xffff_ffff);
const samplesSchema = z.number().int().min(10, 'samples must be at least 10').max(MAX_STUDY_SAMPLES, `samples must be at most ${MAX_STUDY_SAMPLES}`);

/** Settings of a tolerance study (request and spec alike). */
const toleranceSettings = {
  kind: z.literal('tolerance'),
  samples: samplesSchema,
  tolerances: z.array(toleranceSchema).min(1, 'give at least one tolerance').max(MAX_TOLERANCES),
  /** Standard deviations a normal tolerance band spans (default 3: ±t = ±3σ). */
  normalSigmas: finite('normalSigmas').min(1).max(6).default(3),
  /** Left and right corners drawn independently (`both`), or the left alone with the right at nominal. */
  sides: z.enum(['both', 'left']).default('both'),
  setup: setupSchema.default({}),
};

/** Settings of a design sweep. */
const sweepSettings = {
  kind: z.literal('sweep'),
  /** Latin hypercube: this many variants; full factorial: the product of the levels (samples may be left out). */
  samples: samplesSchema.optional(),
  design: z.enum(['full-factorial', 'latin-hypercube']),
  factors: z.array(sweepFactorSchema).min(1).max(MAX_SWEEP_FACTORS),
  /** Which way "balance gained" counts: toward more understeer or toward less. */
  balanceDirection: z.enum(['more-understeer', 'less-understeer']),
};

const common = {
  label: z.string().trim().max(200).optional(),
  seed: seedSchema.optional(),
  analysis: studyAnalysisSchema.default({ travelPoints: 11, rackMm: [0], rollDeg: 2 }),
  /** Samples per chunk of work (default 500). */
  chunkSamples: z.number().int().min(10).max(10_000).optional(),
  cautionThresholds: thresholdsSchema.optional(),
};

/** The study's target, by id: an axle design or a configuration (revision: default the current one). */
export const studyTargetSchema = z.union([
  z.strictObject({ axleDesignId: z.uuid(), revision: z.number().int().positive().optional() }),
  z.strictObject({
    configurationId: z.uuid(),
    revision: z.number().int().positive().optional(),
    /** Which axle of the configuration the tolerances or factors apply to. */
    axle: z.enum(['front', 'rear']).default('front'),
  }),
]);

const requestTarget = { target: studyTargetSchema, trackProfile: trackProfileSchema.optional() };

/** What a user sends (HTTP body): the target named by id. */
export const studyRequestSchema = z.discriminatedUnion('kind', [
  z.strictObject({ ...common, ...requestTarget, ...toleranceSettings }),
  z.strictObject({ ...common, ...requestTarget, ...sweepSettings }),
]);
export type StudyRequest = z.infer<typeof studyRequestSchema>;

const vehicleDocumentSchema = z.preprocess((d) => upgradeVehicleDocument(d), vehicleSchema);

/** The resolved documents: the studied axle's corner, the vehicle, the other axle's corner (configurations) and the track profile. */
const specDocuments = {
  /** What the spec was resolved from (kept for the record; the worker does not read it). */
  target: studyTargetSchema.optional(),
  axle: z.enum(['front', 'rear']),
  corner: cornerDocumentSchema,
  /** Needed for the understeer-gradient change and for design sweeps. */
  vehicle: vehicleDocumentSchema.optional(),
  /** The other axle's corner (a configuration); absent: the vehicle's entered values stand for that axle. */
  otherCorner: cornerDocumentSchema.optional(),
  trackProfile: trackProfileSchema,
};

/** The fully resolved, self-contained study. */
export const studySpecSchema = z
  .discriminatedUnion('kind', [
    z.strictObject({ ...common, ...specDocuments, ...toleranceSettings, seed: seedSchema.default(1) }),
    z.strictObject({ ...common, ...specDocuments, ...sweepSettings, seed: seedSchema.default(1) }),
  ])
  .superRefine((s, ctx) => {
    if (s.kind === 'sweep' && !s.vehicle) ctx.addIssue({ code: 'custom', path: ['vehicle'], message: 'a design sweep needs the vehicle (balance gained is its understeer-gradient change)' });
  });
export type StudySpec = z.infer<typeof studySpecSchema>;
export type SweepSpec = Extract<StudySpec, { kind: 'sweep' }>;
