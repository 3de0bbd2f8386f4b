/**
 * `npm run load` (issue 8, "Load"): starts a throwaway PostgreSQL cluster and
 * the real server (server/main.ts → startServer, seeded) in its own process,
 * so the load generator does not share the server's event loop, signs in as
 * the demo engineer and drives it with autocannon over loopback. Every scenario is bounded in time and in request
 * count and stops by itself. Prints requests/s, p50/p99 latency and errors
 * per scenario, and writes test-results/load.json. Targets are printed, not
 * asserted: zero errors; mixed p99 ≤ 200 ms; read p99 ≤ 50 ms while compute
 * runs (solves stay off the event loop, in the worker pool).
 *
 * Scenarios:
 *   read             10 connections, 10 s: team vehicles, a vehicle, an axle design, its revisions
 *   compute          4 connections, 10 s: POST /api/compute/corner-sweep (101 travel × 3 rack = 303 poses)
 *   readDuringCompute  the read mix (10 connections) while the compute scenario runs beside it, 10 s
 *   readPacedDuringCompute  the same at a steady 200 reads/s (a wait caused by solves, not by reads saturating the cores)
 *   mixed            50 connections, 30 s: 8 reads to 1 sweep, one session
 *   healthIdle / healthDuringFlood  GET /api/health at a steady 50/s, alone and while 8 anonymous clients
 *                    POST 1 MB JSON bodies to a members' route as fast as they can (issue 12 §4: the body of a
 *                    request that will be refused is never parsed, so health should stay near its idle latency)
 *   readPaced        the read mix alone at a steady 200 reads/s, 10 s: the floor the two scenarios below compare with
 *   readDuringStudy  the read mix and the study's own progress at a steady 200 reads/s, 10 s, while two
 *                    100 000-sample tolerance studies run on two `npm run worker` processes (issue 16); together they are
 *                    big enough to run through the whole window (the line says whether it did: a study that
 *                    finished early would leave reads measured beside idle workers)
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import autocannon, { type Request, type Result } from 'autocannon';
import { startThrowawayCluster } from '../../server/tools/pg.js';
import { startSeededServer } from '../support/server-process.js';
import { spawnWorker } from '../support/workers.js';
import { DEMO_PASSWORD } from '../../server/db/seed.js';
import { exampleCorners } from '../../shared/kinematics/examples.js';

const here = dirname(fileURLToPath(import.meta.url));
const SHORT_S = Number(process.env['LOAD_SHORT_SECONDS'] ?? 10);
const MIXED_S = Number(process.env['LOAD_MIXED_SECONDS'] ?? 30);
/** Hard cap on requests per scenario, whatever the speed of the machine. */
const MAX_REQUESTS = 200_000;
/** Steady read rate of the paced read-during-compute scenario. */
const READ_PACED_RPS = 200;

interface Figures {
  rps: number;
  p50Ms: number;
  p99Ms: number;
  maxMs: number;
  requests: number;
  errors: number;
  non2xx: number;
  timeouts: number;
}

function figures(r: Result): Figures {
  return {
    rps: Math.round(r.requests.average * 10) / 10,
    p50Ms: r.latency.p50,
    p99Ms: r.latency.p99,
    maxMs: r.latency.max,
    requests: r.requests.total,
    // Connection errors and timeouts, plus any answer that is not 2xx.
    errors: r.errors + r.non2xx,
    non2xx: r.non2xx,
    timeouts: r.timeouts,
  };
}

function print(name: string, f: Figures): void {
  console.log(
    `${name.padEnd(20)} ${String(f.rps).padStart(8)} req/s   p50 ${String(f.p50Ms).padStart(4)} ms   p99 ${String(f.p99Ms).padStart(4)} ms   max ${String(f.maxMs).padStart(5)} ms   ${f.requests} requests, ${f.errors} errors (${f.non2xx} non-2xx, ${f.timeouts} timeouts)`,
  );
}

/** One bounded autocannon run; a watchdog stops it if it overruns its duration. An empty cookie: an anonymous client. */
async function cannon(url: string, cookie: string, o: { connections: number; seconds: number; requests: Request[]; overallRate?: number }): Promise<Result> {
  const instance = autocannon({
    url,
    connections: o.connections,
    ...(o.overallRate ? { overallRate: o.overallRate } : {}),
    duration: o.seconds,
    maxOverallRequests: MAX_REQUESTS,
    timeout: 10,
    headers: { ...(cookie ? { cookie } : {}), 'x-rollwise-request': '1', 'content-type': 'application/json' },
    requests: o.requests,
  });
  const watchdog = setTimeout(() => instance.stop(), (o.seconds + 15) * 1000);
  try {
    return await instance;
  } finally {
    clearTimeout(watchdog);
  }
}

