/**
 * Solve jobs on the real job queue (pg-boss on the test PostgreSQL) with
 * real worker processes: a server restart keeps them, and a job that can no
 * longer answer says so with 410 job_gone and its reason (never a 404 that
 * looks like a wrong id). Waits are on states, never on fixed sleeps.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import PgBoss from 'pg-boss';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { computeSolve } from '../../shared/intent/api.js';
import { QUEUE_SCHEMA, QUEUES, bossDb } from '../../server/compute/queue.js';
import { freshDatabaseUrl } from '../support/db.js';
import { waitFor } from '../support/wait.js';
import { spawnWorker } from '../support/workers.js';
import { expectError, registerUser, signIn, startTestApp, type TestApp } from './helpers.js';

const solveInput = {
  corner: exampleCorners.fsRearWishbone,
  axle: 'rear',
  target: { rollSteerCoefficient: -0.02 },
  movable: ['tieRodInner.z'],
  bounds: { 'tieRodInner.z': [141.5, 181.5] },
  trackProfile: 'smooth-circuit',
};

async function jobRow(url: string, id: string): Promise<{ state: string; gone_reason: string | null }> {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    return (await c.query('SELECT state, gone_reason FROM compute_jobs WHERE id = $1', [id])).rows[0];
  } finally {
    await c.end();
  }
}

describe('solve jobs across a server restart', () => {
  const url = freshDatabaseUrl();
  let first: TestApp | undefined;
  let second: TestApp | undefined;
  afterAll(async () => {
    await first?.close();
    await second?.close();
  });

  it('jobs submitted before the restart are run by a worker process and answered by the new server', async () => {
    // No worker anywhere yet: the jobs wait on the queue, in PostgreSQL.
    first = await startTestApp({ databaseUrl: url, config: { inProcessWorker: false } });
    const { agent: user, email } = await registerUser(first.app);
    const a = (await user.post('/api/compute/solve-jobs').send(solveInput).expect(202)).body;
    const b = (await user.post('/api/compute/solve-jobs').send(solveInput).expect(202)).body;
    expect((await user.get(`/api/compute/solve-jobs/${a.jobId}`).expect(200)).body.state).toBe('queued');
    await first.close();
    first = undefined;

    // A worker process takes them while no server runs; job a finishes before the new server starts.
    const worker = await spawnWorker(url);
    try {
      await waitFor('job a to finish', async () => ((await jobRow(url, a.jobId)).state === 'succeeded' ? true : undefined));
      second = await startTestApp({ databaseUrl: url, config: { inProcessWorker: false } });
      const again = await signIn(second.app, email, 'long-enough-pass');
      // The engine's own answer for the same input (the job runs the same engine on a worker thread).
      const direct = JSON.parse(JSON.stringify(computeSolve(solveInput))) as unknown;
      for (const id of [a.jobId as string, b.jobId as string]) {
        const done = await waitFor(`job ${id}`, async () => {
          const r = await again.get(`/api/compute/solve-jobs/${id}`).expect(200);
          return r.body.state === 'succeeded' ? r.body : undefined;
        });
        expect(done.progress.fraction).toBe(1);
        expect(done.result).toEqual(direct);
      }
    } finally {
      await worker.stop();
    }
  }, 120_000);
});

describe('a job that can no longer answer: 410 job_gone with the reason', () => {
  let t: TestApp;
  let boss: PgBoss;
  let direct: pg.Pool;
  beforeAll(async () => {
    t = await startTestApp({ config: { inProcessWorker: false } });
    direct = new pg.Pool({ connectionString: t.databaseUrl, max: 2 });
    boss = new PgBoss({ db: bossDb(direct), schema: QUEUE_SCHEMA, supervise: false, schedule: false, migrate: false });
    await boss.start();
  });
  afterAll(async () => {
    await boss?.stop({ graceful: false, close: false });
    await direct?.end();
    await t?.close();
  });

  it('lost: the queue no longer has the job (e.g. dropped by its retention while no worker ran)', async () => {
    const { agent: user } = await registerUser(t.app);
    const job = (await user.post('/api/compute/solve-jobs').send(solveInput).expect(202)).body;
    await boss.deleteJob(QUEUES.solve, job.jobId);
    const r = await user.get(`/api/compute/solve-jobs/${job.jobId}`);
    expectError(r, 410, 'job_gone');
    expect(r.body.error.details.reason).toBe('lost');
    // Cancelling it says the same; someone else still sees nothing there, and a wrong id is still 404.
    expectError(await user.delete(`/api/compute/solve-jobs/${job.jobId}`), 410, 'job_gone');
    expectError(await (await registerUser(t.app)).agent.get(`/api/compute/solve-jobs/${job.jobId}`), 404, 'not_found');
    expectError(await user.get('/api/compute/solve-jobs/00000000-0000-4000-8000-000000000000'), 404, 'not_found');
  });

  it('lost: its workers died or failed more often than the retry limit (the dead-letter queue marks it)', async () => {
    const { agent: user } = await registerUser(t.app);
    const job = (await user.post('/api/compute/solve-jobs').send(solveInput).expect(202)).body;
    // Two workers in turn take the job and fail it, as workers that crash would (retry limit 1).
    for (let attempt = 0; attempt < 2; attempt++) {
      const [taken] = await waitFor('the job to be available again', async () => {
        const got = await boss.fetch(QUEUES.solve);
        return got.length ? got : undefined;
      });
      expect(taken!.id).toBe(job.jobId);
      await boss.fail(QUEUES.solve, taken!.id, { message: 'worker crashed' });
    }
    expect((await boss.getJobById(QUEUES.solve, job.jobId))?.state).toBe('failed');
    // A worker handles the dead letter and marks the job lost.
    const worker = await spawnWorker(t.databaseUrl);
    try {
      await waitFor('the job to be marked lost', async () => ((await jobRow(t.databaseUrl, job.jobId)).gone_reason === 'lost' ? true : undefined));
    } finally {
      await worker.stop();
    }
    const r = await user.get(`/api/compute/solve-jobs/${job.jobId}`);
    expectError(r, 410, 'job_gone');
    expect(r.body.error.details.reason).toBe('lost');
    expect(r.body.error.message).toMatch(/workers running it stopped/);
  }, 60_000);

  it('expired: a finished job past its retention', async () => {
    const url = freshDatabaseUrl();
    const short = await startTestApp({ databaseUrl: url, config: { inProcessWorker: true, solveJobRetainMs: 0 } });
    try {
      const { agent: user } = await registerUser(short.app);
      const job = (await user.post('/api/compute/solve-jobs').send(solveInput).expect(202)).body;
      await waitFor('the job to finish', async () => ((await jobRow(url, job.jobId)).state === 'succeeded' ? true : undefined));
      const r = await user.get(`/api/compute/solve-jobs/${job.jobId}`);
      expectError(r, 410, 'job_gone');
      expect(r.body.error.details.reason).toBe('expired');
      // And it stays gone (the tombstone answers, the result itself was dropped).
      expectError(await user.get(`/api/compute/solve-jobs/${job.jobId}`), 410, 'job_gone');
      expect((await jobRow(url, job.jobId)).gone_reason).toBe('expired');
    } finally {
      await short.close();
    }
  }, 60_000);
});
