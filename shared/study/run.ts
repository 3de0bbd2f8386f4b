/**
 * Studies cut into chunks: plan, run one chunk (pure, deterministic), combine
 * the chunks into the result. A sample's inputs come from its own random
 * stream (random.ts), so results depend on the spec and its seed only, never
 * on the chunk size, the number of workers or the order they ran in.
 */
import { InputError, parseOrThrow } from '../errors.js';
import type { Corner, Vec3 } from '../schema/corner.js';
import { moveCornerPoints } from '../kinematics/index.js';
import { ENGINE_VERSION } from '../version.js';
import { ROAD_CLASS_WORDS } from '../ride/road.js';
import { factorLabel, StudyModel, type FactorInfo, type OutputDefinition, type PointMoves } from './engine.js';
import { permutation, stream, STREAM_LHS, STREAM_SAMPLE } from './random.js';
import { DEFAULT_CHUNK_SAMPLES, MAX_STUDY_SAMPLES, studySpecSchema, type StudySpec, type SweepSpec } from './schema.js';
import { histogram, leastSquares, paretoFront, summarise, wilson, type Histogram, type Summary } from './stats.js';
import type { AxleName } from '../schema/axle.js';

// ---------- preparation (cached per spec object) ----------

interface Prepared {
  spec: StudySpec;
  model: StudyModel;
  total: number;
  chunkSamples: number;
  lhs: Int32Array[] | null;
  /** A tolerance study's sample input, refilled for each sample (sampleInput): no objects made per sample. */
  input?: { build: { left: PointMoves; right: PointMoves | null } };
}

const prepared = new WeakMap<object, Prepared>();

/** Validates the spec (InputError naming the field) and builds its nominal model; cached per spec object. */
export function prepareStudy(input: StudySpec | unknown): Prepared {
  if (input && typeof input === 'object') {
    const hit = prepared.get(input);
    if (hit) return hit;
  }
  const spec = parseOrThrow(studySpecSchema, input, 'study spec');
  const total = totalSamples(spec);
  const model = new StudyModel(spec);
  const lhs = spec.kind === 'sweep' && spec.design === 'latin-hypercube' ? spec.factors.map((_, d) => permutation(total, spec.seed, STREAM_LHS, d)) : null;
  const p: Prepared = { spec, model, total, chunkSamples: spec.chunkSamples ?? DEFAULT_CHUNK_SAMPLES, lhs };
  if (input && typeof input === 'object') prepared.set(input, p);
  return p;
}

function totalSamples(spec: StudySpec): number {
  if (spec.kind === 'tolerance') return spec.samples;
  if (spec.design === 'latin-hypercube') {
    if (spec.samples === undefined) throw new InputError('samples: a Latin-hypercube sweep needs the number of variants', [{ path: 'samples', message: 'required for a Latin hypercube' }]);
    return spec.samples;
  }
  const n = spec.factors.reduce((a, f) => a * f.levels, 1);
  if (n > MAX_STUDY_SAMPLES) {
    throw new InputError(`factors: a full factorial of ${spec.factors.map((f) => f.levels).join(' × ')} = ${n} variants is more than ${MAX_STUDY_SAMPLES}; use fewer levels or a Latin hypercube`, [{ path: 'factors', message: `more than ${MAX_STUDY_SAMPLES} variants` }]);
  }
  if (spec.samples !== undefined && spec.samples !== n) {
    throw new InputError(`samples: a full factorial of these levels has ${n} variants, not ${spec.samples}; leave samples out`, [{ path: 'samples', message: `must be ${n} or left out` }]);
  }
  return n;
}

export interface StudyPlan {
  chunkCount: number;
  chunkSamples: number;
  totalSamples: number;
}

/** How the study is cut: chunks of `chunkSamples` samples (the last one may be shorter). */
export function planStudy(spec: StudySpec | unknown): StudyPlan {
  const p = prepareStudy(spec);
  return { chunkCount: Math.ceil(p.total / p.chunkSamples), chunkSamples: p.chunkSamples, totalSamples: p.total };
}

// ---------- the sampled inputs ----------

