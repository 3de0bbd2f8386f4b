/**
 * Study throughput on the real job queue: a throwaway PostgreSQL, the real
 * server (its own process, no worker inside) and `npm run worker` processes.
 *   study.tolerance10k.wallS       10 000-sample tolerance study of the demo double-wishbone front corner
 *                                  (bump steer at three rack positions, roll sweep), submit → stored result,
 *                                  two workers (target ≤ 6 s on the 2-core machine)
 *   study.tolerance10k.oneWorkerWallS   the same with one worker
 *   study.scalingTwoWorkers        chunk throughput of two worker processes ÷ one (target ≥ 1.7)
 * Every figure is the median round's: ROLLWISE_BENCH_ROUNDS rounds (default 3) of one worker, then two, each
 * a few seconds apart, because this machine's speed drifts from one minute to the next (each round is printed).
 *   study.queueOverheadPerChunkMs  per chunk, chunk-phase time not spent computing on the lane's thread (fetch,
 *                                  hand-off to the thread, landing), from the one-worker run
 * and the same measured in CPU time (this machine is shared: wall time counts other processes' turns):
 *   study.tolerance10k.workerCpuS  CPU seconds of the two worker processes (all threads) for the 10 000-sample study
 *   study.queuePosesPerWorkerCpuS  poses per CPU second of a worker process, main thread and queue work included
 *                                  (one-worker run)
 *   study.scalingTwoWorkersCpu     what scalingTwoWorkers would be with a core per worker: the one worker's CPU
 *                                  time ÷ the busier of the two workers' CPU time
 *   study.scalingTwoWorkersCoreBound  what scalingTwoWorkers can be at most when the two workers share the 2 cores
 *                                  with PostgreSQL, the API server and this bench: the one-worker run's chunk time
 *                                  is its study thread's CPU (the rest runs on the other core), the two-worker
 *                                  run's at least half the CPU every process spent in its chunk phase; so
 *                                  2 × (one worker's CPU less its main thread's) ÷ (that CPU)
 *   study.postgresCpuPerChunkMs    PostgreSQL's CPU per chunk in the one-worker chunk phase (fetch, check, landing,
 *                                  complete; its background processes and this bench's 100 ms polls included)
 *   study.readCompletedApiCpuMs    the API server's CPU per GET of the completed 10 000-sample study
 * Each run also prints the CPU seconds of each process (workers with their main threads, PostgreSQL, the API
 * server, the bench) from submit to the last chunk's landing and from there to the stored result, and
 * ROLLWISE_BENCH_TIMELINE=1 prints when each chunk was taken and computed.
 * Figures only; nothing passes or fails. The load average is printed: other
 * work on the machine shares its cores.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadavg } from 'node:os';
import pg from 'pg';
import type { BenchFigures } from './run.js';
import { startThrowawayCluster } from '../../server/tools/pg.js';
import { NOTIFY_CHANNEL } from '../../server/compute/queue.js';
import { DEMO_PASSWORD } from '../../server/db/seed.js';
import { startSeededServer } from '../support/server-process.js';
import { spawnWorker, type WorkerProcess } from '../support/workers.js';

const round = (x: number, d = 2) => Math.round(x * 10 ** d) / 10 ** d;

/** Rounds of one worker then two (ROLLWISE_BENCH_ROUNDS, default 3). */
const ROUNDS = Math.max(1, Number(process.env['ROLLWISE_BENCH_ROUNDS'] ?? 3));
const WORKER_ENV = { NODE_ENV: 'production', SESSION_SECRET: 'x'.repeat(40) };
/** Samples of the warm-up study each worker runs before it is measured. */
const WARM_SAMPLES = 4000;

/** Fields of a /proc stat file after the command name (f[0] is field 3 of proc(5)); undefined once the process has gone. */
function statFields(path: string): string[] | undefined {
  try {
    const stat = readFileSync(path, 'utf8');
    return stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  } catch {
    return undefined;
  }
}
/** Clock ticks of /proc (Linux: 1/100 s). */
const TICK_S = 0.01;
/** CPU seconds (user + system) of a process (all threads) or, with `tid`, of one of its threads, from fields 14 and 15. */
function cpuSeconds(pid: number, tid?: number): number {
  const f = statFields(tid === undefined ? `/proc/${pid}/stat` : `/proc/${pid}/task/${tid}/stat`);
  return f ? (Number(f[11]) + Number(f[12])) * TICK_S : 0;
}
/**
 * CPU seconds of a process and its descendants: those running (PostgreSQL's backends, one per connection) and
 * those already ended (their totals are in their parent's fields 16 and 17, cutime and cstime).
 */
function treeCpuSeconds(root: number): number {
  const children = new Map<number, number[]>();
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    const f = statFields(`/proc/${d}/stat`);
    if (!f) continue;
    const parent = Number(f[1]);
    children.set(parent, [...(children.get(parent) ?? []), Number(d)]);
  }
  let total = 0;
  const visit = (pid: number) => {
    const f = statFields(`/proc/${pid}/stat`);
    if (!f) return;
    total += (Number(f[11]) + Number(f[12]) + Number(f[13]) + Number(f[14])) * TICK_S;
    for (const c of children.get(pid) ?? []) visit(c);
  };
  visit(root);
  return total;
}

