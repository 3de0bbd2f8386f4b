/**
 * Determinism, chunking and the design-sweep machinery. Sources: issue 16
 * ("results are deterministic for a given seed, whatever the number and
 * order of workers"); Latin hypercube sampling puts exactly one point in
 * each of the n equal strata of every factor (McKay, Beckman & Conover
 * 1979, from memory); the Pareto front is the set of points no other point
 * beats on both objectives (common practice); Wilson's score interval
 * (Wilson 1927, from memory; 0 of 100 gives an upper bound z²/(n + z²));
 * percentiles by linear interpolation, Hyndman & Fan type 7 (from memory);
 * a chunk's outputs travel as IEEE 754 binary64 values, which hold every
 * double exactly, NaN included (IEEE 754-2008, common practice).
 */
import { describe, expect, it } from 'vitest';
import { exampleCorners, compileCorner } from '../../../shared/kinematics/index.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { InputError } from '../../../shared/errors.js';
import { planStudy, runStudyChunk, combineStudyChunks, chunkToWire, chunkFromWire, sampleFactors, variantCorner, studyResultCsv, studyRequestSchema, studySpecSchema } from '../../../shared/study/index.js';
import { paretoFront, percentile, wilson } from '../../../shared/study/stats.js';

const tolerance = {
  kind: 'tolerance',
  axle: 'front',
  corner: exampleCorners.fsFrontWishbone,
  vehicle: exampleVehicles.tur26Ember,
  trackProfile: 'smooth-circuit',
  samples: 120,
  seed: 42,
  tolerances: [
    { point: 'tieRodInner', axis: 'sphere', plusMinusMm: 0.5, distribution: 'normal' },
    { point: 'lowerRear', axis: 'y', plusMinusMm: 0.5, distribution: 'uniform' },
  ],
  setup: { camberShimMm: 0.5, toeAdjusterStepMm: 0.375 },
  analysis: { rackMm: [0, 10] },
};

/** A chunk as the combine gets it: through the wire format the workers store. */
function travelled(c: ReturnType<typeof runStudyChunk>) {
  const w = chunkToWire(c);
  return chunkFromWire(w.header, w.outputs);
}

function all(spec: unknown, order?: (n: number) => number[]) {
  const plan = planStudy(spec);
  const idx = order ? order(plan.chunkCount) : Array.from({ length: plan.chunkCount }, (_, i) => i);
  return idx.map((i) => travelled(runStudyChunk(spec, i)));
}

