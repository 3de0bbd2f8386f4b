/**
 * Study throughput on the real job queue: a throwaway PostgreSQL, the real
 * server (its own process, no worker inside) and `npm run worker` processes.
 *   study.tolerance10k.wallS       10 000-sample tolerance study of the demo double-wishbone front corner
 *                                  (bump steer at three rack positions, roll sweep), submit → stored result,
 *                                  two workers (target ≤ 6 s on the 2-core machine)
 *   study.tolerance10k.oneWorkerWallS   the same with one worker
 *   study.scalingTwoWorkers        chunk throughput of two worker processes ÷ one (target ≥ 1.7)
 *   study.queueOverheadPerChunkMs  per chunk, chunk-phase time not spent computing on the lane's thread (fetch,
 *                                  hand-off to the thread, landing), from the one-worker run
 * and the same measured in CPU time (this machine is shared: wall time counts other processes' turns):
 *   study.tolerance10k.workerCpuS  CPU seconds of the two worker processes (all threads) for the 10 000-sample study
 *   study.queuePosesPerWorkerCpuS  poses per CPU second of a worker process, main thread and queue work included
 *                                  (one-worker run)
 *   study.scalingTwoWorkersCpu     what scalingTwoWorkers would be with a core per worker: the one worker's CPU
 *                                  time ÷ the busier of the two workers' CPU time
 * Figures only; nothing passes or fails. The load average is printed: other
 * work on the machine shares its cores.
 */
import { readFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import pg from 'pg';
import type { BenchFigures } from './run.js';
import { startThrowawayCluster } from '../../server/tools/pg.js';
import { DEMO_PASSWORD } from '../../server/db/seed.js';
import { startSeededServer } from '../support/server-process.js';
import { spawnWorker, type WorkerProcess } from '../support/workers.js';

const round = (x: number, d = 2) => Math.round(x * 10 ** d) / 10 ** d;

/** CPU seconds (user + system, all threads) a process has used so far, from /proc (Linux; clock ticks of 1/100 s). */
function cpuSeconds(pid: number): number {
  const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
  const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  // Fields 14 and 15 of proc(5) (utime, stime); f starts at field 3.
  return (Number(f[11]) + Number(f[12])) / 100;
}

export async function run(): Promise<BenchFigures> {
  const cluster = await startThrowawayCluster('rollwise_bench_study');
  const server = await startSeededServer(cluster.url, { STUDY_MAX_ACTIVE_PER_TEAM: '10' });

  const db = new pg.Pool({ connectionString: cluster.url, max: 2 });
  const workers: WorkerProcess[] = [];
  try {
    const base = server.url;
    const signIn = await fetch(`${base}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-rollwise-request': '1' },
      body: JSON.stringify({ email: 'engineer@tallowmere.example', password: DEMO_PASSWORD }),
    });
    const cookie = (signIn.headers.get('set-cookie') ?? '').split(';')[0]!;
    const api = async <T>(method: string, path: string, body?: unknown): Promise<T> => {
      const r = await fetch(`${base}${path}`, {
        method,
        headers: { cookie, 'x-rollwise-request': '1', ...(body ? { 'content-type': 'application/json' } : {}) },
        ...(body ? { body: JSON.stringify(body) } : {}),
      });
      if (!r.ok) throw new Error(`${method} ${path} answered ${r.status}: ${await r.text()}`);
      return (await r.json()) as T;
    };
    const team = (await api<{ id: string; slug: string }[]>('GET', '/api/teams')).find((t) => t.slug === 'tallowmere')!;
    const vehicle = (await api<{ id: string; name: string }[]>('GET', `/api/teams/${team.id}/vehicles`)).find((v) => v.name === 'TUR-26 Ember')!;
    const design = (await api<{ id: string; name: string }[]>('GET', `/api/teams/${team.id}/vehicles/${vehicle.id}/axle-designs`)).find((d) => d.name === 'Front baseline')!;
    const study = (samples: number, seed: number) => ({
      kind: 'tolerance',
      label: `bench ${samples}`,
      target: { axleDesignId: design.id },
      seed,
      samples,
      tolerances: ['lowerFront', 'lowerRear', 'upperFront', 'upperRear', 'lowerOuter', 'upperOuter', 'tieRodInner', 'tieRodOuter'].map((point) => ({
        point,
        axis: 'sphere',
        plusMinusMm: 0.5,
        distribution: 'normal',
      })),
      analysis: { rackMm: [-10, 0, 10], rollDeg: 2 },
    });

    /** Submit → stored result, and the chunk phase from the study's chunk rows. */
    const measure = async (samples: number, seed: number) => {
      const cpu0 = workers.map((w) => cpuSeconds(w.pid));
      const t0 = performance.now();
      const { study: s } = await api<{ study: { id: string } }>('POST', `/api/teams/${team.id}/studies`, study(samples, seed));
      // Watched in the database (one indexed row read every 20 ms), not through the API: the server's answers
      // would take CPU from the workers being measured; the API answers once at the end.
      for (;;) {
        const { status } = (await db.query<{ status: string }>('SELECT status FROM studies WHERE id = $1', [s.id])).rows[0]!;
        if (status === 'completed') break;
        if (status !== 'queued' && status !== 'running') throw new Error(`bench study ended ${status}`);
        await new Promise((r) => setTimeout(r, 20));
      }
      const wallS = (performance.now() - t0) / 1000;
      const workerCpuS = workers.map((w, i) => cpuSeconds(w.pid) - cpu0[i]!);
      const { study: stored } = await api<{ study: { status: string } }>('GET', `/api/teams/${team.id}/studies/${s.id}`);
      if (stored.status !== 'completed') throw new Error(`the API shows the bench study ${stored.status}`);
      // Each worker's chunks and when it landed its last: the gap is how long one waited for the other at the end.
      const split = (
        await db.query<{ chunks: number; last: number }>(
          'SELECT count(*)::int AS chunks, extract(epoch FROM max(finished_at))::float AS last FROM study_chunks WHERE study_id = $1 GROUP BY worker ORDER BY 2',
          [s.id],
        )
      ).rows;
      const c = (
        await db.query<{ chunks: number; samples: number; compute_ms: number; phase_s: number; poses: number; pre_s: number; post_s: number }>(
          `SELECT count(*)::int AS chunks, sum(c.samples)::int AS samples, sum(c.compute_ms)::float AS compute_ms, sum(c.poses)::float AS poses,
                  extract(epoch FROM max(c.finished_at) - s.started_at)::float AS phase_s, extract(epoch FROM s.started_at - s.created_at)::float AS pre_s, extract(epoch FROM s.finished_at - max(c.finished_at))::float AS post_s
             FROM study_chunks c JOIN studies s ON s.id = c.study_id WHERE s.id = $1 GROUP BY s.started_at, s.created_at, s.finished_at`,
          [s.id],
        )
      ).rows[0]!;
      return { wallS, workerCpuS, perWorker: split.map((w) => w.chunks), tailS: split.length > 1 ? split.at(-1)!.last - split[0]!.last : 0, ...c };
    };

    const results: Record<number, Awaited<ReturnType<typeof measure>>> = {};
    for (const n of [1, 2]) {
      while (workers.length < n) workers.push(await spawnWorker(cluster.url, { NODE_ENV: 'production', SESSION_SECRET: 'x'.repeat(40) }));
      await measure(1000, 7); // warm-up: threads load the engines, the JIT warms
      results[n] = await measure(10_000, 2026);
      console.log(
        `  ${n} worker(s): 10 000 samples in ${round(results[n].wallS)} s submit→stored; chunk phase ${round(results[n].phase_s)} s, ${results[n].chunks} chunks, ` +
          `submit→first chunk ${round(results[n].pre_s)} s, last chunk→stored ${round(results[n].post_s)} s, compute ${round(results[n].compute_ms / 1000)} s, ${Math.round(results[n].poses / (results[n].compute_ms / 1000))} poses/s per busy thread; ` +
          `worker CPU ${results[n].workerCpuS.map((x) => round(x)).join(' + ')} s` +
          (n > 1 ? `; chunks per worker ${results[n].perWorker.join(' + ')}, the first to finish waited ${round(results[n].tailS)} s for the other` : ''),
      );
    }
    const one = results[1]!;
    const two = results[2]!;
    const overheadMs = (one.phase_s * 1000 - one.compute_ms) / one.chunks;
    console.log(`  load average ${loadavg().map((x) => x.toFixed(1)).join(' ')} (2 cores; other work shares them)`);
    console.log('  targets: tolerance10k.wallS ≤ 6 s with two workers; scalingTwoWorkers ≥ 1.7');
    return {
      'study.tolerance10k.wallS': round(two.wallS),
      'study.tolerance10k.oneWorkerWallS': round(one.wallS),
      'study.scalingTwoWorkers': round(one.phase_s / two.phase_s),
      'study.queueOverheadPerChunkMs': round(overheadMs, 1),
      'study.tolerance10k.workerCpuS': round(two.workerCpuS.reduce((a, b) => a + b, 0)),
      'study.queuePosesPerWorkerCpuS': Math.round(one.poses / one.workerCpuS[0]!),
      'study.scalingTwoWorkersCpu': round(one.workerCpuS[0]! / Math.max(...two.workerCpuS)),
    };
  } finally {
    await Promise.all(workers.map((w) => w.stop()));
    await db.end();
    await server.close();
    cluster.remove();
  }
}