export async function run(): Promise<BenchFigures> {
  const cluster = await startThrowawayCluster('rollwise_bench_study');
  const server = await startSeededServer(cluster.url, { STUDY_MAX_ACTIVE_PER_TEAM: '10' });

  const db = new pg.Pool({ connectionString: cluster.url, max: 2 });
  const workers: WorkerProcess[] = [];
  const listener = new pg.Client({ connectionString: cluster.url });
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

    const postmaster = Number(readFileSync(join(cluster.dataDir, 'postmaster.pid'), 'utf8').split('\n')[0]);
    /** CPU seconds so far of each worker (all threads, and its main thread alone), PostgreSQL, the API server and this process. */
    const cpuNow = () => ({
      workers: workers.map((w) => cpuSeconds(w.pid)),
      workerMains: workers.map((w) => cpuSeconds(w.pid, w.pid)),
      postgres: treeCpuSeconds(postmaster),
      api: treeCpuSeconds(server.pid),
      bench: (process.cpuUsage().user + process.cpuUsage().system) / 1e6,
    });
    type Cpu = ReturnType<typeof cpuNow>;
    const cpuSince = (a: Cpu, b: Cpu) => ({
      workers: b.workers.map((x, i) => x - a.workers[i]!),
      workerMains: b.workerMains.map((x, i) => x - a.workerMains[i]!),
      postgres: b.postgres - a.postgres,
      api: b.api - a.api,
      bench: b.bench - a.bench,
    });

    // The workers' own wake-up call: the transaction that lands a study's last chunk notifies them to combine it.
    await listener.connect();
    await listener.query(`LISTEN ${NOTIFY_CHANNEL}`);
    let onWake = () => {};
    listener.on('notification', () => onWake());

    /** Submit → stored result, and the chunk phase from the study's chunk rows. */
    const measure = async (samples: number, seed: number) => {
      const cpu0 = cpuNow();
      const t0 = Date.now();
      // The CPU counters are read again as the last chunk lands (on the workers' notification, within a
      // millisecond or two), which splits the chunks from the combine step.
      let landed: { cpu: Cpu; t: number } | undefined;
      let studyId: string | undefined;
      const allLanded = async () => {
        if (landed || !studyId) return;
        const { done_chunks, total_chunks } = (await db.query<{ done_chunks: number; total_chunks: number }>('SELECT done_chunks, total_chunks FROM studies WHERE id = $1', [studyId])).rows[0]!;
        if (!landed && done_chunks === total_chunks) landed = { cpu: cpuNow(), t: Date.now() };
      };
      onWake = () => void allLanded();
      const { study: s } = await api<{ study: { id: string } }>('POST', `/api/teams/${team.id}/studies`, study(samples, seed));
      studyId = s.id;
      // Watched in the database every 100 ms (and on the notification above), not through the API: the server's
      // answers would take CPU from the workers being measured; the API answers once at the end. The times
      // measured are the study row's own, not when this loop noticed them.
      let finishedAt = 0;
      for (;;) {
        const { status, finished } = (await db.query<{ status: string; finished: number | null }>('SELECT status, extract(epoch FROM finished_at)::float * 1000 AS finished FROM studies WHERE id = $1', [s.id])).rows[0]!;
        if (status === 'completed') {
          finishedAt = finished!;
          break;
        }
        if (status !== 'queued' && status !== 'running') throw new Error(`bench study ended ${status}`);
        await new Promise((r) => setTimeout(r, 100));
      }
      await allLanded();
      const cpu2 = cpuNow();
      const wallS = (finishedAt - t0) / 1000;
      const chunksCpu = cpuSince(cpu0, landed!.cpu);
      const combineCpu = cpuSince(landed!.cpu, cpu2);
      const workerCpuS = cpuSince(cpu0, cpu2).workers;
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
      const timeline = (
        await db.query<{ worker: string; chunk_index: number; compute_ms: number; landed_ms: number; taken_ms: number }>(
          `SELECT c.worker, c.chunk_index, c.compute_ms, extract(epoch FROM c.finished_at - s.started_at)::float * 1000 AS landed_ms,
                  extract(epoch FROM j.started_on - s.started_at)::float * 1000 AS taken_ms
             FROM study_chunks c JOIN studies s ON s.id = c.study_id
             LEFT JOIN pgboss.job j ON j.name = 'study-chunk' AND (j.data->>'studyId')::uuid = c.study_id AND (j.data->>'chunkIndex')::int = c.chunk_index
            WHERE s.id = $1 ORDER BY c.worker, c.chunk_index`,
          [s.id],
        )
      ).rows;
      if (process.env['ROLLWISE_BENCH_TIMELINE']) {
        for (const r of timeline) console.log(`    ${r.worker} chunk ${r.chunk_index}: taken ${Math.round(r.taken_ms)} ms, computed ${Math.round(r.landed_ms - r.compute_ms)}–${Math.round(r.landed_ms)} ms (${Math.round(r.compute_ms)} ms)`);
      }
      const chunkPhaseS = (landed!.t - t0) / 1000;
      const combineS = (finishedAt - landed!.t) / 1000;
      return { studyId: s.id, wallS, chunksCpu, combineCpu, chunkPhaseS, combineS, workerCpuS, perWorker: split.map((w) => w.chunks), tailS: split.length > 1 ? split.at(-1)!.last - split[0]!.last : 0, ...c };
    };

    type Measured = Awaited<ReturnType<typeof measure>>;
    const report = (n: number, r: Measured) => {
      console.log(
        `  ${n} worker(s): 10 000 samples in ${round(r.wallS)} s submit→stored; chunk phase ${round(r.phase_s)} s, ${r.chunks} chunks, ` +
          `submit→first chunk ${round(r.pre_s)} s, last chunk→stored ${round(r.post_s)} s, compute ${round(r.compute_ms / 1000)} s, ${Math.round(r.poses / (r.compute_ms / 1000))} poses/s per busy thread; ` +
          `worker CPU ${r.workerCpuS.map((x) => round(x)).join(' + ')} s` +
          (n > 1 ? `; chunks per worker ${r.perWorker.join(' + ')}, the first to finish waited ${round(r.tailS)} s for the other` : ''),
      );
      const cpuLine = (what: string, wallS: number, c: typeof r.chunksCpu) =>
        `    CPU s, ${what} (${round(wallS)} s wall): workers ${c.workers.map((x, i) => `${round(x)} (main thread ${round(c.workerMains[i]!)})`).join(' + ')}, ` +
        `PostgreSQL ${round(c.postgres)}, API server ${round(c.api)}, bench ${round(c.bench)}`;
      console.log(cpuLine('submit → every chunk landed', r.chunkPhaseS, r.chunksCpu));
      console.log(cpuLine('every chunk landed → stored', r.combineS, r.combineCpu));
    };
    // Rounds of one worker, then two, a few seconds apart: this machine's speed drifts by ±15 % from one minute
    // to the next (other machines share its host), so each ratio compares runs made close together, and the
    // figures are the median round's. The second worker is started for each round and stopped after it. Each
    // worker first runs a warm-up study (WARM_SAMPLES) so that both compare as long-running workers do: a
    // fresh process still compiles the engine's code on its background threads for its first few hundred
    // milliseconds of chunks, on the cores the measured study needs.
    const rounds: { one: Measured; two: Measured; ratio: number }[] = [];
    workers.push(await spawnWorker(cluster.url, WORKER_ENV));
    await measure(WARM_SAMPLES, 7);
    for (let k = 0; k < ROUNDS; k++) {
      console.log(`  round ${k + 1} of ${ROUNDS}`);
      const one = await measure(10_000, 2026 + k);
      report(1, one);
      workers.push(await spawnWorker(cluster.url, WORKER_ENV));
      await measure(WARM_SAMPLES, 7);
      const two = await measure(10_000, 2026 + k);
      report(2, two);
      await workers.pop()!.stop();
      rounds.push({ one, two, ratio: one.phase_s / two.phase_s });
    }
    const { one, two } = [...rounds].sort((a, b) => a.ratio - b.ratio)[Math.floor(ROUNDS / 2)]!;
    console.log(`  scaling by round: ${rounds.map((r) => round(r.ratio)).join(', ')} (the figures below are the median round's)`);
    // Reading the completed 10 000-sample study: the API server's CPU per answer (its event loop's work).
    const reads = 100;
    const apiCpu0 = treeCpuSeconds(server.pid);
    const r0 = performance.now();
    let answerBytes = 0;
    for (let i = 0; i < reads; i++) {
      const r = await fetch(`${server.url}/api/teams/${team.id}/studies/${two.studyId}`, { headers: { cookie, 'x-rollwise-request': '1', 'accept-encoding': 'identity' } });
      answerBytes = (await r.text()).length;
    }
    const readMs = (performance.now() - r0) / reads;
    const readApiCpuMs = ((treeCpuSeconds(server.pid) - apiCpu0) * 1000) / reads;
    console.log(`  reading the completed study (${Math.round(answerBytes / 1000)} kB answer, ${reads} reads one after another): ${round(readMs, 1)} ms each, API server CPU ${round(readApiCpuMs, 1)} ms each`);
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
      'study.scalingTwoWorkersCoreBound': round(
        (2 * (one.chunksCpu.workers[0]! - one.chunksCpu.workerMains[0]!)) /
          (two.chunksCpu.workers.reduce((a, b) => a + b, 0) + two.chunksCpu.postgres + two.chunksCpu.api + two.chunksCpu.bench),
      ),
      'study.postgresCpuPerChunkMs': round((one.chunksCpu.postgres * 1000) / one.chunks, 1),
      'study.readCompletedApiCpuMs': round(readApiCpuMs, 1),
    };
  } finally {
    await Promise.all(workers.map((w) => w.stop()));
    await listener.end().catch(() => undefined);
    await db.end();
    await server.close();
    cluster.remove();
  }
}
