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
import type { StudyChunkResult, StudyResult } from '../../shared/study/index.js';
import { toErrorBody } from '../http/errors.js';
import { cancelStudyChunks } from '../services/studies.js';
import { QUEUES, bossDb, inTransaction, rollback, type QueueJobData } from './queue.js';
import type { QueueHandler, RunnerContext } from './runner.js';

interface StudyRowLite {
  status: string;
  spec: unknown;
  total_chunks: number;
}

async function loadStudy(ctx: RunnerContext, studyId: string): Promise<StudyRowLite | undefined> {
  const r = await ctx.db.pool.query<StudyRowLite>('SELECT status, spec, total_chunks FROM studies WHERE id = $1', [studyId]);
  return r.rows[0];
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

export const studyChunkHandler: QueueHandler = async (ctx, job) => {
  const data = job.data as Extract<QueueJobData, { kind: 'study-chunk' }>;
  const { studyId, chunkIndex } = data;
  const study = await loadStudy(ctx, studyId);
  if (!study || (study.status !== 'queued' && study.status !== 'running')) return;
  const done = await ctx.db.pool.query('SELECT 1 FROM study_chunks WHERE study_id = $1 AND chunk_index = $2', [studyId, chunkIndex]);
  if (done.rowCount) return; // Landed by an earlier attempt that died before telling the queue.
  await ctx.db.pool.query(`UPDATE studies SET status = 'running', started_at = coalesce(started_at, now()) WHERE id = $1 AND status = 'queued'`, [studyId]);

  const watch = ctx.watchCancel(studyId);
  let chunk: StudyChunkResult;
  const t0 = performance.now();
  try {
    chunk = (await ctx.pool.run('study-chunk', { studyId, spec: study.spec, chunkIndex }, { timeLimitMs: ctx.options.chunkTimeLimitMs, signal: watch.signal })) as StudyChunkResult;
  } catch (err) {
    if (watch.signal.aborted) return; // Cancelled or failed meanwhile.
    if (isEngineError(err)) return failStudy(ctx, studyId, study.total_chunks, err);
    throw err; // The queue retries it.
  } finally {
    watch.release();
  }
  const computeMs = performance.now() - t0;

  await inTransaction(ctx.db.pool, async (client) => {
    const ins = await client.query(
      `INSERT INTO study_chunks (study_id, chunk_index, samples, poses, result, compute_ms, worker)
       VALUES ($1, $2, $3, $4, $5, $6, $7) ON CONFLICT DO NOTHING`,
      [studyId, chunkIndex, chunk.samples, chunk.poses, chunk, computeMs, ctx.workerName],
    );
    if (ins.rowCount === 0) return rollback;
    const up = await client.query<{ done_chunks: number; total_chunks: number }>(
      `UPDATE studies SET done_chunks = done_chunks + 1, done_samples = done_samples + $2, compute_ms = compute_ms + $3, poses_solved = poses_solved + $4
        WHERE id = $1 AND status IN ('queued', 'running') RETURNING done_chunks, total_chunks`,
      [studyId, chunk.samples, computeMs, chunk.poses],
    );
    const s = up.rows[0];
    // Cancelled (or failed) while this chunk ran: nothing of it is kept.
    if (!s) return rollback;
    if (s.done_chunks === s.total_chunks) {
      const combine: QueueJobData = { kind: 'study-combine', studyId };
      await ctx.boss.send(QUEUES.studyCombine, combine, { retryLimit: 3, expireInSeconds: 900, deadLetter: QUEUES.lost, db: bossDb(client) });
      await ctx.queue.notify('wake', client);
    }
    return true;
  });
};

export const studyCombineHandler: QueueHandler = async (ctx, job) => {
  const { studyId } = job.data as Extract<QueueJobData, { kind: 'study-combine' }>;
  const study = await loadStudy(ctx, studyId);
  if (!study || study.status !== 'running') return;
  const rows = await ctx.db.pool.query<{ result: StudyChunkResult }>('SELECT result FROM study_chunks WHERE study_id = $1 ORDER BY chunk_index', [studyId]);
  let result: StudyResult;
  try {
    result = (await ctx.pool.run(
      'study-combine',
      { studyId, spec: study.spec, chunks: rows.rows.map((r) => r.result) },
      { timeLimitMs: Math.max(ctx.options.chunkTimeLimitMs, 300_000) },
    )) as StudyResult;
  } catch (err) {
    if (isEngineError(err)) return failStudy(ctx, studyId, study.total_chunks, err);
    throw err;
  }
  await ctx.db.pool.query(`UPDATE studies SET status = 'completed', result = $2, finished_at = now() WHERE id = $1 AND status = 'running'`, [studyId, result]);
};
