/**
 * The study lanes of a queue worker. A chunk is computed on a worker thread
 * (runStudyChunk, pure and deterministic), then landed in one transaction:
 * the study_chunks row (its (study, chunk) key makes a retried or
 * duplicated chunk land once), the study's counters, and, with the last
 * chunk, the `study-combine` job. Whatever the number of workers, their
 * order, or how many died mid-chunk, the stored chunks are the same, so the
 * combined result is the same for a given seed.
 */
import { InputError, SolveError } from '../../shared/errors.js';
import { toErrorBody } from '../http/errors.js';
import { cancelStudyChunks } from '../services/studies.js';
import { QUEUES, bossDb, inTransaction, rollback, type QueueJobData } from './queue.js';
import type PgBoss from 'pg-boss';
import type { QueueHandler, RunnerContext } from './runner.js';
import type { ChunkWire } from '../../shared/study/index.js';

interface StudyRowLite {
  status: string;
  spec: unknown;
  total_chunks: number;
}

async function loadStudy(ctx: RunnerContext, studyId: string): Promise<StudyRowLite | undefined> {
  const r = await ctx.db.pool.query<StudyRowLite>('SELECT status, spec, total_chunks FROM studies WHERE id = $1', [studyId]);
  return r.rows[0];
}

/**
 * Study specs by study id, kept by this process: a spec never changes once
 * the study is stored, so a worker reads it once per study rather than once
 * per chunk (a spec carries whole corner and vehicle documents).
 */
const specs = new Map<string, unknown>();
async function studySpec(ctx: RunnerContext, studyId: string): Promise<unknown> {
  const hit = specs.get(studyId);
  if (hit !== undefined) return hit;
  const r = await ctx.db.pool.query<{ spec: unknown }>('SELECT spec FROM studies WHERE id = $1', [studyId]);
  const spec = r.rows[0]?.spec;
  if (spec === undefined) return undefined;
  if (specs.size >= 16) specs.delete(specs.keys().next().value!);
  specs.set(studyId, spec);
  return spec;
}

/** An engine error fails the study (retrying cannot help); the rest of its chunks are cancelled. */
async function failStudy(ctx: RunnerContext, studyId: string, totalChunks: number, err: unknown): Promise<void> {
  const b = toErrorBody(err);
  await ctx.db.pool.query(`UPDATE studies SET status = 'failed', finished_at = now(), error = $2 WHERE id = $1 AND status IN ('queued', 'running')`, [
    studyId,
    { code: b.code, message: b.message },
  ]);
  await cancelStudyChunks(ctx.queue, studyId, totalChunks);
}

const isEngineError = (err: unknown) => err instanceof InputError || err instanceof SolveError;

/**
 * A chunk job a lane has taken, checked and ready to compute. `watch` fires on the study's cancel from the
 * moment of the check (a lane may check a chunk before its thread is free); computeChunk releases it.
 */
export interface ChunkWork {
  studyId: string;
  chunkIndex: number;
  totalChunks: number;
  spec: unknown;
  watch: { signal: AbortSignal; release(): void };
}

/**
 * A computed chunk as the study thread hands it back: its counts, and the chunk in its wire form made on that
 * thread (shared/study chunkToWire: header text and outputs as doubles), which the main thread passes on to
 * PostgreSQL as they are (the outputs as a binary parameter, so neither side writes or parses them as text).
 */
export interface ComputedChunk extends ChunkWire {
  samples: number;
  poses: number;
}

/**
 * Phase 1 of a chunk, one query: is the study still active and the chunk not
 * landed yet (by an earlier attempt that died before telling the queue)?
 * Marks the study running with its first chunk. Null: nothing to do.
 */
export async function beginChunk(ctx: RunnerContext, job: PgBoss.JobWithMetadata<QueueJobData>): Promise<ChunkWork | null> {
  const { studyId, chunkIndex } = job.data as Extract<QueueJobData, { kind: 'study-chunk' }>;
  const watch = ctx.watchCancel(studyId);
  try {
    const w = await checkChunk(ctx, studyId, chunkIndex, watch);
    if (!w) watch.release();
    return w;
  } catch (err) {
    watch.release();
    throw err;
  }
}

async function checkChunk(ctx: RunnerContext, studyId: string, chunkIndex: number, watch: ChunkWork['watch']): Promise<ChunkWork | null> {
  const r = await ctx.db.pool.query<{ status: string; total_chunks: number; landed: boolean }>(
    `WITH started AS (
       UPDATE studies SET status = 'running', started_at = coalesce(started_at, now()) WHERE id = $1 AND status = 'queued' RETURNING id
     )
     SELECT s.status, s.total_chunks,
            EXISTS (SELECT 1 FROM study_chunks c WHERE c.study_id = $1 AND c.chunk_index = $2) AS landed,
            (SELECT count(*) FROM started) AS started
       FROM studies s WHERE s.id = $1`,
    [studyId, chunkIndex],
  );
  const s = r.rows[0];
  if (!s || (s.status !== 'queued' && s.status !== 'running') || s.landed) return null;
  const spec = await studySpec(ctx, studyId);
  if (spec === undefined) return null;
  return { studyId, chunkIndex, totalChunks: s.total_chunks, spec, watch };
}

