/**
 * Tolerance studies against closed forms. Sources: a linear response to
 * independent tolerances has SD = √Σ(sᵢσᵢ)² (propagation of uncertainty,
 * common practice / "root-sum-square" tolerance stack-up, from memory); a
 * uniform tolerance on [−a, a] has variance a²/3 and a uniform point in a
 * ball of radius a has variance a²/5 per coordinate (from memory); the
 * sample SD of n normal values has relative standard error ≈ 1/√(2(n − 1))
 * (from memory). Every statistical bound below is 4 standard errors
 * (two-sided probability of a false failure ≈ 6·10⁻⁵); the runs are
 * seeded, so a pass or a failure repeats exactly.
 */
import { describe, expect, it } from 'vitest';
import { exampleCorners, rollSteerCoefficient, axleSummary, rollSweep } from '../../../shared/kinematics/index.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { planStudy, runStudyChunk, combineStudyChunks, prepareStudy, sampleFactors, type StudySpec } from '../../../shared/study/index.js';

const corner = exampleCorners.fsFrontWishbone;

function run(spec: unknown) {
  const plan = planStudy(spec);
  return combineStudyChunks(spec, Array.from({ length: plan.chunkCount }, (_, i) => runStudyChunk(spec, i)));
}

/** One output of the engine for one build with the given left offsets (left frame, mm). */
function outputFor(spec: StudySpec | unknown, key: string, offsets: Record<string, [number, number, number]>): number {
  const p = prepareStudy(spec);
  const out = new Float64Array(p.model.outputs.length);
  const r = p.model.evaluate({ build: { left: offsets, right: null } }, out);
  expect(r.error).toBeNull();
  return out[p.model.index[key]!]!;
}

const out = (r: ReturnType<typeof run>, key: string) => r.outputs.find((o) => o.key === key)!;

