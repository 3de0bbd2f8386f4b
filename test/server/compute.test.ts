/**
 * Compute endpoints: the worker pool returns exactly what the shared engine
 * returns for the same JSON, errors keep their field / geometry details, the
 * time limit aborts, and solve jobs report progress.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { computeAxleRoll, computeCornerSweep } from '../../shared/kinematics/api.js';
import { computeBalance } from '../../shared/balance/api.js';
import { computeCornerCompliance } from '../../shared/compliance/api.js';
import { computeRide } from '../../shared/ride/api.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import { createApp } from '../../server/app.js';
import { agent, expectError, registerUser, startTestApp, testConfig, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let user: Agent;
beforeAll(async () => {
  t = await startTestApp();
  user = (await registerUser(t.app)).agent;
});
afterAll(async () => {
  await t?.close();
});

const sweepInput = { corner: exampleCorners.fsFrontWishbone, travel: { from: -25, to: 25, step: 5 }, rackMm: [-10, 0, 10] };
const rollInput = { corner: exampleCorners.fsRearWishbone, roll: { from: -2, to: 2, step: 0.5 } };
const balanceInput = { vehicle: exampleVehicles.tur26Ember };
const solveInput = {
  corner: exampleCorners.fsRearWishbone,
  axle: 'rear',
  target: { rollSteerCoefficient: -0.02 },
  movable: ['tieRodInner.z'],
  bounds: { 'tieRodInner.z': [141.5, 181.5] },
  trackProfile: 'smooth-circuit',
};

/** What a JSON round trip makes of the engine's own answer (the HTTP body is JSON). */
const json = (x: unknown) => JSON.parse(JSON.stringify(x)) as unknown;

describe('direct compute calls', () => {
  it('need a signed-in user', async () => {
    expectError(await agent(t.app).post('/api/compute/corner-sweep').send(sweepInput), 401, 'unauthenticated');
  });

  it('corner-sweep returns the engine result and its version', async () => {
    const r = await user.post('/api/compute/corner-sweep').send(sweepInput).expect(200);
    expect(r.body.engineVersion).toBe(ENGINE_VERSION);
    expect(r.body.result).toEqual(json(computeCornerSweep(sweepInput)));
    expect(r.body.result.rows).toHaveLength(33);
  });

  it('corner-compliance returns the engine result, and a bad bushing rate names its field', async () => {
    // Issue 17: the HTTP route runs the same code as the CLI and the Web Worker.
    const corner = { ...exampleCorners.fsFrontWishbone, bushings: { lowerFront: { radialNPerMm: 3000, axialNPerMm: 800 }, tieRodInner: { radialNPerMm: 4000, axialNPerMm: 900 } }, steeringStiffnessNPerMm: 3000 };
    const input = { corner, travelMm: 5, rackMm: 5, sweep: { travel: { from: -20, to: 20, step: 10 }, rackMm: [-10, 0, 10] } };
    const r = await user.post('/api/compute/corner-compliance').send(input).expect(200);
    expect(r.body.result).toEqual(json(computeCornerCompliance(input)));
    expect(r.body.result.rigid).toBe(false);
    expect(r.body.result.sweep).toHaveLength(15);
    const bad = await user.post('/api/compute/corner-compliance').send({ corner: { ...corner, bushings: { lowerFront: { radialNPerMm: 0, axialNPerMm: 800 } } } });
    expectError(bad, 400, 'invalid_input');
    expect(JSON.stringify(bad.body.error.details)).toContain('corner.bushings.lowerFront.radialNPerMm');
  });

  it('axle-roll returns the engine result', async () => {
    const r = await user.post('/api/compute/axle-roll').send(rollInput).expect(200);
    expect(r.body.result).toEqual(json(computeAxleRoll(rollInput)));
    expect(Number.isFinite(r.body.result.rollSteerCoefficient)).toBe(true);
  });

  it('balance returns the engine result', async () => {
    const r = await user.post('/api/compute/balance').send(balanceInput).expect(200);
    expect(r.body.result).toEqual(json(computeBalance(balanceInput)));
    expect(r.body.result.rollGradientDegPerG).toBeGreaterThan(0);
  });

  it('ride returns the engine result (the same code as the CLI and the browser worker)', async () => {
    const rideInput = { vehicle: exampleVehicles.tur26Ember, corner: exampleCorners.fsFrontWishbone, axle: 'front', roadClass: 'B', speedKph: 60, bump: { heightMm: 20, lengthMm: 400 } };
    const r = await user.post('/api/compute/ride').send(rideInput).expect(200);
    expect(r.body.result).toEqual(json(computeRide(rideInput)));
    expect(r.body.result.wheelTravelRmsMm).toBeGreaterThan(0);
    expect(r.body.result.bump.peakToeChangeDeg).toBeGreaterThan(0);
    const bad = await user.post('/api/compute/ride').send({ ...rideInput, roadClass: 'Z' });
    expectError(bad, 400, 'invalid_input');
    expect((bad.body.error.details.fields as { path: string }[]).map((f) => f.path)).toContain('roadClass');
  });

  it('solve returns a solution with cautions', async () => {
    const r = await user.post('/api/compute/solve').send(solveInput).expect(200);
    expect(r.body.engineVersion).toBe(ENGINE_VERSION);
    expect(typeof r.body.result.feasible).toBe('boolean');
    expect(Array.isArray(r.body.result.cautions)).toBe(true);
  });

  it('bad input → 400 listing the fields', async () => {
    const r = await user.post('/api/compute/corner-sweep').send({ corner: exampleCorners.fsFrontWishbone, travel: { from: 'a', to: 25 } });
    expectError(r, 400, 'invalid_input');
    const paths = (r.body.error.details.fields as { path: string }[]).map((f) => f.path);
    expect(paths.some((p) => p.startsWith('travel'))).toBe(true);
    expectError(await user.post('/api/compute/balance').send({ vehicle: { massKg: -1 } }), 400, 'invalid_input');
    expectError(await user.post('/api/compute/solve').send({}), 400, 'invalid_input');
  });

  it('too many poses → 400 naming travel', async () => {
    const r = await user.post('/api/compute/corner-sweep').send({ ...sweepInput, travel: { from: -25, to: 25, step: 0.001 } });
    expectError(r, 400, 'invalid_input');
    expect(r.body.error.details.fields[0].path).toBe('travel');
  });

  it('an unreachable pose → 422 with the travel and the link', async () => {
    const r = await user.post('/api/compute/corner-sweep').send({ ...sweepInput, travel: { from: -300, to: 300, step: 10 } });
    expectError(r, 422, 'unreachable_pose');
    expect(typeof r.body.error.details.travelMm).toBe('number');
    expect(typeof r.body.error.details.link).toBe('string');
  });
});

