/**
 * Submitting a design sweep (issue 16): the study's plan (its model built and checked, its chunks counted)
 * is made on the compute pool, off the event loop, and reaches the person the same way as before: a
 * refused plan is a 400 naming the field, a good one a 202 with the study's size.
 *
 * Sources: the size of a full-factorial design is the product of the factors' levels (common practice,
 * e.g. Montgomery, Design and Analysis of Experiments, from memory); the 100 000-variant limit and the
 * 500-sample chunks are Rollwise's own (issue 16, docs/studies.md).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Agent } from 'supertest';
import { idOf, signIn, startTestApp, type TestApp } from './helpers.js';

let t: TestApp;
let engineer: Agent;
let studiesPath: string;
let designId: string;

beforeAll(async () => {
  t = await startTestApp({ seed: true, config: { studyMaxActivePerTeam: 10 } });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  const teamId = await idOf(engineer, '/api/teams', 'tallowmere');
  const vehicleId = await idOf(engineer, `/api/teams/${teamId}/vehicles`, 'TUR-26 Ember');
  designId = await idOf(engineer, `/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`, 'Front baseline');
  studiesPath = `/api/teams/${teamId}/studies`;
});

afterAll(async () => {
  await t?.close();
});

const sweep = (levels: number[]) => ({
  kind: 'sweep',
  target: { axleDesignId: designId },
  design: 'full-factorial',
  balanceDirection: 'less-understeer',
  factors: levels.map((n, i) => ({ point: i % 2 ? 'tieRodOuter' : 'tieRodInner', axis: (['z', 'x', 'y'] as const)[i % 3], fromMm: -2 + i, toMm: 2 + i, levels: n })),
});

describe('submitting a design sweep', () => {
  it('a full factorial of 20 × 20 × 20 × 20 = 160 000 variants is refused before anything is queued, naming the factors', async () => {
    const r = await engineer.post(studiesPath).send(sweep([20, 20, 20, 20]));
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(r.body.error.message).toContain('20 × 20 × 20 × 20 = 160000 variants is more than 100000');
    expect(r.body.error.details.fields[0].path).toBe('factors');
    const listed = (await engineer.get(studiesPath).expect(200)).body.studies as unknown[];
    expect(listed).toHaveLength(0);
  });

  it('a full factorial of 3 × 2 × 101 = 606 variants is queued as 2 chunks of at most 500', async () => {
    const r = await engineer.post(studiesPath).send(sweep([3, 2, 101]));
    expect(r.status, JSON.stringify(r.body)).toBe(202);
    expect(r.body.study.progress).toMatchObject({ totalSamples: 3 * 2 * 101, totalChunks: Math.ceil((3 * 2 * 101) / 500), doneChunks: 0 });
    await engineer.delete(`${studiesPath}/${r.body.study.id as string}`).expect(200);
  });
});