/** Sample `index`'s factor values into `x`: tolerance deviations (mm, vehicle frame of each side) or swept coordinates (mm). */
export function drawFactors(p: Prepared, index: number, x: Float64Array): void {
  const spec = p.spec;
  const st = stream(spec.seed, STREAM_SAMPLE, index);
  if (spec.kind === 'sweep') {
    const n = p.total;
    spec.factors.forEach((f, d) => {
      let u: number;
      if (p.lhs) u = (p.lhs[d]![index]! + st.unit()) / n;
      else {
        // Full factorial: mixed-radix digits, the last factor fastest.
        let rest = index;
        for (let k = spec.factors.length - 1; k > d; k--) rest = Math.floor(rest / spec.factors[k]!.levels);
        u = (rest % f.levels) / (f.levels - 1);
      }
      x[d] = f.fromMm + (f.toMm - f.fromMm) * u;
    });
    return;
  }
  let j = 0;
  const sides = spec.sides === 'both' ? 2 : 1;
  for (let s = 0; s < sides; s++) {
    for (const t of spec.tolerances) {
      if (t.distribution === 'normal') {
        const sigma = t.plusMinusMm / spec.normalSigmas;
        const k = t.axis === 'sphere' ? 3 : 1;
        for (let i = 0; i < k; i++) x[j++] = sigma * st.normal();
      } else if (t.axis === 'sphere') {
        // Uniform in the ball: rejection from the cube.
        let a: number, b: number, c: number;
        do {
          a = st.symmetric();
          b = st.symmetric();
          c = st.symmetric();
        } while (a * a + b * b + c * c > 1);
        x[j++] = t.plusMinusMm * a;
        x[j++] = t.plusMinusMm * b;
        x[j++] = t.plusMinusMm * c;
      } else x[j++] = t.plusMinusMm * st.symmetric();
    }
  }
}

/** A sample's input to the engine: the offsets of each side's points (toleranced build, left frame) or the variant's point positions (sweep). */
function sampleInput(p: Prepared, x: Float64Array): { build: { left: PointMoves; right: PointMoves | null } } | { variant: PointMoves } {
  const pts = p.model.corner.points as Record<string, Vec3>;
  if (p.spec.kind === 'sweep') {
    const variant: PointMoves = {};
    p.spec.factors.forEach((f, d) => {
      const q = variant[f.point] ?? [pts[f.point]![0], pts[f.point]![1], pts[f.point]![2]];
      q[StudyModel.axisIndex(f.axis)] = x[d]!;
      variant[f.point] = q;
    });
    return { variant };
  }
  const spec = p.spec;
  // Each toleranced point's offset, per side, summed over its factors (in factor order) from zero.
  if (!p.input) {
    const moves = () => Object.fromEntries<Vec3>(spec.tolerances.map((t) => [t.point, [0, 0, 0]]));
    p.input = { build: { left: moves(), right: spec.sides === 'both' ? moves() : null } };
  }
  const { left, right } = p.input.build;
  for (const m of [left, right]) if (m) for (const k in m) m[k]!.fill(0);
  const factors = p.model.factors;
  for (let j = 0; j < factors.length; j++) {
    const f = factors[j]!;
    const point = spec.tolerances[f.source]!.point;
    const ax = StudyModel.axisIndex(f.axis);
    // The right corner is solved in the left frame: its vehicle-frame y offset flips.
    if (f.side === 'left') left[point]![ax] += x[j]!;
    else right![point]![ax] += ax === 1 ? -x[j]! : x[j]!;
  }
  return p.input;
}

// ---------- chunks ----------

export interface StudyChunkResult {
  chunkIndex: number;
  /** Index of the chunk's first sample. */
  firstSample: number;
  samples: number;
  /** Poses solved (for throughput figures). */
  poses: number;
  /**
   * The samples' outputs, output by output (the result's `outputs` order): output k of the chunk's sample i
   * is values[k × samples + i]; NaN where the sample has none.
   */
  values: Float64Array;
  /** Samples whose geometry could not be solved, with the reason (first 20 of the chunk). */
  failures: { sample: number; message: string }[];
  failedCount: number;
}