describe('determinism', { timeout: 120_000 }, () => {
  it('same seed, any chunk order → the same result; different chunk sizes agree exactly', () => {
    const a = { ...tolerance, chunkSamples: 25 };
    const forward = combineStudyChunks(a, all(a));
    const shuffled = combineStudyChunks(a, all(a, (n) => Array.from({ length: n }, (_, i) => (i * 3) % n).reverse()));
    expect(planStudy(a).chunkCount).toBe(5);
    expect(shuffled).toEqual(forward);
    const b = { ...tolerance, chunkSamples: 120 };
    const c = { ...tolerance, chunkSamples: 40 };
    expect(combineStudyChunks(b, all(b))).toEqual(forward);
    expect(combineStudyChunks(c, all(c))).toEqual(forward);
    // A chunk run twice (a retried worker) gives the same numbers.
    expect(travelled(runStudyChunk(a, 3))).toEqual(all(a)[3]);
  });

  it('a chunk travels exactly: every double, NaN where a sample has no value, its counts and failures', () => {
    const c = runStudyChunk({ ...tolerance, chunkSamples: 40 }, 1);
    const odd = Float64Array.from([Math.PI, -0, 5e-324, -1.7976931348623157e308, NaN, 0.1 + 0.2]);
    const withOdd = { ...c, values: Float64Array.from([...odd, ...c.values.subarray(odd.length)]), failures: [{ sample: 41, message: 'Pose unreachable at travel 12 mm' }], failedCount: 1 };
    const w = chunkToWire(withOdd);
    expect(w.outputs.byteLength).toBe(8 * c.values.length);
    const back = chunkFromWire(w.header, w.outputs);
    expect(back).toEqual(withOdd);
    for (let i = 0; i < odd.length; i++) expect(Object.is(back.values[i], odd[i])).toBe(true);
    // Cut short in storage: refused, not read as other numbers.
    expect(() => chunkFromWire(w.header, w.outputs.subarray(0, w.outputs.byteLength - 3))).toThrow(/not whole doubles/);
  });

  it('a chunk stored before outputs travelled as doubles (one JSON array per output, null for none) still combines', () => {
    const a = { ...tolerance, chunkSamples: 40 };
    const chunks = all(a);
    const legacy = chunks.map((c) => {
      const { values, ...rest } = c;
      const cols = Array.from({ length: values.length / c.samples }, (_, k) => Array.from(values.subarray(k * c.samples, (k + 1) * c.samples), (v) => (Number.isNaN(v) ? null : v)));
      return chunkFromWire(JSON.stringify({ ...rest, values: cols }), null);
    });
    expect(legacy).toEqual(chunks);
    expect(combineStudyChunks(a, legacy)).toEqual(combineStudyChunks(a, chunks));
  });

  it('another seed gives other samples', () => {
    const r1 = combineStudyChunks(tolerance, all(tolerance));
    const s2 = { ...tolerance, seed: 43 };
    const r2 = combineStudyChunks(s2, all(s2));
    expect(r2.outputs[0]!.mean).not.toBe(r1.outputs[0]!.mean);
    expect(sampleFactors(tolerance, 7)).not.toEqual(sampleFactors(s2, 7));
  });

  it('a missing or repeated chunk is an error naming the chunk', () => {
    const a = { ...tolerance, chunkSamples: 40 };
    const chunks = all(a);
    expect(() => combineStudyChunks(a, chunks.slice(1))).toThrow(/chunk 0 of 3 is missing/);
    expect(() => combineStudyChunks(a, [...chunks, chunks[1]!])).toThrow(/chunk 1 is given twice/);
    expect(() => runStudyChunk(a, 3)).toThrow(InputError);
  });
});

describe('design sweep', { timeout: 120_000 }, () => {
  const sweep = {
    kind: 'sweep',
    axle: 'rear',
    corner: exampleCorners.fsRearWishbone,
    vehicle: exampleVehicles.tur26Ember,
    trackProfile: 'bumpy-circuit',
    design: 'latin-hypercube',
    samples: 40,
    seed: 3,
    balanceDirection: 'more-understeer',
    factors: [
      { point: 'tieRodInner', axis: 'z', fromMm: 150, toMm: 175 },
      { point: 'tieRodOuter', axis: 'z', fromMm: 180, toMm: 200 },
      { point: 'tieRodInner', axis: 'y', fromMm: 220, toMm: 240 },
    ],
  };

  it('Latin hypercube: exactly one variant in each of the n strata of every factor', () => {
    const n = 40;
    for (const [k, f] of sweep.factors.entries()) {
      const strata = new Set<number>();
      for (let i = 0; i < n; i++) {
        const v = Object.values(sampleFactors(sweep, i))[k]!;
        expect(v).toBeGreaterThanOrEqual(f.fromMm);
        expect(v).toBeLessThan(f.toMm);
        strata.add(Math.floor(((v - f.fromMm) / (f.toMm - f.fromMm)) * n));
      }
      expect(strata.size).toBe(n);
    }
  });

  it('full factorial: every combination of the levels once, the last factor fastest', () => {
    const ff = { ...sweep, design: 'full-factorial', samples: undefined, factors: [{ point: 'tieRodInner', axis: 'z', fromMm: 150, toMm: 170, levels: 3 }, { point: 'tieRodOuter', axis: 'z', fromMm: 180, toMm: 190, levels: 2 }] };
    expect(planStudy(ff).totalSamples).toBe(6);
    const got = Array.from({ length: 6 }, (_, i) => Object.values(sampleFactors(ff, i)));
    expect(got).toEqual([[150, 180], [150, 190], [160, 180], [160, 190], [170, 180], [170, 190]]);
    expect(() => planStudy({ ...ff, samples: 12 })).toThrow(/has 6 variants, not 12/);
  });

  it('runs, ranks variants on the Pareto front and opens any variant as a corner', () => {
    const plan = planStudy(sweep);
    const r = combineStudyChunks(sweep, Array.from({ length: plan.chunkCount }, (_, i) => runStudyChunk(sweep, i)));
    expect(r.failedSamples).toBe(0);
    const front = r.sweep!.pareto;
    expect(front.length).toBeGreaterThan(0);
    // No variant in the scatter beats a front member on both counts.
    for (const f of front) for (const v of r.sweep!.scatter) expect(v.gainDegPerG > f.gainDegPerG && v.cost < f.cost).toBe(false);
    const v = variantCorner(sweep, front[0]!.index);
    const pts = v.points as Record<string, [number, number, number]>;
    expect(pts['tieRodInner']![2]).toBeCloseTo(front[0]!.factors[0]!, 12);
    expect(pts['tieRodOuter']![2]).toBeCloseTo(front[0]!.factors[1]!, 12);
    expect(() => compileCorner(v)).not.toThrow();
    expect(() => variantCorner(sweep, 40)).toThrow(/not a variant/);
    expect(r.sweep!.surfaces.find((s) => s.output === 'rollSteerCoefficient')!.r2).toBeGreaterThan(0.95);
    const csv = studyResultCsv(sweep as never, r);
    expect(csv).toContain('balance gained (deg/g)');
    expect(csv).toContain('Verify on a kinematics rig');
  });
});

