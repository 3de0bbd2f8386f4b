/**
 * Studies on the real job queue (pg-boss on the test PostgreSQL) with real
 * worker processes (`npm run worker` as child processes): one worker, two
 * workers, and a worker SIGKILLed mid-chunk all give exactly the result one
 * process computes alone from the stored spec (nothing lost, nothing counted
 * twice); cancel stops every chunk. Every wait is on a state (the study row,
 * the queue's job rows), never a fixed sleep; the study numbers are compared
 * exactly (the chunks are pure functions of the seed). Each test stands alone.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { waitFor } from '../support/wait.js';
import { spawnWorker, type WorkerProcess } from '../support/workers.js';
import { expectError, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';
import { chunkJobId } from '../../server/services/studies.js';
import { combineStudyChunks, planStudy, runStudyChunk, withFactorLabels, type StudySpec } from '../../shared/study/index.js';

let t: TestApp;
let engineer: Agent;
let viewer: Agent;
let direct: pg.Pool;
let teamId: string;
let designId: string;
const workers: WorkerProcess[] = [];

/** A tolerance study of the demo front corner: 12 chunks of 25 samples, bump steer at three rack positions and a roll sweep. */
const request = () => ({
  kind: 'tolerance',
  target: { axleDesignId: designId },
  seed: 2026,
  samples: 300,
  chunkSamples: 25,
  tolerances: [
    { point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' },
    { point: 'upperOuter', axis: 'sphere', plusMinusMm: 0.5, distribution: 'uniform' },
    { point: 'lowerFront', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' },
  ],
  analysis: { rackMm: [-10, 0, 10], rollDeg: 2 },
});

const studyRow = async (id: string) =>
  (
    await direct.query<{ status: string; done_chunks: number; total_chunks: number; done_samples: number; total_samples: number; error: unknown }>(
      'SELECT * FROM studies WHERE id = $1',
      [id],
    )
  ).rows[0]!;

async function start(): Promise<string> {
  const r = await engineer.post(`/api/teams/${teamId}/studies`).send(request());
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  return r.body.study.id as string;
}

async function completed(id: string): Promise<{ result: unknown; progress: unknown }> {
  await waitFor(`study ${id} to complete`, async () => {
    const s = await studyRow(id);
    if (s.status === 'failed' || s.status === 'cancelled') throw new Error(`study ${id} ${s.status}: ${JSON.stringify(s.error)}`);
    return s.status === 'completed' ? true : undefined;
  });
  return (await engineer.get(`/api/teams/${teamId}/studies/${id}`).expect(200)).body.study;
}

/**
 * The study's result computed here, in one process, chunk after chunk from its stored spec, as the API
 * writes it (factors named, through JSON): what any number of workers, killed or not, must give exactly.
 */
async function undisturbed(id: string): Promise<unknown> {
  const spec = (await direct.query<{ spec: StudySpec }>('SELECT spec FROM studies WHERE id = $1', [id])).rows[0]!.spec;
  const chunks = Array.from({ length: planStudy(spec).chunkCount }, (_, i) => runStudyChunk(spec, i));
  return JSON.parse(JSON.stringify(withFactorLabels(combineStudyChunks(spec, chunks), spec.corner)));
}

async function stopWorkers(): Promise<void> {
  await Promise.all(workers.splice(0).map((w) => w.stop()));
}

beforeAll(async () => {
  // The server runs no worker: worker processes do the work. Chunks of a silent worker expire after 3 s.
  t = await startTestApp({ seed: true, config: { inProcessWorker: false, studyChunkExpireSeconds: 3, studyMaxActivePerTeam: 10 } });
  direct = new pg.Pool({ connectionString: t.databaseUrl, max: 3 });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  viewer = await signIn(t.app, 'viewer@tallowmere.example');
  const teams = (await engineer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  teamId = teams.find((x) => x.slug === 'tallowmere')!.id;
  const vehicles = (await engineer.get(`/api/teams/${teamId}/vehicles`).expect(200)).body as { id: string; name: string }[];
  const vehicleId = vehicles.find((v) => v.name === 'TUR-26 Ember')!.id;
  const designs = (await engineer.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  designId = designs.find((d) => d.name === 'Front baseline')!.id;
}, 60_000);

afterAll(async () => {
  await stopWorkers();
  await direct?.end();
  await t?.close();
});

describe('studies on worker processes', () => {
  it('one worker runs a study to a stored result without sleeping through a job (it polls only every ten minutes); the API shows progress, the result and a CSV', async () => {
    const id = await start();
    const queued = (await viewer.get(`/api/teams/${teamId}/studies/${id}`).expect(200)).body.study;
    expect(queued).toMatchObject({ status: 'queued', progress: { doneChunks: 0, totalChunks: 12, doneSamples: 0, totalSamples: 300 }, etaSeconds: null, error: null });
    expectError(await engineer.get(`/api/teams/${teamId}/studies/${id}/csv`), 409, 'study_not_completed');
    // Polling every ten minutes, the worker only finishes within the wait if no NOTIFY is lost: not even the one
    // its own last chunk sends for the combine step while the lane is still busy landing that chunk.
    workers.push(await spawnWorker(t.databaseUrl, { QUEUE_POLL_MS: '600000' }));
    const one = await completed(id);
    expect(one.progress).toEqual({ doneChunks: 12, totalChunks: 12, doneSamples: 300, totalSamples: 300 });
    expect(one.result).toMatchObject({ kind: 'tolerance', seed: 2026, totalSamples: 300 });
    expect(one.result).toEqual(await undisturbed(id));
    // The combined result is stored; the chunks keep their rows (key, counts, timing) but not their outputs.
    const kept = (await direct.query<{ n: number; with_header: number; with_outputs: number }>('SELECT count(*)::int AS n, count(result)::int AS with_header, count(outputs)::int AS with_outputs FROM study_chunks WHERE study_id = $1', [id])).rows[0]!;
    expect(kept).toEqual({ n: 12, with_header: 0, with_outputs: 0 });
    const list = (await viewer.get(`/api/teams/${teamId}/studies`).expect(200)).body.studies as { id: string; result?: unknown }[];
    expect(list.find((s) => s.id === id)).toBeDefined();
    expect(list.every((s) => s.result === undefined)).toBe(true);
    const csv = await viewer.get(`/api/teams/${teamId}/studies/${id}/csv`).expect(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    expect(csv.headers['content-disposition']).toMatch(/^attachment; filename=".+\.csv"$/);
    expect(csv.text.length).toBeGreaterThan(100);
    await stopWorkers();
  }, 180_000);

  it('two workers give exactly the result one process computes alone, chunk after chunk', async () => {
    workers.push(...(await Promise.all([spawnWorker(t.databaseUrl), spawnWorker(t.databaseUrl)])));
    const id = await start();
    const two = await completed(id);
    expect(two.result).toEqual(await undisturbed(id));
    const by = (await direct.query<{ worker: string; n: number; ms: number }>('SELECT worker, count(*)::int AS n, sum(compute_ms)::float AS ms FROM study_chunks WHERE study_id = $1 GROUP BY worker', [id])).rows;
    // Not asserted (the split is the operating system's), only shown.
    console.log(`two-worker run: ${by.map((b) => `${b.worker}: ${b.n} chunks, ${Math.round(b.ms)} ms`).join('; ')}`);
    await stopWorkers();
  }, 180_000);

  it('a worker SIGKILLed mid-chunk: the chunk goes to another worker, nothing is counted twice, the numbers are exactly those of the undisturbed run', async () => {
    const id = await start();
    // Kill a worker while it holds a chunk it has not landed; if it landed the chunk just before the kill, try the next one.
    let killedChunk: number | undefined;
    for (let attempt = 0; attempt < 5 && killedChunk === undefined; attempt++) {
      const w = await spawnWorker(t.databaseUrl);
      const held = await waitFor('a chunk in progress', async () => {
        // Taken by the worker, and the study already running there (the worker has begun its chunks).
        const r = await direct.query<{ id: string; chunk: number }>(
          `SELECT j.id, (j.data->>'chunkIndex')::int AS chunk FROM pgboss.job j JOIN studies s ON s.id = (j.data->>'studyId')::uuid
            WHERE j.name = 'study-chunk' AND j.state = 'active' AND s.id = $1 AND s.status = 'running'`,
          [id],
        );
        return r.rows[0];
      });
      await w.kill();
      const landed = await direct.query('SELECT 1 FROM study_chunks WHERE study_id = $1 AND chunk_index = $2', [id, held.chunk]);
      const still = await direct.query(`SELECT 1 FROM pgboss.job WHERE id = $1 AND state = 'active'`, [held.id]);
      if (landed.rowCount === 0 && still.rowCount === 1) killedChunk = held.chunk;
    }
    expect(killedChunk, 'a worker was killed while it held an unfinished chunk').toBeDefined();
    const before = await studyRow(id);
    expect(before.status).toBe('running');
    expect(before.done_chunks).toBeLessThan(12);

    // Another worker takes the rest, including the dead worker's chunk once it expires.
    workers.push(await spawnWorker(t.databaseUrl));
    const after = await completed(id);
    expect(after.result).toEqual(await undisturbed(id));
    expect(after.progress).toEqual({ doneChunks: 12, totalChunks: 12, doneSamples: 300, totalSamples: 300 });
    const rows = (await direct.query<{ n: number }>('SELECT count(*)::int AS n FROM study_chunks WHERE study_id = $1', [id])).rows[0]!;
    expect(rows.n).toBe(12);
    const retried = await direct.query<{ retry_count: number; state: string }>('SELECT retry_count, state FROM pgboss.job WHERE id = $1', [chunkJobId(id, killedChunk!)]);
    expect(retried.rows[0]).toMatchObject({ state: 'completed' });
    expect(retried.rows[0]!.retry_count).toBeGreaterThanOrEqual(1);
    await stopWorkers();
  }, 240_000);

  it('cancel stops every chunk: nothing waits or runs afterwards, and no chunk lands', async () => {
    const id = await start();
    workers.push(await spawnWorker(t.databaseUrl));
    await waitFor('a first chunk', async () => ((await studyRow(id)).done_chunks >= 1 ? true : undefined));
    const r = await engineer.delete(`/api/teams/${teamId}/studies/${id}`).expect(200);
    expect(r.body.study.status).toBe('cancelled');
    // Every chunk job of the study ends cancelled or completed (the one running, if any, stops).
    await waitFor('no chunk to wait or run', async () => {
      const open = await direct.query(`SELECT 1 FROM pgboss.job WHERE name = 'study-chunk' AND data->>'studyId' = $1 AND state IN ('created', 'retry', 'active')`, [id]);
      return open.rowCount === 0 ? true : undefined;
    });
    const s = await studyRow(id);
    const landed = (await direct.query<{ n: number }>('SELECT count(*)::int AS n FROM study_chunks WHERE study_id = $1', [id])).rows[0]!.n;
    expect(s.status).toBe('cancelled');
    expect(landed).toBe(s.done_chunks);
    expect(s.done_chunks).toBeLessThan(12);
    // The worker is free again: another study runs to the end.
    const next = await start();
    expect((await completed(next)).result).toEqual(await undisturbed(next));
    expect((await studyRow(id)).done_chunks).toBe(s.done_chunks);
    await stopWorkers();
  }, 240_000);

  it("fair share: another team's single solve and small study finish while one team's big study runs (solve lanes; studies take turns by chunk)", async () => {
    // One worker: one study lane, one solve lane.
    workers.push(await spawnWorker(t.databaseUrl));
    // Big enough to outlast the other team's work on any machine (a 400-chunk study, unniced, ran to its end
    // first on a loaded one); it is cancelled once that work has finished.
    const big = (await engineer.post(`/api/teams/${teamId}/studies`).send({ ...request(), samples: 40_000, chunkSamples: 10 }).expect(202)).body.study.id as string;
    await waitFor('the big study to be under way', async () => ((await studyRow(big)).done_chunks >= 2 ? true : undefined));
    const running = (await engineer.get(`/api/teams/${teamId}/studies/${big}`).expect(200)).body.study;
    expect(running.status).toBe('running');
    expect(typeof running.etaSeconds).toBe('number');

    const bo = await signIn(t.app, 'owner@brackenfield.example');
    const other = (await bo.get('/api/teams').expect(200)).body.find((x: { slug: string }) => x.slug === 'brackenfield').id as string;
    const otherVehicle = (await bo.get(`/api/teams/${other}/vehicles`).expect(200)).body[0].id as string;
    const otherDesign = (await bo.get(`/api/teams/${other}/vehicles/${otherVehicle}/axle-designs`).expect(200)).body[0].id as string;
    const { exampleCorners } = await import('../../shared/kinematics/examples.js');
    const solve = (
      await bo
        .post('/api/compute/solve-jobs')
        .send({
          corner: exampleCorners.fsRearWishbone,
          axle: 'rear',
          target: { rollSteerCoefficient: -0.02 },
          movable: ['tieRodInner.z'],
          bounds: { 'tieRodInner.z': [141.5, 181.5] },
          trackProfile: 'smooth-circuit',
        })
        .expect(202)
    ).body.jobId as string;
    const small = (
      await bo
        .post(`/api/teams/${other}/studies`)
        .send({
          ...request(),
          target: { axleDesignId: otherDesign },
          samples: 30,
          chunkSamples: 10,
          // Brackenfield's road car has struts: a tie-rod pickup is common to every layout.
          tolerances: [{ point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }],
        })
        .expect(202)
    ).body.study.id as string;
    await waitFor('the solve job', async () => {
      const r = await bo.get(`/api/compute/solve-jobs/${solve}`).expect(200);
      return r.body.state === 'succeeded' ? true : undefined;
    });
    await waitFor('the small study', async () => ((await studyRow(small)).status === 'completed' ? true : undefined));
    // Both finished while the big study (4000 chunks) was still running.
    const bigNow = await studyRow(big);
    expect(bigNow.status).toBe('running');
    expect(bigNow.done_chunks).toBeLessThan(4000);
    await engineer.delete(`/api/teams/${teamId}/studies/${big}`).expect(200);
    await stopWorkers();
  }, 240_000);

  it('who may start, read and cancel (docs/permissions.md: study:run for engineers and designers, team:read to read)', async () => {
    expectError(await viewer.post(`/api/teams/${teamId}/studies`).send(request()), 403, 'forbidden');
    const owner = await signIn(t.app, 'owner@tallowmere.example');
    expectError(await owner.post(`/api/teams/${teamId}/studies`).send(request()), 403, 'forbidden');
    expectError(await engineer.post(`/api/teams/${teamId}/studies`).send({ ...request(), samples: 5 }), 400, 'invalid_input');
    expectError(await engineer.post(`/api/teams/${teamId}/studies`).send({ ...request(), target: { axleDesignId: '00000000-0000-4000-8000-000000000000' } }), 404, 'not_found');
    const other = await signIn(t.app, 'reviewer@brackenfield.example');
    const id = (await direct.query<{ id: string }>('SELECT id FROM studies WHERE team_id = $1 LIMIT 1', [teamId])).rows[0]!.id;
    expectError(await other.get(`/api/teams/${teamId}/studies/${id}`), 404, 'not_found');
    expectError(await viewer.delete(`/api/teams/${teamId}/studies/${id}`), 403, 'forbidden');
  });
});