/** Runs one chunk: pure and deterministic (depends only on the spec, its seed and chunkIndex). */
export function runStudyChunk(spec: StudySpec | unknown, chunkIndex: number): StudyChunkResult {
  const p = prepareStudy(spec);
  const plan = planStudy(spec);
  if (!Number.isInteger(chunkIndex) || chunkIndex < 0 || chunkIndex >= plan.chunkCount) {
    throw new InputError(`chunkIndex: ${chunkIndex} is not a chunk of this study (0 to ${plan.chunkCount - 1})`, [{ path: 'chunkIndex', message: 'out of range' }]);
  }
  const first = chunkIndex * plan.chunkSamples;
  const n = Math.min(plan.chunkSamples, plan.totalSamples - first);
  const m = p.model;
  const outs = m.outputs.length;
  const values = new Float64Array(outs * n);
  const x = new Float64Array(m.factors.length);
  const buf = new Float64Array(outs);
  const failures: { sample: number; message: string }[] = [];
  let failedCount = 0;
  let poses = 0;
  for (let i = 0; i < n; i++) {
    drawFactors(p, first + i, x);
    const r = m.evaluate(sampleInput(p, x), buf);
    poses += r.poses;
    if (r.error !== null) {
      failedCount++;
      if (failures.length < 20) failures.push({ sample: first + i, message: r.error });
    }
    for (let k = 0; k < outs; k++) {
      const v = buf[k]!;
      values[k * n + i] = Number.isFinite(v) ? v : NaN;
    }
  }
  return { chunkIndex, firstSample: first, samples: n, poses, values, failures, failedCount };
}

// ---------- a chunk between processes ----------

/**
 * A chunk as it travels between a study thread, PostgreSQL and the combine:
 * its counts and failures as JSON text, and its outputs as IEEE 754 doubles,
 * little-endian, in StudyChunkResult.values order (8 bytes a value, exact,
 * NaN for none): about 40 % of their size as JSON text, and nothing to parse.
 */
export interface ChunkWire {
  header: string;
  outputs: Uint8Array;
}

export function chunkToWire(c: StudyChunkResult): ChunkWire {
  const { values, ...rest } = c;
  const outputs = new Uint8Array(values.length * 8);
  const v = new DataView(outputs.buffer);
  for (let i = 0; i < values.length; i++) v.setFloat64(8 * i, values[i]!, true);
  return { header: JSON.stringify(rest), outputs };
}

/**
 * Back from the wire. `outputs` null: a chunk stored before outputs travelled as doubles, whose header
 * carries them as JSON (one array per output, null for none).
 */
export function chunkFromWire(header: string, outputs: Uint8Array | null): StudyChunkResult {
  const h = JSON.parse(header) as Omit<StudyChunkResult, 'values'> & { values?: (number | null)[][] };
  const { values: legacy, ...rest } = h;
  let values: Float64Array;
  if (outputs) {
    if (outputs.byteLength % 8 !== 0) throw new InputError(`chunks: chunk ${h.chunkIndex}'s outputs are ${outputs.byteLength} bytes, not whole doubles`, [{ path: 'chunks', message: 'damaged outputs' }]);
    values = new Float64Array(outputs.byteLength / 8);
    const v = new DataView(outputs.buffer, outputs.byteOffset, outputs.byteLength);
    for (let i = 0; i < values.length; i++) values[i] = v.getFloat64(8 * i, true);
  } else {
    const cols = legacy ?? [];
    values = new Float64Array(cols.length * h.samples);
    cols.forEach((col, k) => col.forEach((x, i) => (values[k * h.samples + i] = x ?? NaN)));
  }
  return { ...rest, values };
}

// ---------- combining ----------

export interface BreachProbability {
  code: string;
  level: 'info' | 'warning' | 'critical';
  threshold: number;
  /** The rule compares |value| with the threshold. */
  absolute: boolean;
  probability: number;
  /** 95 % Wilson score interval of the probability. */
  interval: [number, number];
}

export interface TornadoBar {
  factor: string;
  label: string;
  /** Standardized regression coefficient: change of the output in its standard deviations per standard deviation of the factor. */
  src: number;
}

