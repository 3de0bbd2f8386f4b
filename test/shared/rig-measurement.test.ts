/**
 * Rig measurements: the CSV reader (mapping, units, signs, refusals by line,
 * limits) and the comparison with the corner sweep. The comparison checks
 * are identities of the math (a file written from the engine itself differs
 * by 0; a constant offset c gives RMS = mean = largest = c), plus one
 * external cross-check against check-values.md case B.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { sweepCorner } from '../../shared/kinematics/sweep.js';
import { SolveError, InputError } from '../../shared/errors.js';
import { previewRigCsv, readRigCsv, RIG_LIMITS, type RigMapping, type RigPoint } from '../../shared/io/rig-measurement.js';
import { compareRigMeasurement, DEFAULT_RIG_TOLERANCE } from '../../shared/rig/compare.js';
import { planarWishbone } from './kinematics/helpers.js';

const fixture = (name: string) => readFileSync(new URL(`../fixtures/rig/${name}`, import.meta.url), 'utf8');

const MM_DEG: RigMapping = {
  hasHeader: true,
  travelColumn: 0,
  toeColumn: 1,
  camberColumn: 2,
  travelUnit: 'mm',
  toeUnit: 'deg',
  camberUnit: 'deg',
  travelSign: 'bump-positive',
  toeSign: 'toe-in-positive',
  camberSign: 'top-out-positive',
};

function mustRead(text: string, m: RigMapping): RigPoint[] {
  const r = readRigCsv(text, m);
  if (!r.ok) throw new Error(r.errors.join('\n'));
  return r.points;
}

describe('rig CSV: preview and mapping', () => {
  it('previews a comma file: columns from the header, first rows, a proposed mapping with the header units', () => {
    const r = previewRigCsv(fixture('good-comma.csv'));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.preview.columns).toEqual(['Wheel travel (mm)', 'Toe (deg)', 'Camber (deg)']);
    expect(r.preview.hasHeader).toBe(true);
    expect(r.preview.rowCount).toBe(11);
    expect(r.preview.rows[0]).toEqual({ line: 3, cells: ['-25', '0.0121', '-0.62'] });
    expect(r.preview.proposed).toMatchObject({ travelColumn: 0, toeColumn: 1, camberColumn: 2, travelUnit: 'mm', toeUnit: 'deg', camberUnit: 'deg' });
  });

  it('reads a semicolon file with decimal commas and a byte-order mark, toe in minutes of arc', () => {
    const text = fixture('excel-semicolon.csv');
    const p = previewRigCsv(text);
    expect(p.ok && p.preview.delimiter).toBe(';');
    expect(p.ok && p.preview.proposed?.toeUnit).toBe('arcmin');
    const points = mustRead(text, { ...MM_DEG, toeUnit: 'arcmin' });
    expect(points.map((q) => q.travelMm)).toEqual([-25, -12.5, 0, 12.5, 25]);
    // 0,73 arcmin = 0.73/60 deg (1° = 60′, a definition).
    expect(points[0]!.toeDeg).toBeCloseTo(0.73 / 60, 12);
    expect(points[1]!.camberDeg).toBe(-0.82);
    expect(points[0]!.line).toBe(2);
  });

  it('converts inches, and the opposite sign conventions, into Rollwise conventions', () => {
    const text = 'travel (in),toe (deg),camber (deg)\n1,0.1,0.5\n-1,-0.2,-0.4\n0,0,0\n';
    const pts = mustRead(text, { ...MM_DEG, travelUnit: 'in', travelSign: 'rebound-positive', toeSign: 'toe-out-positive', camberSign: 'top-in-positive' });
    // 1 in = 25.4 mm exactly (international inch, a definition).
    expect(pts.map((p) => p.travelMm)).toEqual([-25.4, 25.4, -0]);
    expect(pts.map((p) => p.toeDeg)).toEqual([-0.1, 0.2, -0]);
    expect(pts.map((p) => p.camberDeg)).toEqual([-0.5, 0.4, -0]);
  });

  it('converts toe in mm at the rim with the reference diameter (θ = asin(mm / D), from memory)', () => {
    const text = 'travel,toe\n-10,0.5\n0,0\n10,-1\n';
    const pts = mustRead(text, { ...MM_DEG, camberColumn: null, toeUnit: 'mm-at-rim', rimDiameterMm: 400 });
    expect(pts[0]!.toeDeg).toBeCloseTo((Math.asin(0.5 / 400) * 180) / Math.PI, 12);
    expect(pts[0]!.camberDeg).toBeNull();
  });

  it('names the malformed line and returns no points', () => {
    const r = readRigCsv(fixture('malformed.csv'), { ...MM_DEG, camberColumn: null });
    expect(r).toEqual({ ok: false, errors: ['Line 5: toe "oops" is not a number.'] });
  });

  it('refuses a unit it does not read, naming the header line', () => {
    const r = readRigCsv(fixture('wrong-unit.csv'), { ...MM_DEG, camberColumn: null });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]).toMatch(/^Line 1: the toe column "toe \(rad\)" is in a unit Rollwise does not read/);
  });

  it('refuses a mapping that contradicts the unit the header states', () => {
    const r = readRigCsv(fixture('good-comma.csv'), { ...MM_DEG, travelUnit: 'in' });
    expect(r).toEqual({ ok: false, errors: ['Line 2: the travel column "Wheel travel (mm)" says mm, but the mapping reads it as in.'] });
  });

  it('refuses implausible values as a likely unit mistake (minutes of arc read as degrees), by line', () => {
    const r = readRigCsv('travel,toe\n-25,3\n0,0\n25,44\n', { ...MM_DEG, camberColumn: null });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.errors).toEqual(['Line 4: toe 44° is beyond ±15°: check the unit chosen for that column.']);
  });

  it('refuses a header read as data, a missing column, too few and too many rows, and an oversized file', () => {
    expect(readRigCsv('travel,toe\n0,0\n1,0\n2,0\n', { ...MM_DEG, hasHeader: false, camberColumn: null })).toMatchObject({ ok: false, errors: [expect.stringMatching(/^Line 1: this line is not numbers/)] });
    expect(readRigCsv('travel,toe\n0,0\n1,0\n2,0\n', MM_DEG)).toMatchObject({ ok: false, errors: [expect.stringMatching(/^Line 1: the header has 2 columns; there is no column 3 for camber/)] });
    expect(readRigCsv('travel,toe\n0,0\n1,0\n', { ...MM_DEG, camberColumn: null })).toMatchObject({ ok: false, errors: [expect.stringMatching(/at least 3/)] });
    const many = 'travel,toe\n' + Array.from({ length: RIG_LIMITS.maxRows + 1 }, (_, i) => `${(i / 100).toFixed(2)},0`).join('\n');
    expect(readRigCsv(many, { ...MM_DEG, camberColumn: null })).toMatchObject({ ok: false, errors: [`The file has ${RIG_LIMITS.maxRows + 1} data rows; a rig file may have at most ${RIG_LIMITS.maxRows}.`] });
    const big = 'travel,toe\n' + '#'.repeat(RIG_LIMITS.maxBytes) + '\n0,0\n';
    expect(readRigCsv(big, MM_DEG)).toMatchObject({ ok: false, errors: [expect.stringMatching(/at most 256 kB/)] });
    expect(previewRigCsv(big)).toMatchObject({ ok: false });
  });

  it('refuses the same travel on every row and a mapping with the same column twice', async () => {
    expect(readRigCsv('t,toe\n5,0\n5,0.1\n5,0.2\n', { ...MM_DEG, camberColumn: null })).toMatchObject({ ok: false, errors: [expect.stringMatching(/same travel/)] });
    const { rigMappingSchema } = await import('../../shared/io/rig-mapping-schema.js');
    expect(rigMappingSchema.safeParse({ ...MM_DEG, toeColumn: 0 }).success).toBe(false);
    expect(rigMappingSchema.safeParse({ ...MM_DEG, toeUnit: 'mm-at-rim' }).success).toBe(false);
    expect(rigMappingSchema.safeParse(MM_DEG).success).toBe(true);
  });
});

describe('rig comparison with the corner sweep', () => {
  const corner = exampleCorners.fsFrontWishbone;
  const sweep = sweepCorner(corner, { travel: { from: -25, to: 25, step: 2.5 } });

  /** A rig file written from the engine's own sweep: travel in inches, rebound positive, toe in arcmin toe-out positive. */
  function engineFile(toeOffsetDeg = 0, camberOffsetDeg = 0): string {
    const lines = ['travel (in),toe (arcmin),camber (deg)'];
    for (const r of sweep.rows) lines.push(`${-r.travelMm / 25.4},${-(r.toeDeg + toeOffsetDeg) * 60},${r.camberDeg + camberOffsetDeg}`);
    return lines.join('\n');
  }
  const FILE_MAPPING: RigMapping = { ...MM_DEG, travelUnit: 'in', travelSign: 'rebound-positive', toeUnit: 'arcmin', toeSign: 'toe-out-positive' };

  it('identity: a file generated from the engine itself differs by ~0 (through unit and sign conversion)', () => {
    const cmp = compareRigMeasurement(corner, mustRead(engineFile(), FILE_MAPPING), { basis: 'absolute' });
    // Identity of the math: measured = predicted up to floating-point round trip of the conversions.
    expect(cmp.toe.rmsDeg).toBeLessThan(1e-9);
    expect(cmp.camber!.rmsDeg).toBeLessThan(1e-9);
    expect(cmp.cautions).toEqual([]);
    expect(cmp.points).toHaveLength(sweep.rows.length);
    expect(cmp.predicted.length).toBeGreaterThanOrEqual(41);
  });

  it('identity: a constant toe offset c gives RMS = mean = largest = c in absolute terms, and 0 as a change from design height', () => {
    const c = 0.05;
    const pts = mustRead(engineFile(c, -0.2), FILE_MAPPING);
    const abs = compareRigMeasurement(corner, pts, { basis: 'absolute' });
    expect(abs.toe.rmsDeg).toBeCloseTo(c, 9);
    expect(abs.toe.meanDeg).toBeCloseTo(c, 9);
    expect(abs.toe.largestDeg).toBeCloseTo(c, 9);
    expect(abs.camber!.rmsDeg).toBeCloseTo(0.2, 9);
    expect(abs.camber!.meanDeg).toBeCloseTo(-0.2, 9);
    const change = compareRigMeasurement(corner, pts, { basis: 'change' });
    expect(change.toe.rmsDeg).toBeLessThan(1e-9);
    expect(change.camber!.rmsDeg).toBeLessThan(1e-9);
    expect(change.atDesign!.measuredToeDeg - change.atDesign!.predictedToeDeg).toBeCloseTo(c, 9);
  });

  it('identity: one point off by d makes largest = d at that line and RMS = |d|/√n', () => {
    const pts = mustRead(engineFile(), FILE_MAPPING).map((p, i) => (i === 5 ? { ...p, toeDeg: p.toeDeg + 0.3 } : p));
    const cmp = compareRigMeasurement(corner, pts, { basis: 'absolute' });
    expect(cmp.toe.largestDeg).toBeCloseTo(0.3, 9);
    expect(cmp.toe.atLine).toBe(pts[5]!.line);
    expect(cmp.toe.atTravelMm).toBeCloseTo(pts[5]!.travelMm, 12);
    expect(cmp.toe.rmsDeg).toBeCloseTo(0.3 / Math.sqrt(pts.length), 9);
  });

  it('cautions when the largest difference reaches the team tolerance, in the caution shape', () => {
    const pts = mustRead(engineFile(0.12), FILE_MAPPING);
    const cmp = compareRigMeasurement(corner, pts, { basis: 'absolute', tolerance: DEFAULT_RIG_TOLERANCE });
    expect(cmp.cautions).toHaveLength(1);
    expect(cmp.cautions[0]).toMatchObject({ level: 'warning', code: 'rig-toe-disagreement', unit: 'deg', threshold: 0.1 });
    expect(cmp.cautions[0]!.value).toBeCloseTo(0.12, 9);
    expect(cmp.cautions[0]!.message).toContain('line');
    const loose = compareRigMeasurement(corner, pts, { basis: 'absolute', tolerance: { toeDeg: 0.2, camberDeg: 0.5 } });
    expect(loose.cautions).toEqual([]);
  });

  it('cross-check: check-values.md case B bump steer as a rig file agrees with the prediction to the source’s rounding', () => {
    const c = planarWishbone({ tieRodInner: [-100, 320, 200] });
    // Source: check-values.md case B, derived closed form: toe −0.04287° at ±25 mm, −0.17443° at ±50 mm (toe-out both ways).
    const text = 'travel (mm),toe (deg)\n-50,-0.17443\n-25,-0.04287\n0,0\n25,-0.04287\n50,-0.17443\n';
    const cmp = compareRigMeasurement(c, mustRead(text, { ...MM_DEG, camberColumn: null }), { basis: 'change' });
    // The published values carry five decimals: half a unit of the last place is 5e-6 deg.
    expect(Math.abs(cmp.toe.largestDeg)).toBeLessThan(5e-6);
    expect(cmp.camber).toBeNull();
  });

  it('a measured travel beyond the linkage is a typed error naming the travel and line, never NaN', () => {
    const text = 'travel (mm),toe (deg)\n-20,0\n0,0\n20,0\n900,0\n';
    let err: unknown;
    try {
      compareRigMeasurement(corner, mustRead(text, { ...MM_DEG, camberColumn: null }), { basis: 'absolute' });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SolveError);
    expect((err as SolveError).code).toBe('unreachable_pose');
    expect((err as SolveError).message).toContain('900 mm (line 5)');
    expect((err as SolveError).details).toMatchObject({ measuredTravelMm: 900, line: 5 });
  });

  it('a right wheel on the rig is compared with the mirrored corner: same toe and camber signs (domain.md: toe_R = toe_mirror)', () => {
    const pts = mustRead(engineFile(), FILE_MAPPING);
    const left = compareRigMeasurement(corner, pts, { basis: 'absolute', side: 'left' });
    const right = compareRigMeasurement(corner, pts, { basis: 'absolute', side: 'right' });
    expect(right.side).toBe('right');
    expect(right.toe.rmsDeg).toBeLessThan(1e-9);
    for (let i = 0; i < left.predicted.length; i++) {
      expect(right.predicted[i]!.toeDeg).toBeCloseTo(left.predicted[i]!.toeDeg, 9);
      expect(right.predicted[i]!.camberDeg).toBeCloseTo(left.predicted[i]!.camberDeg, 9);
    }
  });

  it('a change basis needs travels spanning 0, and the rack must be inside the stroke', () => {
    const pts = mustRead('travel,toe\n5,0\n10,0\n15,0\n', { ...MM_DEG, camberColumn: null });
    expect(() => compareRigMeasurement(corner, pts, { basis: 'change' })).toThrow(InputError);
    expect(compareRigMeasurement(corner, pts, { basis: 'absolute' }).toe.rmsDeg).toBeGreaterThan(0);
    expect(() => compareRigMeasurement(corner, pts, { basis: 'absolute', rackMm: 99 })).toThrow(/outside the steering stroke/);
  });
});
