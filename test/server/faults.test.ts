/**
 * Faults while requests run. database-down.test.ts covers an unreachable
 * database and a cut connection; mail.test.ts covers the SMTP server being
 * down (the action succeeds, the outbox retries and delivers once it is back).
 * Here: the PostgreSQL server itself stopped and restarted under a stream of
 * requests (through a relay that stops like a server does, so the cluster
 * other test files share keeps running), and solves
 * that run out of time while other requests keep their latency.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { createApp, type RollwiseApp } from '../../server/app.js';
import { isDatabaseUnavailable } from '../../server/http/errors.js';
import { createDatabase, type Database } from '../../server/db/client.js';
import { migrateDatabase } from '../../server/db/migrate.js';
import { seedDemo } from '../../server/db/seed.js';
import { freePort } from '../../server/tools/pg.js';
import { freshDatabaseUrl } from '../support/db.js';
import { DatabaseRelay, DEMO_PASSWORD, expectError, idOf, registerUser, signIn, startTestApp, testConfig, type Agent, type TestApp } from './helpers.js';

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('PostgreSQL stopped and restarted while requests run', () => {
  let relay: DatabaseRelay;
  let db: Database;
  let app: RollwiseApp;
  beforeAll(async () => {
    // The app reaches its database through a relay that stops like a server does (see DatabaseRelay).
    relay = new DatabaseRelay(freshDatabaseUrl(), await freePort());
    await relay.start();
    db = createDatabase(relay.url, { connectTimeoutMs: 500 });
    await migrateDatabase(db);
    await seedDemo(db.orm, { bcryptRounds: 4 });
    // The outbox worker runs too (polling every 50 ms; its mail server is a closed port), as on a real server.
    app = createApp(testConfig(relay.url, { dbConnectTimeoutMs: 500, smtpUrl: `smtp://127.0.0.1:${await freePort()}`, mailPollMs: 50 }), db);
  });
  afterAll(async () => {
    await app?.close();
    await db?.close();
    await relay?.stop();
  });

  it('answers 503 quickly while it is down (never hangs, never a 500), and recovers by itself with the session intact', async () => {
    const engineer = await signIn(app, 'engineer@tallowmere.example');
    const teamId = await idOf(engineer, '/api/teams', 'tallowmere');
    const vehicle = `/api/teams/${teamId}/vehicles/${(await engineer.get(`/api/teams/${teamId}/vehicles`).expect(200)).body[0].id}`;

    type Sample = { from: number; at: number; status: number; ms: number; code?: string };
    const samples: Sample[] = [];
    let running = true;
    const t0 = Date.now();
    const record = async (req: () => request.Test) => {
      const s = performance.now();
      const from = Date.now() - t0;
      const r = await req();
      samples.push({ from, at: Date.now() - t0, status: r.status, ms: performance.now() - s, code: r.body?.error?.code });
      return r;
    };
    // Readers and a writer that saves on top of the last revision it saw (re-reading after a refusal).
    const reader = async () => {
      while (running) {
        await record(() => engineer.get(`${vehicle}/revisions`));
        await record(() => engineer.get('/api/auth/me'));
      }
    };
    const writer = async () => {
      let base = 0;
      while (running) {
        if (!base) {
          const r = await record(() => engineer.get(vehicle));
          if (r.status === 200) base = r.body.revision;
          continue;
        }
        const mass = exampleVehicles.tur26Ember.massKg + (base % 2);
        const r = await record(() => engineer.put(`${vehicle}/data`).send({ data: { ...exampleVehicles.tur26Ember, massKg: mass }, baseRevision: base }));
        // A save whose answer was lost with the connection may have committed: then the next one is stale; re-read.
        base = r.status === 200 ? r.body.revision : 0;
      }
    };
    const load = [reader(), reader(), writer()];

    await sleep(300);
    // A request in the middle of a transaction holds a connection between two statements when the database stops.
    const held = await db.pool.connect();
    await held.query('BEGIN');
    await relay.stop(); // every connection gets FATAL 57P01, then the port is closed
    // Down from here: the stop takes effect when it returns (measured before it, a request sent during a slow stop
    // on a loaded machine was still answered 200 and counted as sent while down).
    const stoppedAt = Date.now() - t0;
    await sleep(1200);
    // Its loss was not an uncaught 'error' (that would end the process; vitest would fail the run): its next statement fails as unavailable (503).
    const lost = await held.query('SELECT 1').then(() => 'answered', (e: unknown) => e);
    expect(isDatabaseUnavailable(lost), String(lost)).toBe(true);
    held.release(true);
    expectError(await engineer.get(vehicle), 503, 'database_unavailable');
    expect((await request(app).get('/api/health')).status).toBe(503);

    const restartedAt = Date.now() - t0;
    // Requests sent and answered while the database was down (after the stop had taken effect).
    const downSamples = samples.filter((s) => s.from > stoppedAt + 100 && s.at < restartedAt);
    await relay.start();
    // Recovery without restarting the app: poll until a read succeeds.
    let recoveredAt = -1;
    for (let i = 0; i < 100 && recoveredAt < 0; i++) {
      if ((await engineer.get('/api/auth/me')).status === 200) recoveredAt = Date.now() - t0;
      else await sleep(100);
    }
    await sleep(300);
    running = false;
    await Promise.all(load);

    const statuses = [...new Set(samples.map((s) => s.status))].sort();
    const slowest = Math.max(...samples.map((s) => s.ms));
    const summary = `${samples.length} requests, statuses ${statuses.join('/')}, slowest ${slowest.toFixed(0)} ms, down from ${stoppedAt} ms, restarted ${restartedAt} ms, recovered ${recoveredAt} ms`;
    // Only success, a 503 in the error shape, or a stale save after a lost answer; never a 500 or a dropped connection.
    for (const s of samples) {
      expect([200, 409, 503], summary).toContain(s.status);
      if (s.status === 503) expect(s.code).toBe('database_unavailable');
      if (s.status === 409) expect(s.code).toBe('stale_revision');
    }
    expect(downSamples.length, summary).toBeGreaterThan(5);
    expect(downSamples.every((s) => s.status === 503), summary).toBe(true);
    // Down, it answers within the 500 ms connect timeout plus slack; nothing waits for the 30 s query timeout.
    expect(Math.max(...downSamples.map((s) => s.ms)), summary).toBeLessThan(2000);
    expect(slowest, summary).toBeLessThan(3000);
    expect(recoveredAt, summary).toBeGreaterThan(0);
    expect(samples.filter((s) => s.from > recoveredAt + 50).every((s) => s.status === 200), summary).toBe(true);
    // The same session, the same data, and revisions that follow on.
    await engineer.get('/api/auth/me').expect(200);
    const revs = (await engineer.get(`${vehicle}/revisions`).expect(200)).body as { revision: number }[];
    expect(revs.map((r) => r.revision)).toEqual([...revs.keys()].map((i) => revs.length - i));
    await request(app).get('/api/health').expect(200);
  }, 30_000);
});

describe('a solve past its time limit', () => {
  // The limit is a quarter of what the faster heavy call takes on a warm worker of this machine, measured at
  // set-up under the same load as the test (quiet, 2026-12-02: the solve ~120 ms, the fine sweep ~90 ms with its
  // JSON, so 25 ms, never less), and far longer than the quick call (~1 ms quiet). A fixed 25 ms limit failed at
  // load 7 (the browser tests running beside): the quick call no longer fitted inside it, the heavy ones still did not.
  let LIMIT_MS = 25;
  let t: TestApp;
  let user: Agent;
  const heavySweep = { corner: exampleCorners.fsFrontWishbone, travel: { from: -25, to: 25, step: 0.01 }, rackMm: [-10, 0, 10] };
  const quickRoll = { corner: exampleCorners.fsRearWishbone, roll: { from: -2, to: 2, step: 0.5 } };
  // Four movable coordinates, the largest family, nine rack positions and the most sweep points a solve may take.
  const heavySolve = {
    corner: exampleCorners.fsFrontWishbone,
    axle: 'front',
    target: { rollSteerCoefficient: 0.02 },
    movable: ['tieRodInner.z', 'tieRodOuter.z', 'tieRodInner.x', 'tieRodOuter.x'],
    bounds: { 'tieRodInner.z': [121.5, 161.5], 'tieRodOuter.z': [150, 190], 'tieRodInner.x': [-75, -35], 'tieRodOuter.x': [-80, -40] },
    trackProfile: { id: 'bumpy-circuit', travelMm: [-40, 40] },
    options: { familySize: 101, travelStepMm: 0.4, rackPositionsMm: [-20, -15, -10, -5, 0, 5, 10, 15, 20] },
  };
  /** The faster heavy call's time on a warm worker now, on an app of its own with the tests' long limit. */
  async function heavyCallMs(): Promise<number> {
    const cal = await startTestApp({ config: { computeThreads: 1, computeWarmStart: true } });
    try {
      const u = (await registerUser(cal.app)).agent;
      await u.post('/api/compute/axle-roll').send(quickRoll).expect(200);
      await u.post('/api/compute/solve').send(heavySolve).expect(200); // the first run also compiles
      let s = performance.now();
      await u.post('/api/compute/solve').send(heavySolve).expect(200);
      const solveMs = performance.now() - s;
      s = performance.now();
      await u.post('/api/compute/corner-sweep').send(heavySweep).expect(200);
      return Math.min(solveMs, performance.now() - s);
    } finally {
      await cal.close();
    }
  }

  beforeAll(async () => {
    LIMIT_MS = Math.max(25, Math.round((await heavyCallMs()) / 4));
    // One worker kept warm: a worker stopped at the limit is replaced at once instead of at the next request.
    // computeNice as deployed: this test is about reads keeping their latency beside runaway solves (tests otherwise run compute threads at their own priority).
    t = await startTestApp({ seed: true, config: { computeTimeLimitMs: LIMIT_MS, solveJobTimeLimitMs: LIMIT_MS, computeThreads: 1, computeWarmStart: true, computeNice: true } });
    user = (await registerUser(t.app)).agent;
    // Set-up only waits for the first worker to load the engines: up to 60 s on a loaded CI machine.
    await quickAnswers(600);
  }, 120_000);

  /** A quick call answers once a worker has loaded the engines (about a second, more than LIMIT_MS). */
  async function quickAnswers(tries = 100): Promise<number> {
    const s = performance.now();
    for (let i = 0; i < tries; i++) {
      const r = await user.post('/api/compute/axle-roll').send(quickRoll);
      if (r.status === 200) return performance.now() - s;
      expectError(r, 422, 'time_limit');
      await sleep(100);
    }
    throw new Error(`no worker answered a quick call within ${tries / 10} s`);
  }
  afterAll(async () => {
    await t?.close();
  });

  it('is cancelled and reported (422 time_limit; a background job ends failed with time_limit) while other requests keep their latency', async () => {
    const owner = await signIn(t.app, 'owner@tallowmere.example', DEMO_PASSWORD);
    const read = async () => {
      const s = performance.now();
      await owner.get('/api/teams').expect(200);
      return performance.now() - s;
    };
    const before: number[] = [];
    for (let i = 0; i < 10; i++) before.push(await read());

    const job = await user.post('/api/compute/solve-jobs').send(heavySolve);
    expect(job.status).toBe(202);
    const started = performance.now();
    const heavy = [
      user.post('/api/compute/solve').send(heavySolve),
      user.post('/api/compute/corner-sweep').send(heavySweep),
      user.post('/api/compute/corner-sweep').send(heavySweep),
    ].map((p) => p.then((r) => ({ r, ms: performance.now() - started })));
    const during: number[] = [];
    while (during.length < 15) during.push(await read());

    for (const { r, ms } of await Promise.all(heavy)) {
      expectError(r, 422, 'time_limit');
      expect(r.body.error.details.timeLimitMs).toBe(LIMIT_MS);
      // Reported soon after the limit (the queue counts: the limit covers waiting for the worker too).
      expect(ms).toBeLessThan(LIMIT_MS + 3000);
    }
    let state: { state: string; error?: { code: string } } = { state: 'queued' };
    for (let i = 0; i < 100 && (state.state === 'queued' || state.state === 'running'); i++) {
      await sleep(50);
      state = (await user.get(`/api/compute/solve-jobs/${job.body.jobId}`).expect(200)).body;
    }
    expect(state.state).toBe('failed');
    expect(state.error?.code).toBe('time_limit');

    // Other requests were not held up by the runaway solves (they run on worker threads, off the event loop).
    const summary = `before ${before.map((x) => x.toFixed(0)).join(',')} ms; during ${during.map((x) => x.toFixed(0)).join(',')} ms`;
    // On the event loop, a read would wait for a whole solve (over a second, the limit's timer could not even fire).
    // Off it, the only cost is CPU shared with the workers (and their restart) on a small machine: tens of ms.
    expect(median(during), summary).toBeLessThan(median(before) + 100);
    expect(Math.max(...during), summary).toBeLessThan(1000);
    // The pool replaced the stopped workers by itself: a quick call answers again, once the new worker has loaded
    // the engines (about a second when quiet; 20 s with the cores four times oversubscribed). quickAnswers throws
    // if no call answers within its 60 s.
    expect(await quickAnswers(600)).toBeGreaterThan(0);
  }, 120_000);
});