export interface OutputResult extends OutputDefinition, Summary {
  /** The nominal design's value. */
  nominal: number | null;
  histogram: Histogram;
  breaches: BreachProbability[];
  /** Tolerance studies: factors by |SRC|, largest first; null when the fit is singular. */
  tornado: TornadoBar[] | null;
  /** R² of the linear fit behind the tornado (tolerance) or of the quadratic response surface (sweep). */
  r2: number | null;
}

export interface ResponseSurface {
  output: string;
  /** Terms in the factors scaled to [−1, 1] over their bounds: "1", "f", "f·g", "f²". */
  terms: string[];
  coefficients: number[];
  r2: number;
}

export interface MainEffect {
  factor: string;
  /** Bin centres of the factor, mm. */
  at: number[];
  /** Mean of each output over the variants in each bin, by output key (null for an empty bin). */
  means: Record<string, (number | null)[]>;
}

export interface VariantPoint {
  index: number;
  gainDegPerG: number;
  /** The bump cost, in the unit of the sweep's `costOutput`. */
  cost: number;
  factors: number[];
}

export interface StudyResult {
  kind: 'tolerance' | 'sweep';
  engineVersion: string;
  seed: number;
  totalSamples: number;
  validSamples: number;
  failedSamples: number;
  failures: { sample: number; message: string }[];
  poses: number;
  axle: AxleName;
  trackProfile: { id: string; label: string; bumpHeightMm: number; travelMm: [number, number]; roadClass: string; speedKph: number };
  /**
   * The bump cost: the ride model's RMS yaw-rate disturbance on the profile's ISO 8608 road (output
   * `bumpYawDisturbancePct`), or, without a vehicle with ride data, none (`output` null, `why` says what is missing).
   */
  bumpCost: { output: string | null; roadInWords: string; why: string | null };
  factors: FactorInfo[];
  outputs: OutputResult[];
  /** How the tornado ranks the tolerances (tolerance studies). */
  sensitivityMethod: string | null;
  percentileMethod: string;
  sweep: null | {
    design: 'full-factorial' | 'latin-hypercube';
    balanceDirection: 'more-understeer' | 'less-understeer';
    /** The output the Pareto front takes as the bump cost: the ride model's yaw disturbance, else the toe change over the bump. */
    costOutput: string;
    costUnit: string;
    surfaces: ResponseSurface[];
    mainEffects: MainEffect[];
    pareto: VariantPoint[];
    /** Up to 2000 variants spread evenly over the index, for the scatter behind the front. */
    scatter: VariantPoint[];
  };
}

/**
 * A stored result with its factors and tornado bars named as the engine names them now (`factorLabel`:
 * the point's name and the coordinate). Results stored before carry the point keys ("upperOuter z (left)").
 */
export function withFactorLabels(result: StudyResult, corner: Corner): StudyResult {
  const labels = new Map(
    result.factors.map((f) => {
      const parts = f.key.split('.');
      const point = (f.side === 'both' ? parts[0] : parts[1]) ?? f.key;
      return [f.key, factorLabel(corner, point, f.axis, f.side)] as const;
    }),
  );
  const named = (key: string, label: string) => labels.get(key) ?? label;
  return {
    ...result,
    factors: result.factors.map((f) => ({ ...f, label: named(f.key, f.label) })),
    outputs: result.outputs.map((o) => (o.tornado ? { ...o, tornado: o.tornado.map((t) => ({ ...t, label: named(t.factor, t.label) })) } : o)),
  };
}

export const SENSITIVITY_METHOD =
  'standardized regression coefficients (SRC): a linear least-squares fit of each output on every sampled tolerance coordinate; SRC = slope × SD(factor) ÷ SD(output), and R² says how much of the spread the linear fit explains';
export const PERCENTILE_METHOD = 'linear interpolation between order statistics (Hyndman & Fan type 7)';