describe('tolerance study: closed forms', { timeout: 120_000 }, () => {
  const tolerances = [
    { point: 'tieRodInner', axis: 'z', plusMinusMm: 0.06, distribution: 'normal' },
    { point: 'tieRodOuter', axis: 'y', plusMinusMm: 0.03, distribution: 'normal' },
    { point: 'lowerFront', axis: 'z', plusMinusMm: 0.09, distribution: 'normal' },
  ] as const;
  const spec = { kind: 'tolerance', axle: 'front', corner, trackProfile: 'smooth-circuit', samples: 3000, seed: 11, sides: 'left', chunkSamples: 1000, tolerances };

  it('a linear response to normal tolerances has SD = √Σ(sᵢσᵢ)² (static toe and bump steer)', () => {
    const r = run(spec);
    expect(r.failedSamples).toBe(0);
    for (const key of ['staticToeDeg', 'bumpSteerDegPerM']) {
      // Sensitivities by central differences of the same engine, one coordinate at a time (the response is linear over ±0.1 mm: checked below).
      let variance = 0;
      for (const t of tolerances) {
        const h = 0.01;
        const ax = { x: 0, y: 1, z: 2 }[t.axis];
        const d: [number, number, number] = [0, 0, 0];
        d[ax] = h;
        const up = outputFor(spec, key, { [t.point]: [...d] as [number, number, number] });
        d[ax] = -h;
        const down = outputFor(spec, key, { [t.point]: [...d] as [number, number, number] });
        const s = (up - down) / (2 * h);
        // Linearity over the tolerance band: the response at +3σ matches the slope to 1 %.
        d[ax] = t.plusMinusMm;
        const far = outputFor(spec, key, { [t.point]: [...d] as [number, number, number] }) - outputFor(spec, key, {});
        expect(Math.abs(far - s * t.plusMinusMm)).toBeLessThan(0.01 * Math.abs(s * t.plusMinusMm) + 1e-12);
        const sigma = t.plusMinusMm / 3;
        variance += (s * sigma) ** 2;
      }
      const expected = Math.sqrt(variance);
      const got = out(r, key).sd;
      const relSe = 1 / Math.sqrt(2 * (3000 - 1));
      expect(Math.abs(got / expected - 1)).toBeLessThan(4 * relSe);
      // And the mean sits on the nominal within 4 standard errors of the mean.
      expect(Math.abs(out(r, key).mean - out(r, key).nominal!)).toBeLessThan((4 * expected) / Math.sqrt(3000));
    }
  });

  it('the tornado ranks the coordinate that moves the output most first (SRC², summing to R², from the linear fit)', () => {
    const r = run(spec);
    const toe = out(r, 'staticToeDeg');
    expect(r.sensitivityMethod).toMatch(/standardized regression coefficients/);
    expect(toe.r2).toBeGreaterThan(0.999);
    const sum = toe.tornado!.reduce((a, b) => a + b.src ** 2, 0);
    // For uncorrelated factors the squared SRCs add up to R² (within sampling correlation of the draws).
    expect(Math.abs(sum - toe.r2!)).toBeLessThan(0.05);
    const expectedFirst = (() => {
      let best = '';
      let size = -1;
      for (const t of tolerances) {
        const ax = { x: 0, y: 1, z: 2 }[t.axis];
        const d: [number, number, number] = [0, 0, 0];
        d[ax] = t.plusMinusMm / 3;
        const e = Math.abs(outputFor(spec, 'staticToeDeg', { [t.point]: d }) - outputFor(spec, 'staticToeDeg', {}));
        if (e > size) (size = e), (best = `left.${t.point}.${t.axis}`);
      }
      return best;
    })();
    expect(toe.tornado![0]!.factor).toBe(expectedFirst);
  });

  it('uniform tolerances: variance a²/3 per coordinate, a²/5 per coordinate in a ball; normal: (±t / sigmas)²', () => {
    const n = 20_000;
    const s2 = {
      kind: 'tolerance', axle: 'front', corner, trackProfile: 'smooth-circuit', samples: n, seed: 5, sides: 'left', normalSigmas: 2,
      tolerances: [
        { point: 'tieRodInner', axis: 'z', plusMinusMm: 0.4, distribution: 'uniform' },
        { point: 'upperOuter', axis: 'sphere', plusMinusMm: 0.5, distribution: 'uniform' },
        { point: 'lowerFront', axis: 'x', plusMinusMm: 0.8, distribution: 'normal' },
      ],
    };
    const cols: Record<string, number[]> = {};
    for (let i = 0; i < n; i++) for (const [k, v] of Object.entries(sampleFactors(s2, i))) (cols[k] ??= []).push(v);
    const variance = (v: number[]) => {
      const m = v.reduce((a, b) => a + b, 0) / v.length;
      return v.reduce((a, b) => a + (b - m) ** 2, 0) / (v.length - 1);
    };
    const a = 0.4;
    // SE of the sample variance of U(−a, a): √(Var(X²)/n) with Var(X²) = a⁴/5 − a⁴/9.
    expect(Math.abs(variance(cols['left.tieRodInner.z']!) - a * a / 3)).toBeLessThan(4 * Math.sqrt((a ** 4 * (1 / 5 - 1 / 9)) / n));
    for (const ax of ['x', 'y', 'z']) {
      const v = cols[`left.upperOuter.${ax}`]!;
      expect(Math.abs(variance(v) / (0.25 / 5) - 1)).toBeLessThan(0.05);
      expect(Math.max(...v.map(Math.abs))).toBeLessThanOrEqual(0.5);
    }
    const r = v3norm(cols['left.upperOuter.x']!, cols['left.upperOuter.y']!, cols['left.upperOuter.z']!);
    expect(Math.max(...r)).toBeLessThanOrEqual(0.5);
    // Normal: σ = 0.8 / 2; the sample variance of n normal values has relative SE √(2/(n − 1)).
    expect(Math.abs(variance(cols['left.lowerFront.x']!) / 0.16 - 1)).toBeLessThan(4 * Math.sqrt(2 / (n - 1)));
  });

  it('a single uniform tolerance gives the output SD |s|·a/√3', () => {
    const a = 0.09;
    const s3 = { kind: 'tolerance', axle: 'front', corner, trackProfile: 'smooth-circuit', samples: 3000, seed: 3, sides: 'left', tolerances: [{ point: 'tieRodInner', axis: 'z', plusMinusMm: a, distribution: 'uniform' }] };
    const res = run(s3);
    const h = 0.01;
    const s = (outputFor(s3, 'bumpSteerDegPerM', { tieRodInner: [0, 0, h] }) - outputFor(s3, 'bumpSteerDegPerM', { tieRodInner: [0, 0, -h] })) / (2 * h);
    const expected = (Math.abs(s) * a) / Math.sqrt(3);
    // Relative SE of the sample SD of a uniform variable: ½·√((κ − 1)/n) with kurtosis κ = 9/5.
    expect(Math.abs(out(res, 'bumpSteerDegPerM').sd / expected - 1)).toBeLessThan(4 * 0.5 * Math.sqrt(0.8 / 3000));
  });
});

function v3norm(x: number[], y: number[], z: number[]): number[] {
  return x.map((_, i) => Math.hypot(x[i]!, y[i]!, z[i]!));
}

