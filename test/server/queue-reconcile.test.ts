/**
 * Reconciliation of running studies with the real queue (pg-boss on the
 * test PostgreSQL): chunk jobs that leave the queue undone without reaching
 * the dead-letter queue (deleted or archived by hand, cancelled from
 * outside) must not leave a study `running` for ever. A deleted chunk job is
 * put back and the study completes with every chunk landed once; a chunk
 * job cancelled from outside fails the study with job_gone and its reason
 * once the study has made no progress for the stall bound. Waits are on
 * states (study rows, queue rows), never fixed sleeps.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { waitFor } from '../support/wait.js';
import { signIn, startTestApp, type Agent, type TestApp } from './helpers.js';
import { chunkJobId } from '../../server/services/studies.js';
import { startWorker, type RunningWorker } from '../../server/worker.js';

let t: TestApp;
let engineer: Agent;
let direct: pg.Pool;
let teamId: string;
let designId: string;
let worker: RunningWorker | undefined;

const request = (seed: number) => ({
  kind: 'tolerance',
  target: { axleDesignId: designId },
  seed,
  samples: 200,
  chunkSamples: 25,
  tolerances: [{ point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }],
});

const studyRow = async (id: string) =>
  (await direct.query<{ status: string; done_chunks: number; total_chunks: number; error: { code: string; message: string } | null }>('SELECT * FROM studies WHERE id = $1', [id])).rows[0]!;

async function start(seed: number): Promise<string> {
  const r = await engineer.post(`/api/teams/${teamId}/studies`).send(request(seed));
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  return r.body.study.id as string;
}

beforeAll(async () => {
  // No worker in the server: the test starts one (in this process) once the queue has been tampered with.
  t = await startTestApp({ seed: true, config: { inProcessWorker: false, studyMaxActivePerTeam: 10 } });
  direct = new pg.Pool({ connectionString: t.databaseUrl, max: 3 });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  const teams = (await engineer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  teamId = teams.find((x) => x.slug === 'tallowmere')!.id;
  const vehicles = (await engineer.get(`/api/teams/${teamId}/vehicles`).expect(200)).body as { id: string; name: string }[];
  const vehicleId = vehicles.find((v) => v.name === 'TUR-26 Ember')!.id;
  const designs = (await engineer.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  designId = designs.find((d) => d.name === 'Front baseline')!.id;
}, 60_000);

afterAll(async () => {
  await worker?.close();
  await direct?.end();
  await t?.close();
});

describe('studies whose chunk jobs leave the queue undone', { timeout: 240_000 }, () => {
  it('deleted chunk jobs are put back: the study completes with every chunk landed exactly once', async () => {
    const id = await start(11);
    const removed = [chunkJobId(id, 2), chunkJobId(id, 5)];
    const del = await direct.query(`DELETE FROM pgboss.job WHERE name = 'study-chunk' AND id = ANY($1::uuid[])`, [removed]);
    expect(del.rowCount).toBe(2);

    worker = await startWorker({ databaseUrl: t.databaseUrl, studyReconcileSeconds: 1, studyStallSeconds: 3600 });
    await waitFor('the study to complete', async () => {
      const s = await studyRow(id);
      if (s.status === 'failed' || s.status === 'cancelled') throw new Error(`study ${s.status}: ${JSON.stringify(s.error)}`);
      return s.status === 'completed' ? true : undefined;
    });
    const chunks = await direct.query<{ chunk_index: number }>('SELECT chunk_index FROM study_chunks WHERE study_id = $1 ORDER BY chunk_index', [id]);
    expect(chunks.rows.map((r) => r.chunk_index)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    const s = await studyRow(id);
    expect(s.done_chunks).toBe(8);
    // The put-back jobs carry the fixed ids (so cancel still finds them).
    const back = await direct.query(`SELECT id FROM pgboss.job WHERE name = 'study-chunk' AND id = ANY($1::uuid[])`, [removed]);
    expect(back.rowCount).toBe(2);
    const study = (await engineer.get(`/api/teams/${teamId}/studies/${id}`).expect(200)).body.study;
    expect(study.result.totalSamples).toBe(200);
    await worker.close();
    worker = undefined;
  });

  it('a chunk job cancelled from outside fails the study after the stall bound with job_gone and the reason (410)', async () => {
    const id = await start(12);
    await direct.query(`UPDATE pgboss.job SET state = 'cancelled', completed_on = now() WHERE name = 'study-chunk' AND id = $1`, [chunkJobId(id, 3)]);
    worker = await startWorker({ databaseUrl: t.databaseUrl, studyReconcileSeconds: 1, studyStallSeconds: 2 });
    const s = await waitFor('the study to fail', async () => {
      const r = await studyRow(id);
      if (r.status === 'completed') throw new Error('a study with a chunk that never ran completed');
      return r.status === 'failed' ? r : undefined;
    });
    expect(s.error?.code).toBe('job_gone');
    expect(s.error?.message).toMatch(/chunk 4/);
    const r = await engineer.get(`/api/teams/${teamId}/studies/${id}`);
    expect(r.status).toBe(410);
    expect(r.body.error.code).toBe('job_gone');
    expect(r.body.error.message).toMatch(/cancelled or removed outside Rollwise/);
    // Nothing of it waits on the queue any more.
    await waitFor('its chunk jobs to be cancelled', async () => {
      const q = await direct.query(`SELECT 1 FROM pgboss.job WHERE name = 'study-chunk' AND data->>'studyId' = $1 AND state < 'completed'`, [id]);
      return q.rowCount === 0 ? true : undefined;
    });
  });
});