/** Order-independent: sorts by chunkIndex; a missing or repeated chunk is an InputError naming it. */
export function combineStudyChunks(specInput: StudySpec | unknown, chunks: readonly StudyChunkResult[]): StudyResult {
  const p = prepareStudy(specInput);
  const plan = planStudy(specInput);
  const spec = p.spec;
  const m = p.model;
  const sorted = [...chunks].sort((a, b) => a.chunkIndex - b.chunkIndex);
  const seen = new Set<number>();
  for (const c of sorted) {
    if (seen.has(c.chunkIndex)) throw new InputError(`chunks: chunk ${c.chunkIndex} is given twice`, [{ path: 'chunks', message: `chunk ${c.chunkIndex} repeated` }]);
    seen.add(c.chunkIndex);
    const expected = Math.min(plan.chunkSamples, plan.totalSamples - c.chunkIndex * plan.chunkSamples);
    if (c.chunkIndex < 0 || c.chunkIndex >= plan.chunkCount || c.samples !== expected || c.values.length !== m.outputs.length * c.samples) {
      throw new InputError(`chunks: chunk ${c.chunkIndex} does not belong to this study's plan`, [{ path: 'chunks', message: `chunk ${c.chunkIndex} does not fit the plan` }]);
    }
  }
  for (let i = 0; i < plan.chunkCount; i++) if (!seen.has(i)) throw new InputError(`chunks: chunk ${i} of ${plan.chunkCount} is missing`, [{ path: 'chunks', message: `chunk ${i} missing` }]);

  const N = plan.totalSamples;
  const nOut = m.outputs.length;
  const cols = m.outputs.map(() => new Float64Array(N));
  let poses = 0;
  let failedSamples = 0;
  const failures: { sample: number; message: string }[] = [];
  for (const c of sorted) {
    poses += c.poses;
    failedSamples += c.failedCount;
    for (const f of c.failures) if (failures.length < 20) failures.push(f);
    for (let k = 0; k < nOut; k++) cols[k]!.set(c.values.subarray(k * c.samples, (k + 1) * c.samples), c.firstSample);
  }
  // Samples where every output is defined: the regressions' rows.
  const complete: number[] = [];
  for (let i = 0; i < N; i++) {
    let ok = true;
    for (let k = 0; k < nOut && ok; k++) ok = Number.isFinite(cols[k]![i]!);
    if (ok) complete.push(i);
  }
  const rows = Int32Array.from(complete);
  // The sampled inputs, regenerated from the seed.
  const P = m.factors.length;
  const X = new Float64Array(N * P);
  const x = new Float64Array(P);
  for (let i = 0; i < N; i++) {
    drawFactors(p, i, x);
    X.set(x, i * P);
  }
  // The nominal design, for reference.
  const nominal = new Float64Array(nOut);
  m.evaluate(spec.kind === 'tolerance' ? { build: { left: {}, right: null } } : { variant: {} }, nominal);

  const tol = spec.kind === 'tolerance' && rows.length > P + 1 ? leastSquares(X, P, rows, cols) : null;
  let surfaces: ResponseSurface[] = [];
  let surfaceFits: (number | null)[] = m.outputs.map(() => null);
  if (spec.kind === 'sweep') {
    const q = quadraticSurfaces(spec, X, P, rows, cols, m.outputs);
    surfaces = q.surfaces;
    surfaceFits = q.r2;
  }

  const outputs: OutputResult[] = m.outputs.map((o, k) => {
    const col = cols[k]!;
    const vals: number[] = [];
    for (let i = 0; i < N; i++) if (Number.isFinite(col[i]!)) vals.push(col[i]!);
    const s = Float64Array.from(vals).sort();
    const summary = s.length ? summarise(s) : { n: 0, mean: NaN, sd: NaN, min: NaN, max: NaN, p5: NaN, p50: NaN, p95: NaN };
    const breaches: BreachProbability[] = [];
    if (o.breach && s.length) {
      for (const level of ['info', 'warning', 'critical'] as const) {
        const th = o.breach.thresholds[level];
        if (th === undefined) continue;
        let hits = 0;
        for (let i = 0; i < s.length; i++) if ((o.breach.absolute ? Math.abs(s[i]!) : s[i]!) >= th) hits++;
        breaches.push({ code: o.breach.code, level, threshold: th, absolute: o.breach.absolute, probability: hits / s.length, interval: wilson(hits, s.length) });
      }
    }
    let tornado: TornadoBar[] | null = null;
    let r2: number | null = surfaceFits[k] ?? null;
    if (tol) {
      const fit = tol.fits[k];
      if (fit) {
        r2 = fit.r2;
        tornado = m.factors
          .map((f, j) => ({ factor: f.key, label: f.label, src: (fit.coefficients[j]! * tol.xSd[j]!) / tol.ySd[k]! }))
          .sort((a, b) => Math.abs(b.src) - Math.abs(a.src));
      }
    }
    const nv = nominal[k]!;
    return {
      ...o,
      ...summary,
      nominal: Number.isFinite(nv) ? nv : null,
      histogram: s.length ? histogram(s) : { from: 0, width: 0, counts: [] },
      breaches,
      tornado,
      r2,
    };
  });

  let sweep: StudyResult['sweep'] = null;
  if (spec.kind === 'sweep') {
    const gain = cols[m.index['balanceGainDegPerG']!]!;
    const costOutput = m.ride ? 'bumpYawDisturbancePct' : 'bumpToeChangeDeg';
    const cost = cols[m.index[costOutput]!]!;
    const point = (i: number): VariantPoint => ({ index: i, gainDegPerG: gain[i]!, cost: cost[i]!, factors: Array.from(X.subarray(i * P, i * P + P)) });
    const front = paretoFront(gain, cost, rows);
    const step = Math.max(1, Math.ceil(rows.length / 2000));
    const scatter: VariantPoint[] = [];
    for (let i = 0; i < rows.length; i += step) scatter.push(point(rows[i]!));
    sweep = {
      design: spec.design,
      balanceDirection: spec.balanceDirection,
      costOutput,
      costUnit: m.outputs[m.index[costOutput]!]!.unit,
      surfaces,
      mainEffects: mainEffects(spec, X, P, rows, cols, m.outputs),
      pareto: front.slice(0, 1000).map(point),
      scatter,
    };
  }
  const profile = m.profile;
  return {
    kind: spec.kind,
    engineVersion: ENGINE_VERSION,
    seed: spec.seed,
    totalSamples: N,
    validSamples: N - failedSamples,
    failedSamples,
    failures,
    poses,
    axle: spec.axle,
    trackProfile: {
      id: profile.id,
      label: profile.label,
      bumpHeightMm: profile.bumpHeightMm,
      travelMm: [m.travels[0]!, m.travels[m.travels.length - 1]!],
      roadClass: profile.roadClass,
      speedKph: profile.speedKph,
    },
    bumpCost: {
      output: m.ride ? 'bumpYawDisturbancePct' : null,
      roadInWords: `${ROAD_CLASS_WORDS[profile.roadClass]} at ${profile.speedKph} km/h`,
      why: m.rideWhy,
    },
    factors: m.factors,
    outputs,
    sensitivityMethod: spec.kind === 'tolerance' ? SENSITIVITY_METHOD : null,
    percentileMethod: PERCENTILE_METHOD,
    sweep,
  };
}