describe('tolerance study: the nominal build is the axle as the kinematics engine solves it', () => {
  it('ε, roll camber, roll centre and its height at the roll of the sweep match shared/kinematics', () => {
    const spec = { kind: 'tolerance', axle: 'front', corner, trackProfile: 'smooth-circuit', samples: 10, tolerances: [{ point: 'tieRodInner', axis: 'z', plusMinusMm: 0.1, distribution: 'normal' }], analysis: { rollDeg: 2 } };
    const r = run(spec);
    const s = axleSummary(corner);
    // Same equations through another path (axleSummary / rollSweep): agreement to rounding.
    expect(out(r, 'rollSteerCoefficient').nominal).toBeCloseTo(rollSteerCoefficient(corner), 10);
    expect(out(r, 'rollCamberDegPerDeg').nominal).toBeCloseTo(s.rollCamberDegPerDeg, 10);
    expect(out(r, 'rollCentreHeightMm').nominal).toBeCloseTo(s.rollCentreHeightMm, 8);
    const roll = rollSweep(corner, { roll: { from: -2, to: 2, step: 2 } });
    expect(out(r, 'rollCentreHeightAtRollMm').nominal).toBeCloseTo(roll.rows.find((x) => x.rollDeg === 2)!.rollCentreHeightMm!, 8);
    // The secant over ±2° from the sweep's mean steer: ε_sec = −(δ̄(2°) − δ̄(−2°)) / 4°.
    const d = (phi: number) => roll.rows.find((x) => x.rollDeg === phi)!.axleSteerDeg;
    expect(out(r, 'rollSteerSecantDegPerDeg').nominal).toBeCloseTo(-(d(2) - d(-2)) / 4, 10);
  });

  it('the understeer-gradient change of a build follows the balance model (first order agrees with the exact re-evaluation)', () => {
    const spec = { kind: 'tolerance', axle: 'rear', corner: exampleCorners.fsRearWishbone, vehicle: exampleVehicles.tur26Ember, trackProfile: 'smooth-circuit', samples: 10, tolerances: [{ point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }] };
    const p = prepareStudy(spec);
    const o = new Float64Array(p.model.outputs.length);
    p.model.evaluate({ build: { left: { tieRodInner: [0, 0, 0.5] }, right: { tieRodInner: [0, 0, 0.5] } } }, o);
    const linear = o[p.model.index['understeerGradientChangeDegPerG']!]!;
    expect(Math.abs(linear)).toBeGreaterThan(1e-3);
    // Exact: the balance model re-evaluated at the build's own axle values.
    const vLinked = p.model.linked!.vehicle;
    return import('../../../shared/balance/understeer.js').then(({ balanceCore, understeerBudget }) => {
      const k = (v: typeof vLinked) => understeerBudget(balanceCore(v)).understeerBudget.total;
      const axle = { ...vLinked.rear, rollSteerCoefficient: o[p.model.index['rollSteerCoefficient']!]!, rollCamberDegPerDeg: o[p.model.index['rollCamberDegPerDeg']!]!, rollCentreHeightMm: o[p.model.index['rollCentreHeightMm']!]! };
      const exact = k({ ...vLinked, rear: axle }) - k(vLinked);
      expect(Math.abs(linear - exact)).toBeLessThan(0.01 * Math.abs(exact));
    });
  });
});

describe('workshop set-up', { timeout: 120_000 }, () => {
  const base = { kind: 'tolerance', axle: 'front', corner, trackProfile: 'smooth-circuit', samples: 200, seed: 9, tolerances: [{ point: 'upperFront', axis: 'sphere', plusMinusMm: 1, distribution: 'normal' }, { point: 'tieRodInner', axis: 'sphere', plusMinusMm: 1, distribution: 'normal' }] };

  it('continuous shims and adjuster bring static toe and camber back to nominal (first-order set-up: residual of second order)', () => {
    const free = run(base);
    const set = run({ ...base, setup: { camberShimMm: 0, toeAdjusterStepMm: 0 } });
    expect(out(free, 'staticToeDeg').sd).toBeGreaterThan(0.02);
    expect(out(set, 'staticToeDeg').sd).toBeLessThan(0.01 * out(free, 'staticToeDeg').sd);
    expect(out(set, 'staticCamberDeg').sd).toBeLessThan(0.01 * out(free, 'staticCamberDeg').sd);
  });

  it('a coarse adjuster leaves toe within about half a step (toe per mm of tie rod × step / 2)', () => {
    const step = 0.5;
    const set = run({ ...base, setup: { toeAdjusterStepMm: step } });
    const p = prepareStudy({ ...base, setup: { toeAdjusterStepMm: step } });
    const per = p.model.setupSens!.toePerLength;
    const o = out(set, 'staticToeDeg');
    const half = (Math.abs(per) * step) / 2;
    expect(Math.max(Math.abs(o.max - o.nominal!), Math.abs(o.min - o.nominal!))).toBeLessThan(1.1 * half);
    // Quantisation spreads toe over the step: SD near a uniform's half/√3·… but not zero.
    expect(o.sd).toBeGreaterThan(0.2 * half / Math.sqrt(3));
  });
});