/**
 * Phase 2: the chunk on a study thread. Null when there is nothing to land:
 * cancelled meanwhile, or an engine error that failed the study. Any other
 * error is thrown (the queue retries the chunk).
 */
export async function computeChunk(ctx: RunnerContext, w: ChunkWork): Promise<{ chunk: ComputedChunk; computeMs: number } | null> {
  const watch = w.watch;
  const t0 = performance.now();
  try {
    if (watch.signal.aborted) return null; // Cancelled between the check and now.
    const chunk = (await ctx.studyPool.run('study-chunk', { studyId: w.studyId, spec: w.spec, chunkIndex: w.chunkIndex }, {
      timeLimitMs: ctx.options.chunkTimeLimitMs,
      signal: watch.signal,
    })) as ComputedChunk;
    return { chunk, computeMs: performance.now() - t0 };
  } catch (err) {
    if (watch.signal.aborted) return null; // Cancelled or failed meanwhile.
    if (isEngineError(err)) {
      await failStudy(ctx, w.studyId, w.totalChunks, err);
      return null;
    }
    throw err; // The queue retries it.
  } finally {
    watch.release();
  }
}

/**
 * Phase 3, one transaction: the study_chunks row (its (study, chunk) key
 * makes a retried or duplicated chunk land once), the study's counters and,
 * with the last chunk, the `study-combine` job.
 */
export async function landChunk(ctx: RunnerContext, w: ChunkWork, chunk: ComputedChunk, computeMs: number): Promise<void> {
  const { studyId, chunkIndex } = w;
  await inTransaction(ctx.db.pool, async (client) => {
    const r = await client.query<{ done_chunks: number; total_chunks: number }>(
      `WITH ins AS (
         INSERT INTO study_chunks (study_id, chunk_index, samples, poses, result, outputs, compute_ms, worker)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8) ON CONFLICT DO NOTHING RETURNING 1
       )
       UPDATE studies SET done_chunks = done_chunks + 1, done_samples = done_samples + $3, compute_ms = compute_ms + $7, poses_solved = poses_solved + $4
        WHERE id = $1 AND status IN ('queued', 'running') AND EXISTS (SELECT 1 FROM ins)
        RETURNING done_chunks, total_chunks`,
      [studyId, chunkIndex, chunk.samples, chunk.poses, chunk.header, Buffer.from(chunk.outputs.buffer, chunk.outputs.byteOffset, chunk.outputs.byteLength), computeMs, ctx.workerName],
    );
    const s = r.rows[0];
    // Landed before (a duplicate), or cancelled (or failed) while this chunk ran: nothing of it is kept.
    if (!s) return rollback;
    if (s.done_chunks === s.total_chunks) {
      const combine: QueueJobData = { kind: 'study-combine', studyId };
      await ctx.boss.send(QUEUES.studyCombine, combine, { retryLimit: 4, retryDelay: 1, retryBackoff: true, expireInSeconds: 900, deadLetter: QUEUES.lost, db: bossDb(client) });
      await ctx.queue.notify('wake', client);
    }
    return true;
  });
}

/** The three phases in a row (the study lane overlaps them with the next chunk: runner.ts). */
export const studyChunkHandler: QueueHandler = async (ctx, job) => {
  const w = await beginChunk(ctx, job);
  if (!w) return;
  const done = await computeChunk(ctx, w);
  if (done) await landChunk(ctx, w, done.chunk, done.computeMs);
};

export const studyCombineHandler: QueueHandler = async (ctx, job) => {
  const { studyId } = job.data as Extract<QueueJobData, { kind: 'study-combine' }>;
  const study = await loadStudy(ctx, studyId);
  if (!study || study.status !== 'running') return;
  // The chunks as stored (a 100 000-sample study has about 14 MB of outputs): the study thread decodes them,
  // and hands the result back as text (its factors named as the API names them), so the main thread only
  // passes them between PostgreSQL and the thread.
  const rows = await ctx.db.pool.query<{ header: string; outputs: Buffer | null }>('SELECT result::text AS header, outputs FROM study_chunks WHERE study_id = $1 ORDER BY chunk_index', [studyId]);
  let result: string;
  try {
    result = await ctx.studyPool.runJson(
      'study-combine',
      { studyId, spec: study.spec, chunks: rows.rows },
      { timeLimitMs: Math.max(ctx.options.chunkTimeLimitMs, 300_000) },
    );
  } catch (err) {
    if (isEngineError(err)) return failStudy(ctx, studyId, study.total_chunks, err);
    throw err;
  }
  // One statement: the study completes with its result (as jsonb, and as the text the API serves: schema.ts
  // result_json) and its chunks' outputs, now in the combined result, are cleared (only when it completed
  // here: a study cancelled meanwhile keeps what it had).
  await ctx.db.pool.query(
    `WITH done AS (UPDATE studies SET status = 'completed', result = $2::text::jsonb, result_json = $2::text, finished_at = now() WHERE id = $1 AND status = 'running' RETURNING id)
     UPDATE study_chunks SET result = NULL, outputs = NULL WHERE study_id IN (SELECT id FROM done)`,
    [studyId, result],
  );
};