function quadraticSurfaces(spec: SweepSpec, X: Float64Array, P: number, rows: Int32Array, cols: Float64Array[], outputs: OutputDefinition[]): { surfaces: ResponseSurface[]; r2: (number | null)[] } {
  // Terms in z = 2(x − from)/(to − from) − 1: linear, then products f·g (g after f), then squares where a factor has 3 levels or more.
  const names = spec.factors.map((f) => `${f.point}.${f.axis}`);
  const terms: { name: string; a: number; b: number }[] = names.map((n, i) => ({ name: n, a: i, b: -1 }));
  for (let i = 0; i < P; i++) for (let j = i + 1; j < P; j++) terms.push({ name: `${names[i]}·${names[j]}`, a: i, b: j });
  for (let i = 0; i < P; i++) if (spec.design === 'latin-hypercube' || spec.factors[i]!.levels >= 3) terms.push({ name: `${names[i]}²`, a: i, b: i });
  const T = terms.length;
  const N = X.length / P;
  const Z = new Float64Array(N * T);
  const z = new Float64Array(P);
  for (const r of rows) {
    for (let i = 0; i < P; i++) {
      const f = spec.factors[i]!;
      z[i] = (2 * (X[r * P + i]! - f.fromMm)) / (f.toMm - f.fromMm) - 1;
    }
    terms.forEach((t, k) => (Z[r * T + k] = t.b < 0 ? z[t.a]! : z[t.a]! * z[t.b]!));
  }
  if (rows.length <= T + 1) return { surfaces: [], r2: outputs.map(() => null) };
  const fit = leastSquares(Z, T, rows, cols);
  const surfaces: ResponseSurface[] = [];
  const r2: (number | null)[] = [];
  outputs.forEach((o, k) => {
    const f = fit.fits[k];
    if (!f) {
      r2.push(null);
      return;
    }
    // Intercept from the centred fit: mean(y) − Σ c·mean(term).
    let mean = 0;
    for (const r of rows) mean += cols[k]![r]!;
    mean /= rows.length;
    let c0 = mean;
    for (let t = 0; t < T; t++) c0 -= f.coefficients[t]! * fit.xMean[t]!;
    surfaces.push({ output: o.key, terms: ['1', ...terms.map((t) => t.name)], coefficients: [c0, ...Array.from(f.coefficients)], r2: f.r2 });
    r2.push(f.r2);
  });
  return { surfaces, r2 };
}

