/**
 * The study CSV in the reader's unit system (issue 15 §2: "the user's unit
 * choice applies on every … export", with the unit in every numeric column)
 * and the factors named as the hardpoint table names their points.
 * Conversion checks use the inch as defined: 1 in = 25.4 mm exactly (NIST SP
 * 811, Appendix B), written here independently of the app's quantity table.
 */
import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { exampleCorners } from '../../../shared/kinematics/index.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { pointName } from '../../../shared/io/hardpoint-points.js';
import { chunkFromWire, chunkToWire, combineStudyChunks, planStudy, runStudyChunk, studyResultCsv, withFactorLabels, type StudyResult } from '../../../shared/study/index.js';

/** NIST SP 811, Appendix B: the inch is 25.4 mm exactly. */
const MM_PER_IN = 25.4;
const corner = exampleCorners.fsFrontWishbone;

const tolerance = {
  kind: 'tolerance',
  axle: 'front',
  corner,
  vehicle: exampleVehicles.tur26Ember,
  trackProfile: 'smooth-circuit',
  samples: 60,
  seed: 7,
  tolerances: [
    { point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' },
    { point: 'upperOuter', axis: 'x', plusMinusMm: 0.5, distribution: 'uniform' },
  ],
};

const sweep = {
  kind: 'sweep',
  axle: 'front',
  corner,
  vehicle: exampleVehicles.tur26Ember,
  trackProfile: 'smooth-circuit',
  design: 'full-factorial',
  balanceDirection: 'less-understeer',
  factors: [
    { point: 'tieRodInner', axis: 'z', fromMm: 150, toMm: 170, levels: 3 },
    { point: 'tieRodOuter', axis: 'z', fromMm: 180, toMm: 190, levels: 2 },
  ],
};

function run(spec: unknown): StudyResult {
  const plan = planStudy(spec);
  return combineStudyChunks(
    spec,
    Array.from({ length: plan.chunkCount }, (_, i) => {
      const w = chunkToWire(runStudyChunk(spec, i));
      return chunkFromWire(w.header, w.outputs);
    }),
  );
}

/** The CSV's tables (separated by blank lines), each as header and rows. */
function tables(csv: string): { header: string[]; rows: string[][] }[] {
  return csv
    .trimEnd()
    .split('\r\n\r\n')
    .map((t) => {
      const [header, ...rows] = Papa.parse<string[]>(t, { newline: '\r\n' }).data;
      return { header: header!, rows };
    });
}

const tableWith = (csv: string, column: string) => {
  const t = tables(csv).find((x) => x.header.includes(column));
  if (!t) throw new Error(`no table with a ${column} column`);
  return t;
};

/** Relative rounding allowed: each side is written to the quantity's 4 significant figures (half a unit in the 4th figure is at most 5e-4 of the value), so two roundings differ by at most 1e-3. */
const FOUR_SIG_BOTH = 1e-3;

describe('study CSV units', { timeout: 120_000 }, () => {
  const result = run(tolerance);

  it('writes lengths and bump-steer gradients in inch-pound units when asked, converted at 25.4 mm per inch (NIST SP 811)', () => {
    const si = tableWith(studyResultCsv({ kind: 'tolerance', label: 'Jig' }, result, 'si'), 'nominal');
    const us = tableWith(studyResultCsv({ kind: 'tolerance', label: 'Jig' }, result, 'imperial'), 'nominal');
    const col = (t: typeof si, name: string) => t.header.indexOf(name);
    const row = (t: typeof si, key: string) => t.rows.find((r) => r[0] === key)!;
    // Roll centre height: mm → in (divide by 25.4).
    const rcSi = row(si, 'rollCentreHeightMm');
    const rcUs = row(us, 'rollCentreHeightMm');
    expect(rcSi[col(si, 'unit')]).toBe('mm');
    expect(rcUs[col(us, 'unit')]).toBe('in');
    const mm = Number(rcSi[col(si, 'nominal')]);
    const inches = Number(rcUs[col(us, 'nominal')]);
    expect(Math.abs(inches * MM_PER_IN - mm)).toBeLessThanOrEqual(FOUR_SIG_BOTH * Math.abs(mm));
    expect(inches).not.toBeCloseTo(mm, 0);
    // Bump steer: deg/m → deg/in (multiply by 0.0254 m per inch); three significant figures per the quantity.
    const bsSi = row(si, 'bumpSteerDegPerM');
    const bsUs = row(us, 'bumpSteerDegPerM');
    expect(bsUs[col(us, 'unit')]).toBe('deg/in');
    expect(bsUs[col(us, 'sig')]).toBe('3');
    const perM = Number(bsSi[col(si, 'p50')]);
    const perIn = Number(bsUs[col(us, 'p50')]);
    // Three significant figures on each side: at most 5e-3 of the value apart after two roundings.
    expect(Math.abs(perIn / (MM_PER_IN / 1000) - perM)).toBeLessThanOrEqual(1e-2 * Math.abs(perM));
    // A label's own figure follows: the smooth circuit's 10 mm bump is 0.3937 in (4 significant figures, as messages write figures).
    expect(row(si, 'bumpToeChangeDeg')[col(si, 'label')]).toContain('over a 10 mm single-wheel bump');
    expect(row(us, 'bumpToeChangeDeg')[col(us, 'label')]).toContain(`over a ${Number((10 / MM_PER_IN).toPrecision(4))} in single-wheel bump`);
    // Angles stay in degrees.
    expect(row(us, 'rollSteerCoefficient')[col(us, 'unit')]).toBe('deg/deg');
    expect(tables(studyResultCsv({ kind: 'tolerance' }, result, 'imperial'))[0]!.rows.find((r) => r[0] === 'units')![1]).toMatch(/^inch-pound/);
  });

  it('names the unit of every histogram bin, in the reader\'s units', () => {
    const si = tableWith(studyResultCsv({ kind: 'tolerance' }, result, 'si'), 'bin from');
    const us = tableWith(studyResultCsv({ kind: 'tolerance' }, result, 'imperial'), 'bin from');
    expect(us.header).toEqual(['output', 'unit', 'bin from', 'bin to', 'count (samples)']);
    const siRc = si.rows.filter((r) => r[0] === 'rollCentreHeightMm');
    const usRc = us.rows.filter((r) => r[0] === 'rollCentreHeightMm');
    expect(usRc.length).toBe(siRc.length);
    expect(usRc.every((r) => r[1] === 'in')).toBe(true);
    const lastSi = Number(siRc.at(-1)![3]);
    const lastUs = Number(usRc.at(-1)![3]);
    expect(Math.abs(lastUs * MM_PER_IN - lastSi)).toBeLessThanOrEqual(FOUR_SIG_BOTH * Math.abs(lastSi));
  });

  it('names each tolerance in the tornado table by its point as the hardpoint table does, with the coordinate and side', () => {
    const t = tableWith(studyResultCsv({ kind: 'tolerance' }, result, 'si'), 'point and coordinate');
    const labels = new Set(t.rows.map((r) => r[2]));
    expect(labels).toContain(`${pointName('points.tieRodInner', corner)}, z (left)`);
    expect(labels).toContain(`${pointName('points.upperOuter', corner)}, x (left)`);
    for (const l of labels) expect(l).not.toMatch(/tieRodInner|upperOuter/);
  });

  it('relabels a result stored with point keys', () => {
    const old: StudyResult = {
      ...result,
      factors: result.factors.map((f) => ({ ...f, label: f.key })),
      outputs: result.outputs.map((o) => ({ ...o, tornado: o.tornado?.map((b) => ({ ...b, label: b.factor })) ?? null })),
    };
    const named = withFactorLabels(old, corner);
    expect(named.factors.map((f) => f.label)).toEqual(result.factors.map((f) => f.label));
    expect(named.outputs[0]!.tornado!.map((b) => b.label)).toEqual(result.outputs[0]!.tornado!.map((b) => b.label));
    expect(named.factors[0]!.label).toBe(`${pointName('points.tieRodInner', corner)}, z (left)`);
  });

  it('writes a sweep\'s coordinates in inches with the unit in each column header', () => {
    const r = run(sweep);
    const si = tableWith(studyResultCsv({ kind: 'sweep' }, r, 'si'), 'variant');
    const us = tableWith(studyResultCsv({ kind: 'sweep' }, r, 'imperial'), 'variant');
    const name = pointName('points.tieRodInner', corner);
    expect(si.header).toContain(`${name}, z (mm)`);
    expect(us.header).toContain(`${name}, z (in)`);
    expect(us.header[1]).toBe('balance gained (deg/g)');
    const i = us.header.indexOf(`${name}, z (in)`);
    for (const [k, row] of us.rows.entries()) {
      const mm = Number(si.rows[k]![i]);
      // Five significant figures each side (the study screen's coordinate rounding).
      expect(Math.abs(Number(row[i]) * MM_PER_IN - mm)).toBeLessThanOrEqual(1e-4 * mm);
    }
    const surfaces = tableWith(studyResultCsv({ kind: 'sweep' }, r, 'imperial'), 'coefficient');
    expect(surfaces.header).toEqual(['output', 'unit', 'term', 'coefficient']);
    expect(surfaces.rows.find((x) => x[0] === 'rollCentreHeightMm')![1]).toBe('in');
  });
});