describe('statistics helpers', () => {
  it('Pareto front of a hand example', () => {
    // (gain, cost): A(1,1) B(2,2) C(1.5,3) D(3,3) E(0.5,0.5) F(3,4) G(2,2)
    const gain = [1, 2, 1.5, 3, 0.5, 3, 2];
    const cost = [1, 2, 3, 3, 0.5, 4, 2];
    expect(paretoFront(gain, cost, [0, 1, 2, 3, 4, 5, 6])).toEqual([4, 0, 1, 3]);
  });

  it('Wilson interval and type-7 percentiles', () => {
    expect(wilson(0, 100)[1]).toBeCloseTo(1.96 ** 2 / (100 + 1.96 ** 2), 12);
    const [lo, hi] = wilson(50, 100);
    expect(lo).toBeLessThan(0.5);
    expect(hi).toBeCloseTo(1 - lo, 12);
    expect(percentile([1, 2, 3, 4], 0.5)).toBe(2.5);
    expect(percentile([1, 2, 3, 4], 0.05)).toBeCloseTo(1.15, 12);
  });

  it('formula-safe CSV: a label that starts with = is written as text', () => {
    const r = combineStudyChunks(tolerance, all(tolerance));
    const csv = studyResultCsv({ kind: 'tolerance', label: '=HYPERLINK("x")' }, r);
    expect(csv).toContain(`"'=HYPERLINK(""x"")"`);
  });
});

describe('schemas name the field', () => {
  it('an unknown point, a fixed point and too many samples', () => {
    expect(() => planStudy({ ...tolerance, tolerances: [{ point: 'lowerFrnt', axis: 'z', plusMinusMm: 1, distribution: 'normal' }] })).toThrow(/tolerances\[0\]\.point: "lowerFrnt" is not a point/);
    expect(() => planStudy({ ...tolerance, tolerances: [{ point: 'wheelCentre', axis: 'z', plusMinusMm: 1, distribution: 'normal' }] })).toThrow(/tolerances\[0\]\.point: wheelCentre/);
    const r = studySpecSchema.safeParse({ ...tolerance, samples: 100_001 });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.path).toEqual(['samples']);
    const q = studyRequestSchema.safeParse({ kind: 'sweep', target: { configurationId: '0b6f5f35-64ff-4f0e-9fc6-7f0f8a0b8d8e' }, design: 'latin-hypercube', samples: 50, factors: [], balanceDirection: 'less-understeer' });
    expect(q.success).toBe(false);
    expect(q.error!.issues[0]!.path).toEqual(['factors']);
  });
});