function mainEffects(spec: SweepSpec, X: Float64Array, P: number, rows: Int32Array, cols: Float64Array[], outputs: OutputDefinition[]): MainEffect[] {
  return spec.factors.map((f, d) => {
    const bins = spec.design === 'full-factorial' ? f.levels : 10;
    const at = Array.from({ length: bins }, (_, b) => (spec.design === 'full-factorial' ? f.fromMm + ((f.toMm - f.fromMm) * b) / (bins - 1) : f.fromMm + ((f.toMm - f.fromMm) * (b + 0.5)) / bins));
    const binOf = (v: number) => (spec.design === 'full-factorial' ? Math.round(((v - f.fromMm) / (f.toMm - f.fromMm)) * (bins - 1)) : Math.min(bins - 1, Math.floor(((v - f.fromMm) / (f.toMm - f.fromMm)) * bins)));
    const means: Record<string, (number | null)[]> = {};
    outputs.forEach((o, k) => {
      const sum = new Float64Array(bins);
      const cnt = new Float64Array(bins);
      for (const r of rows) {
        const b = binOf(X[r * P + d]!);
        sum[b]! += cols[k]![r]!;
        cnt[b]!++;
      }
      means[o.key] = Array.from(sum, (s, b) => (cnt[b]! > 0 ? s / cnt[b]! : null));
    });
    return { factor: `${f.point}.${f.axis}`, at, means };
  });
}

/** The corner of design-sweep variant `index` (a complete corner document), to open as a proposal. */
export function variantCorner(specInput: StudySpec | unknown, index: number): Corner {
  const p = prepareStudy(specInput);
  if (p.spec.kind !== 'sweep') throw new InputError('kind: only a design sweep has variants', [{ path: 'kind', message: 'not a design sweep' }]);
  if (!Number.isInteger(index) || index < 0 || index >= p.total) {
    throw new InputError(`index: ${index} is not a variant of this sweep (0 to ${p.total - 1})`, [{ path: 'index', message: 'out of range' }]);
  }
  const x = new Float64Array(p.model.factors.length);
  drawFactors(p, index, x);
  const input = sampleInput(p, x);
  return structuredClone(moveCornerPoints(p.model.corner, { points: 'variant' in input ? input.variant : {} }));
}

/** The factor values of a variant or sample (mm), by factor key. */
export function sampleFactors(specInput: StudySpec | unknown, index: number): Record<string, number> {
  const p = prepareStudy(specInput);
  const x = new Float64Array(p.model.factors.length);
  drawFactors(p, index, x);
  return Object.fromEntries(p.model.factors.map((f, j) => [f.key, x[j]!]));
}