async function main(): Promise<void> {
  const started = Date.now();
  console.log('load: starting a throwaway PostgreSQL cluster and the server…');
  const cluster = await startThrowawayCluster('rollwise_load');
  const server = await startSeededServer(cluster.url);

  try {
    const base = server.url;
    const signIn = await fetch(`${base}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-rollwise-request': '1' },
      body: JSON.stringify({ email: 'engineer@tallowmere.example', password: DEMO_PASSWORD }),
    });
    if (signIn.status !== 200) throw new Error(`sign-in answered ${signIn.status}: ${await signIn.text()}`);
    const cookie = (signIn.headers.get('set-cookie') ?? '').split(';')[0]!;
    const get = async <T>(path: string): Promise<T> => {
      const r = await fetch(`${base}${path}`, { headers: { cookie } });
      if (!r.ok) throw new Error(`GET ${path} answered ${r.status}`);
      return (await r.json()) as T;
    };
    const teams = await get<{ id: string; slug: string }[]>('/api/teams');
    const team = teams.find((t) => t.slug === 'tallowmere') ?? teams[0]!;
    const vehicles = await get<{ id: string; name: string }[]>(`/api/teams/${team.id}/vehicles`);
    const vehicle = vehicles[0]!;
    const designs = await get<{ id: string }[]>(`/api/teams/${team.id}/vehicles/${vehicle.id}/axle-designs`);
    if (!designs[0]) throw new Error(`the seeded vehicle ${vehicle.name} has no axle design`);
    const design = designs[0];

    const reads: Request[] = [
      { method: 'GET', path: `/api/teams/${team.id}/vehicles` },
      { method: 'GET', path: `/api/teams/${team.id}/vehicles/${vehicle.id}` },
      { method: 'GET', path: `/api/teams/${team.id}/axle-designs/${design.id}` },
      { method: 'GET', path: `/api/teams/${team.id}/axle-designs/${design.id}/revisions` },
    ];
    const sweep: Request = {
      method: 'POST',
      path: '/api/compute/corner-sweep',
      body: JSON.stringify({ corner: exampleCorners.fsFrontWishbone, travel: { from: -25, to: 25, step: 0.5 }, rackMm: [-10, 0, 10] }),
    };
    // Warm-up: the worker pool starts its threads (and tsx compiles the engine) on the first compute.
    for (let i = 0; i < 3; i++) {
      const r = await fetch(`${base}${sweep.path}`, { method: 'POST', headers: { cookie, 'x-rollwise-request': '1', 'content-type': 'application/json' }, body: sweep.body ?? null });
      if (r.status !== 200) throw new Error(`warm-up sweep answered ${r.status}: ${await r.text()}`);
    }

    // Other processes on the machine share its cores: the load average says how far the figures can be trusted.
    const loadBefore = loadavg()[0]!;
    console.log(`load: ${base}, signed in as engineer@tallowmere.example; scenarios of ${SHORT_S} s and ${MIXED_S} s`);
    console.log(`load: ${cpus().length} cores, 1-minute load average ${loadBefore.toFixed(1)} before the run\n`);
    const read = figures(await cannon(base, cookie, { connections: 10, seconds: SHORT_S, requests: reads }));
    print('read', read);
    const compute = figures(await cannon(base, cookie, { connections: 4, seconds: SHORT_S, requests: [sweep] }));
    print('compute', compute);
    const [readBeside, computeBeside] = await Promise.all([
      cannon(base, cookie, { connections: 10, seconds: SHORT_S, requests: reads }),
      cannon(base, cookie, { connections: 4, seconds: SHORT_S, requests: [sweep] }),
    ]);
    const readDuringCompute = figures(readBeside);
    const computeDuringRead = figures(computeBeside);
    print('read during compute', readDuringCompute);
    print('compute beside reads', computeDuringRead);
    // The same reads at a steady 200 req/s (not as fast as they can go): how long a read waits because solves
    // are running, without the queueing of reads saturating the cores themselves.
    const [readPacedBeside] = await Promise.all([
      cannon(base, cookie, { connections: 10, seconds: SHORT_S, requests: reads, overallRate: READ_PACED_RPS }),
      cannon(base, cookie, { connections: 4, seconds: SHORT_S, requests: [sweep] }),
    ]);
    const readPacedDuringCompute = figures(readPacedBeside);
    print(`read ${READ_PACED_RPS}/s + compute`, readPacedDuringCompute);
    const mixed = figures(await cannon(base, cookie, { connections: 50, seconds: MIXED_S, requests: [...reads, ...reads, sweep] }));
    print('mixed (50 conn.)', mixed);

    // Anonymous 1 MB bodies against a members' route (answered 401 unread) beside steady health checks.
    const health: Request[] = [{ method: 'GET', path: '/api/health' }];
    const megabyte = JSON.stringify({ name: 'flood', data: Array.from({ length: 500_000 }, (_, i) => i % 10) });
    const flood: Request[] = [{ method: 'POST', path: `/api/teams/${team.id}/vehicles`, body: megabyte }];
    const healthIdle = figures(await cannon(base, '', { connections: 2, seconds: SHORT_S, requests: health, overallRate: 50 }));
    print('health idle', healthIdle);
    const [healthBeside, floodBeside] = await Promise.all([
      cannon(base, '', { connections: 2, seconds: SHORT_S, requests: health, overallRate: 50 }),
      cannon(base, '', { connections: 8, seconds: SHORT_S, requests: flood }),
    ]);
    const healthDuringFlood = figures(healthBeside);
    const floodFigures = figures(floodBeside);
    print('health during flood', healthDuringFlood);
    console.log(`${'1 MB anonymous flood'.padEnd(20)} ${String(floodFigures.rps).padStart(8)} req/s of ${(megabyte.length / 1e6).toFixed(2)} MB, ${floodFigures.requests} requests (${floodFigures.non2xx} answered 401 as they should, ${floodFigures.errors - floodFigures.non2xx} connection errors)`);
    // The same reads at the same steady rate with nothing else running: what the machine gives them anyway.
    const readPaced = figures(await cannon(base, cookie, { connections: 10, seconds: SHORT_S, requests: reads, overallRate: READ_PACED_RPS }));
    print(`read ${READ_PACED_RPS}/s alone`, readPaced);
    // Reads while a study runs on two worker processes (the server only answers; the workers compute).
    // As deployed beside the API (docs/operations.md, "CPU priority"): spawnWorker's test defaults run a worker at the test's own priority.
    const warm = { WORKER_WARM_START: 'true', WORKER_NICE: '10', COMPUTE_NICE: 'true' };
    const workers = [await spawnWorker(cluster.url, warm), await spawnWorker(cluster.url, warm)];
    let readDuringStudy: Figures;
    let studyChunks = 0;
    let studyRanThroughout = false;
    try {
      const api = async (method: string, path: string, body?: unknown) => {
        const r = await fetch(`${base}${path}`, {
          method,
          headers: { cookie, 'x-rollwise-request': '1', ...(body ? { 'content-type': 'application/json' } : {}) },
          ...(body ? { body: JSON.stringify(body) } : {}),
        });
        if (!r.ok) throw new Error(`${method} ${path} answered ${r.status}: ${await r.text()}`);
        return (await r.json()) as { study: { id: string; status: string; progress: { doneChunks: number; totalChunks: number } } };
      };
      const studyPath = `/api/teams/${team.id}/studies`;
      // Two 100 000-sample studies (the most one study may have), taking turns by chunk: on a quiet machine two
      // workers finish one within the 10 s window, and the second keeps them computing to its end.
      const submit = async (seed: number) =>
        (
          await api('POST', studyPath, {
            kind: 'tolerance',
            target: { axleDesignId: design.id },
            seed,
            samples: 100_000,
            tolerances: ['lowerFront', 'lowerRear', 'upperFront', 'upperRear', 'tieRodInner', 'tieRodOuter'].map((point) => ({ point, axis: 'sphere', plusMinusMm: 0.5, distribution: 'normal' })),
            analysis: { rackMm: [-10, 0, 10], rollDeg: 2 },
          })
        ).study;
      const study = await submit(8);
      const second = await submit(9);
      for (let s = study; s.status !== 'running'; s = (await api('GET', `${studyPath}/${study.id}`)).study) {
        if (s.status !== 'queued') throw new Error(`the load study ended ${s.status} before the reads`);
        await new Promise((r) => setTimeout(r, 50));
      }
      readDuringStudy = figures(
        await cannon(base, cookie, { connections: 10, seconds: SHORT_S, requests: [...reads, { method: 'GET', path: `${studyPath}/${study.id}` }], overallRate: READ_PACED_RPS }),
      );
      const after = await Promise.all([study, second].map(async (x) => (await api('DELETE', `${studyPath}/${x.id}`)).study));
      studyChunks = after.reduce((n, x) => n + x.progress.doneChunks, 0);
      // One still running when cancelled: the workers computed through the whole window.
      studyRanThroughout = after.some((x) => x.status === 'cancelled' && x.progress.doneChunks < x.progress.totalChunks);
    } finally {
      await Promise.all(workers.map((w) => w.stop()));
    }
    print(`read ${READ_PACED_RPS}/s + study`, readDuringStudy);
    console.log(`  (the studies landed ${studyChunks} chunks of 500 samples meanwhile; ${studyRanThroughout ? 'one was still running when the reads ended' : 'both ENDED before the reads did: part of the window had idle workers'})`);

    const out: Record<string, number> = {};
    const put = (prefix: string, f: Figures) => {
      for (const [k, v] of Object.entries(f)) out[`${prefix}.${k}`] = v;
    };
    put('load.read', read);
    put('load.compute', compute);
    put('load.readDuringCompute', readDuringCompute);
    put('load.computeDuringRead', computeDuringRead);
    put('load.readPacedDuringCompute', readPacedDuringCompute);
    put('load.mixed', mixed);
    put('load.healthIdle', healthIdle);
    put('load.healthDuringFlood', healthDuringFlood);
    put('load.anonymousFlood', floodFigures);
    put('load.readPaced', readPaced);
    put('load.readDuringStudy', readDuringStudy);
    out['load.studyChunksDuringReads'] = studyChunks;
    out['load.studyRanThroughoutReads'] = studyRanThroughout ? 1 : 0;
    out['load.machine.cores'] = cpus().length;
    out['load.machine.loadAvgBefore'] = Math.round(loadBefore * 10) / 10;
    out['load.machine.loadAvgAfter'] = Math.round(loadavg()[0]! * 10) / 10;
    const dir = join(here, '..', '..', 'test-results');
    mkdirSync(dir, { recursive: true });
    writeFileSync(join(dir, 'load.json'), JSON.stringify(out, null, 2) + '\n');

    const totalErrors = read.errors + compute.errors + readDuringCompute.errors + computeDuringRead.errors + readPacedDuringCompute.errors + mixed.errors + readPaced.errors + readDuringStudy.errors;
    const check = (ok: boolean) => (ok ? 'met' : 'NOT met');
    console.log(`\ntargets (shown, not asserted):`);
    console.log(`  zero errors                          ${check(totalErrors === 0)} (${totalErrors})`);
    console.log(`  mixed p99 ≤ 200 ms                   ${check(mixed.p99Ms <= 200)} (${mixed.p99Ms} ms)`);
    console.log(`  read p99 ≤ 50 ms while compute runs  ${check(readDuringCompute.p99Ms <= 50)} (${readDuringCompute.p99Ms} ms; reads as fast as they go)`);
    console.log(`    at a steady ${READ_PACED_RPS} reads/s beside the same compute: p99 ${readPacedDuringCompute.p99Ms} ms (${check(readPacedDuringCompute.p99Ms <= 50)})`);
    console.log(`  health p99 under a 1 MB anonymous flood  ${healthDuringFlood.p99Ms} ms vs ${healthIdle.p99Ms} ms idle (p50 ${healthDuringFlood.p50Ms} vs ${healthIdle.p50Ms} ms)`);
    console.log(`  read p99 ≤ 50 ms while a study runs   ${check(readDuringStudy.p99Ms <= 50)} (${readDuringStudy.p99Ms} ms at ${READ_PACED_RPS} reads/s, two workers; the same reads alone: p99 ${readPaced.p99Ms} ms)`);
    console.log(`  (1-minute load average ${loadBefore.toFixed(1)} before, ${loadavg()[0]!.toFixed(1)} after, on ${cpus().length} cores)`);
    console.log(`\nwrote test-results/load.json (${Object.keys(out).length} figures) in ${Math.round((Date.now() - started) / 1000)} s`);
  } finally {
    // Let the sweeps autocannon cut off at the end finish before the pool shuts down.
    await new Promise((r) => setTimeout(r, 2000));
    await server.close();
    cluster.remove();
  }
}

main().then(
  () => process.exit(0),
  (err: unknown) => {
    console.error('load:', err instanceof Error ? err.message : err);
    process.exit(1);
  },
);
