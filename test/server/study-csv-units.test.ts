/**
 * The study CSV follows the reader's unit choice (issue 15 §2: "the user's
 * unit choice (SI or inch-pound) applies on every … export"): `?units=`
 * chooses, else the caller's account setting; a bad choice is refused naming
 * the parameter. The API's JSON stays SI. Conversion check: 1 in = 25.4 mm
 * exactly (NIST SP 811, Appendix B).
 *
 * And reading the completed study: the answer carries the result stored
 * once, at combine time, as the text the API sends (studies.result_json),
 * with the factors named as the engine names them; a result stored before
 * that text existed (or whose names were cleared for renaming) is named on
 * its first read and its text kept. Either way the answer's result is the
 * stored result with withFactorLabels applied, as it always was.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { waitFor } from '../support/wait.js';
import { expectError, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';
import { withFactorLabels, type StudyResult, type StudySpec } from '../../shared/study/index.js';

/** NIST SP 811, Appendix B: the inch is 25.4 mm exactly. */
const MM_PER_IN = 25.4;

let t: TestApp;
let engineer: Agent;
let viewer: Agent;
let teamId: string;
let studyId: string;
let nominalRollCentreMm: number;
let direct: pg.Pool;

beforeAll(async () => {
  t = await startTestApp({ seed: true, config: { studyMaxActivePerTeam: 10 } });
  direct = new pg.Pool({ connectionString: t.databaseUrl, max: 2 });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  viewer = await signIn(t.app, 'viewer@tallowmere.example');
  const teams = (await engineer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  teamId = teams.find((x) => x.slug === 'tallowmere')!.id;
  const vehicles = (await engineer.get(`/api/teams/${teamId}/vehicles`).expect(200)).body as { id: string; name: string }[];
  const vehicleId = vehicles.find((v) => v.name === 'TUR-26 Ember')!.id;
  const designs = (await engineer.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  const designId = designs.find((d) => d.name === 'Front baseline')!.id;
  const r = await engineer.post(`/api/teams/${teamId}/studies`).send({
    kind: 'tolerance',
    target: { axleDesignId: designId },
    seed: 11,
    samples: 40,
    tolerances: [{ point: 'upperOuter', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }],
  });
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  studyId = r.body.study.id as string;
  const done = await waitFor('the study to complete', async () => {
    const s = (await engineer.get(`/api/teams/${teamId}/studies/${studyId}`).expect(200)).body.study;
    if (s.status === 'failed' || s.status === 'cancelled') throw new Error(`study ${s.status}`);
    return s.status === 'completed' ? s : undefined;
  });
  nominalRollCentreMm = (done.result.outputs as { key: string; nominal: number }[]).find((o) => o.key === 'rollCentreHeightMm')!.nominal;
}, 180_000);

afterAll(async () => {
  await direct?.end();
  await t?.close();
});

const csvPath = () => `/api/teams/${teamId}/studies/${studyId}/csv`;

/** The outputs table's row for `key`, by column name. */
function outputRow(csv: string, key: string): Record<string, string> {
  const lines = csv.split('\r\n');
  const headerAt = lines.findIndex((l) => l.startsWith('output,label,unit,'));
  const header = lines[headerAt]!.split(',');
  const line = lines.slice(headerAt + 1).find((l) => l.startsWith(`${key},`))!;
  // The rows this reads have no quoted cells (their labels hold no comma).
  const cells = line.split(',');
  return Object.fromEntries(header.map((h, i) => [h, cells[i] ?? '']));
}

describe('study CSV in the reader\'s units', { timeout: 60_000 }, () => {
  it('?units=imperial writes inches, ?units=si millimetres; the JSON stays SI', async () => {
    const us = (await viewer.get(csvPath()).query({ units: 'imperial' }).expect(200)).text;
    const si = (await viewer.get(csvPath()).query({ units: 'si' }).expect(200)).text;
    const rcUs = outputRow(us, 'rollCentreHeightMm');
    const rcSi = outputRow(si, 'rollCentreHeightMm');
    expect(rcUs['unit']).toBe('in');
    expect(rcSi['unit']).toBe('mm');
    // Four significant figures (the length quantity's): half a unit in the 4th figure is at most 5e-4 of the value.
    expect(Math.abs(Number(rcUs['nominal']) - nominalRollCentreMm / MM_PER_IN)).toBeLessThanOrEqual(5e-4 * Math.abs(nominalRollCentreMm / MM_PER_IN));
    expect(Math.abs(Number(rcSi['nominal']) - nominalRollCentreMm)).toBeLessThanOrEqual(5e-4 * Math.abs(nominalRollCentreMm));
    expect(us).toContain('output,unit,bin from,bin to,count (samples)');
    // The tornado names the point as the hardpoint table does, never its key.
    expect(us).toMatch(/Upper ball joint, z \(left\)/);
    const json = (await viewer.get(`/api/teams/${teamId}/studies/${studyId}`).expect(200)).body.study.result;
    expect(json.outputs.find((o: { key: string }) => o.key === 'rollCentreHeightMm').unit).toBe('mm');
    expect(json.factors[0].label).toBe('Upper ball joint, z (left)');
  });

  it('without ?units, follows the account setting', async () => {
    await viewer.patch('/api/auth/me').send({ displayUnits: 'imperial' }).expect(200);
    try {
      expect(outputRow((await viewer.get(csvPath()).expect(200)).text, 'rollCentreHeightMm')['unit']).toBe('in');
    } finally {
      await viewer.patch('/api/auth/me').send({ displayUnits: 'si' }).expect(200);
    }
    expect(outputRow((await viewer.get(csvPath()).expect(200)).text, 'rollCentreHeightMm')['unit']).toBe('mm');
  });

  it('refuses another unit system, naming the parameter', async () => {
    const r = await viewer.get(csvPath()).query({ units: 'furlongs' });
    expectError(r, 400, 'invalid_input');
    expect(JSON.stringify(r.body)).toContain('units');
  });
});

describe('reading a completed study', { timeout: 60_000 }, () => {
  const stored = async () =>
    (await direct.query<{ result: StudyResult; result_json: string | null; spec: StudySpec }>('SELECT result, result_json, spec FROM studies WHERE id = $1', [studyId])).rows[0]!;
  const read = async () => (await viewer.get(`/api/teams/${teamId}/studies/${studyId}`).expect(200).expect('content-type', /^application\/json/)).body.study;

  it('answers the result stored at combine time: the stored result with the engine’s factor names, beside the study’s fields', async () => {
    const row = await stored();
    expect(row.result_json).not.toBeNull();
    const study = await read();
    expect(study).toMatchObject({ id: studyId, status: 'completed', progress: { doneChunks: 1, totalChunks: 1, doneSamples: 40, totalSamples: 40 } });
    expect(study.result).toEqual(withFactorLabels(row.result, row.spec.corner));
    expect(study.result).toEqual(JSON.parse(row.result_json!));
    // The list still leaves results out.
    const list = (await viewer.get(`/api/teams/${teamId}/studies`).expect(200)).body.studies as { id: string }[];
    expect(list.find((s) => s.id === studyId)).not.toHaveProperty('result');
  });

  it('a result stored before its text, with other factor names, is named on its first read and its text kept', async () => {
    const before = await stored();
    // As an earlier release stored it: other names, no text.
    const old: StudyResult = {
      ...before.result,
      factors: before.result.factors.map((f) => ({ ...f, label: `${f.key} (old name)` })),
      outputs: before.result.outputs.map((o) => (o.tornado ? { ...o, tornado: o.tornado.map((b) => ({ ...b, label: `${b.factor} (old name)` })) } : o)),
    };
    await direct.query('UPDATE studies SET result = $2, result_json = NULL WHERE id = $1', [studyId, old]);
    const study = await read();
    expect(study.result).toEqual(withFactorLabels(old, before.spec.corner));
    expect(study.result.factors[0].label).toBe('Upper ball joint, z (left)');
    const after = await stored();
    expect(after.result_json).not.toBeNull();
    expect(JSON.parse(after.result_json!)).toEqual(study.result);
    // The export reads the same named result.
    const csv = (await viewer.get(csvPath()).expect(200)).text;
    expect(csv).toMatch(/Upper ball joint, z \(left\)/);
    expect(csv).not.toContain('(old name)');
  });
});
