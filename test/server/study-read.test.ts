/**
 * Reading a completed study: the answer carries the result stored once, at
 * combine time, as the text the API sends (studies.result_json), with the
 * factors named as the engine names them; a result stored before that text
 * existed (or whose names were cleared for renaming) is named on its first
 * read and its text kept. The answer's result is the stored result with
 * withFactorLabels applied, as before.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { waitFor } from '../support/wait.js';
import { signIn, startTestApp, type Agent, type TestApp } from './helpers.js';
import { withFactorLabels, type StudyResult, type StudySpec } from '../../shared/study/index.js';

let t: TestApp;
let engineer: Agent;
let direct: pg.Pool;
let teamId: string;
let studyId: string;

const stored = async () =>
  (
    await direct.query<{ result: StudyResult; result_json: string | null; spec: StudySpec }>('SELECT result, result_json, spec FROM studies WHERE id = $1', [studyId])
  ).rows[0]!;
const read = async () => (await engineer.get(`/api/teams/${teamId}/studies/${studyId}`).expect(200).expect('content-type', /^application\/json/)).body.study;

beforeAll(async () => {
  t = await startTestApp({ seed: true, config: { studyMaxActivePerTeam: 10 } });
  direct = new pg.Pool({ connectionString: t.databaseUrl, max: 2 });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  const teams = (await engineer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  teamId = teams.find((x) => x.slug === 'tallowmere')!.id;
  const vehicles = (await engineer.get(`/api/teams/${teamId}/vehicles`).expect(200)).body as { id: string; name: string }[];
  const vehicleId = vehicles.find((v) => v.name === 'TUR-26 Ember')!.id;
  const designs = (await engineer.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  const designId = designs.find((d) => d.name === 'Front baseline')!.id;
  const r = await engineer.post(`/api/teams/${teamId}/studies`).send({
    kind: 'tolerance',
    target: { axleDesignId: designId },
    seed: 5,
    samples: 40,
    tolerances: [
      { point: 'upperOuter', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' },
      { point: 'tieRodInner', axis: 'sphere', plusMinusMm: 0.5, distribution: 'normal' },
    ],
  });
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  studyId = r.body.study.id as string;
  await waitFor('the study to complete', async () => {
    const s = (await direct.query<{ status: string }>('SELECT status FROM studies WHERE id = $1', [studyId])).rows[0]!;
    if (s.status === 'failed' || s.status === 'cancelled') throw new Error(`study ${s.status}`);
    return s.status === 'completed' ? true : undefined;
  });
}, 180_000);

afterAll(async () => {
  await direct?.end();
  await t?.close();
});

describe('reading a completed study', { timeout: 60_000 }, () => {
  it('answers the result stored at combine time: the stored result with the engine’s factor names, beside the study’s fields', async () => {
    const row = await stored();
    expect(row.result_json).not.toBeNull();
    const study = await read();
    expect(study).toMatchObject({ id: studyId, status: 'completed', progress: { doneChunks: 1, totalChunks: 1, doneSamples: 40, totalSamples: 40 } });
    expect(study.result).toEqual(withFactorLabels(row.result, row.spec.corner));
    expect(study.result).toEqual(JSON.parse(row.result_json!));
    // The list still leaves results out.
    const list = (await engineer.get(`/api/teams/${teamId}/studies`).expect(200)).body.studies as { id: string; result?: unknown }[];
    expect(list.find((s) => s.id === studyId)).not.toHaveProperty('result');
  });

  it('a result stored before its text (factors named by their point keys) is named on its first read, and its text kept', async () => {
    const before = await stored();
    // As stored by an earlier release: labels "upperOuter z (left)", no text.
    const old: StudyResult = {
      ...before.result,
      factors: before.result.factors.map((f) => ({ ...f, label: `${f.key} (old name)` })),
      outputs: before.result.outputs.map((o) => (o.tornado ? { ...o, tornado: o.tornado.map((b) => ({ ...b, label: `${b.factor} (old name)` })) } : o)),
    };
    await direct.query('UPDATE studies SET result = $2, result_json = NULL WHERE id = $1', [studyId, old]);
    const study = await read();
    expect(study.result).toEqual(withFactorLabels(old, before.spec.corner));
    expect((study.result as StudyResult).factors.some((f) => f.label.includes('(old name)'))).toBe(false);
    const after = await stored();
    expect(after.result_json).not.toBeNull();
    expect(JSON.parse(after.result_json!)).toEqual(study.result);
    // The export reads the same named result.
    const csv = await engineer.get(`/api/teams/${teamId}/studies/${studyId}/csv`).expect(200);
    expect(csv.text).not.toContain('(old name)');
  });
});