describe('time limit', () => {
  it('aborts a task past its limit with 422 time_limit, and the pool keeps working', async () => {
    const slow = createApp(testConfig(t.databaseUrl, { computeTimeLimitMs: 50 }), t.db);
    try {
      const a = agent(slow);
      await a.post('/api/auth/register').send({ email: `slow-${Date.now()}@test.example`, password: 'long-enough-pass', displayName: 'Slow' }).expect(201);
      const big = { ...sweepInput, travel: { from: -25, to: 25, step: 0.01 }, rackMm: [-10, 0, 10] };
      const started = Date.now();
      const r = await a.post('/api/compute/corner-sweep').send(big);
      expectError(r, 422, 'time_limit');
      expect(r.body.error.details.timeLimitMs).toBe(50);
      expect(Date.now() - started).toBeLessThan(5_000);
    } finally {
      await slow.close();
    }
    // The main app's pool is unaffected.
    await user.post('/api/compute/axle-roll').send(rollInput).expect(200);
  });
});

describe('solve jobs', () => {
  async function poll(a: Agent, id: string) {
    for (let i = 0; i < 300; i++) {
      const r = await a.get(`/api/compute/solve-jobs/${id}`).expect(200);
      if (r.body.state !== 'queued' && r.body.state !== 'running') return r.body;
      await new Promise((res) => setTimeout(res, 50));
    }
    throw new Error('job did not finish');
  }

  it('runs in the background and reports progress and the result', async () => {
    const start = await user.post('/api/compute/solve-jobs').send(solveInput);
    expect(start.status).toBe(202);
    expect(start.body.jobId).toMatch(/^[0-9a-f-]{36}$/);
    expect(['queued', 'running']).toContain(start.body.state);
    expect(start.headers['location']).toBe(`/api/compute/solve-jobs/${start.body.jobId}`);
    const done = await poll(user, start.body.jobId);
    expect(done.state).toBe('succeeded');
    expect(done.progress.fraction).toBe(1);
    expect(done.engineVersion).toBe(ENGINE_VERSION);
    const direct = await user.post('/api/compute/solve').send(solveInput).expect(200);
    expect(done.result).toEqual(direct.body.result);
  });

  it('a bad intent fails the job with the 400 details', async () => {
    const start = await user.post('/api/compute/solve-jobs').send({ ...solveInput, movable: [] }).expect(202);
    const done = await poll(user, start.body.jobId);
    expect(done.state).toBe('failed');
    expect(done.error).toMatchObject({ status: 400, code: 'invalid_input' });
    expect(JSON.stringify(done.error.details)).toContain('movable');
  });

  it("is private to its owner; unknown ids are 404; jobs need sign-in", async () => {
    const start = await user.post('/api/compute/solve-jobs').send(solveInput).expect(202);
    const other = (await registerUser(t.app)).agent;
    expectError(await other.get(`/api/compute/solve-jobs/${start.body.jobId}`), 404, 'not_found');
    expectError(await user.get('/api/compute/solve-jobs/00000000-0000-4000-8000-000000000000'), 404, 'not_found');
    expectError(await user.get('/api/compute/solve-jobs/nope'), 404, 'not_found');
    expectError(await request(t.app).get(`/api/compute/solve-jobs/${start.body.jobId}`), 401, 'unauthenticated');
    await poll(user, start.body.jobId);
  });

  it('can be cancelled', async () => {
    const start = await user.post('/api/compute/solve-jobs').send(solveInput).expect(202);
    const r = await user.delete(`/api/compute/solve-jobs/${start.body.jobId}`).expect(200);
    expect(['cancelled', 'succeeded']).toContain(r.body.state);
    const later = await user.get(`/api/compute/solve-jobs/${start.body.jobId}`).expect(200);
    expect(later.body.state).toBe(r.body.state);
  });
});

describe('compute pool', () => {
  it('relays the engine progress from the worker thread', async () => {
    const { createComputePool } = await import('../../server/compute/pool.js');
    const pool = createComputePool({ threads: 1 });
    try {
      const seen: { type: string; fraction?: number }[] = [];
      await pool.run('solve', solveInput, { timeLimitMs: 30_000, onProgress: (m) => seen.push(m) });
      await new Promise((r) => setTimeout(r, 50));
      expect(seen[0]?.type).toBe('started');
      const fractions = seen.filter((m) => m.type === 'progress').map((m) => m.fraction!);
      expect(fractions.length).toBeGreaterThan(0);
      for (const f of fractions) expect(f).toBeGreaterThanOrEqual(0);
      for (const f of fractions) expect(f).toBeLessThanOrEqual(1);
    } finally {
      await pool.close();
    }
  });

  it("runs its threads at the priority it is given, below the process's own (Linux nice is per thread: proc(5) and setpriority(2))", async () => {
    const { readdirSync, readFileSync } = await import('node:fs');
    // Field 19 of /proc/…/stat is the nice value; the fields after the command name start at field 3.
    const niceOf = (stat: string) => Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[16]);
    const base = niceOf(readFileSync('/proc/self/stat', 'utf8'));
    const want = Math.min(19, base + 7);
    const threadsAt = (nice: number) =>
      readdirSync('/proc/self/task').filter((tid) => {
        try {
          return niceOf(readFileSync(`/proc/self/task/${tid}/stat`, 'utf8')) === nice;
        } catch {
          return false; // a thread that ended meanwhile
        }
      }).length;
    const before = threadsAt(want);
    const { createComputePool } = await import('../../server/compute/pool.js');
    const pool = createComputePool({ threads: 1, niceIncrement: 7 });
    try {
      await pool.run('solve', solveInput, { timeLimitMs: 30_000 });
      // The pool thread (and any thread it starts afterwards, which inherits its priority).
      expect(threadsAt(want)).toBeGreaterThan(before);
    } finally {
      await pool.close();
    }
  });

  it('stops a task when its caller aborts (a client that went away)', async () => {
    const { createComputePool } = await import('../../server/compute/pool.js');
    const pool = createComputePool({ threads: 1 });
    try {
      const stop = new AbortController();
      setTimeout(() => stop.abort(), 100);
      const started = Date.now();
      const big = { ...sweepInput, travel: { from: -25, to: 25, step: 0.01 } };
      await expect(pool.run('corner-sweep', big, { timeLimitMs: 60_000, signal: stop.signal })).rejects.toMatchObject({ code: 'cancelled' });
      expect(Date.now() - started).toBeLessThan(5_000);
    } finally {
      await pool.close();
    }
  });
});
