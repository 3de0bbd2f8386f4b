/**
 * Reconciliation of running studies with the queue. A study advances only
 * while its chunk jobs are on the queue; a job that leaves it undone without
 * going to the dead-letter queue (deleted or archived by hand, cancelled or
 * completed from outside Rollwise, a queue restored from an older backup)
 * would leave the study `running` for ever. Every `studyReconcileSeconds`
 * one worker (a transaction-scoped advisory lock; the others skip that turn)
 * looks at every queued or running study, in one snapshot:
 *  - a chunk not landed and without a job row: its job is put back (same
 *    fixed id and options as at the start, so cancel still finds it);
 *  - every chunk landed but no combine job waiting or running: the combine
 *    job is sent again (the combine handler does nothing for a study that is
 *    no longer running, so a duplicate is harmless);
 *  - a chunk not landed whose job ended (completed, cancelled or failed)
 *    while the study made no progress for `studyStallSeconds`: the study
 *    fails with `job_gone` and the reason (the API answers 410), and its
 *    other chunks are cancelled. (A failed job normally reaches the
 *    dead-letter queue first, which fails the study at once.)
 * Idempotent: running it twice, or on several workers, changes nothing more.
 */
import { chunkJobId, chunkJobs, cancelStudyChunks } from '../services/studies.js';
import { QUEUES, bossDb, inTransaction, type QueueJobData } from './queue.js';
import type { RunnerContext } from './runner.js';

/** Any 64-bit key of our own: the advisory lock that makes one worker per pass do the work. */
const RECONCILE_LOCK = 0x726f_6c6c_7374_7564n; // "rollstud"

export interface ReconcileOutcome {
  requeuedChunks: number;
  resentCombines: number;
  failedStudies: number;
  /** False when another worker held the lock (this pass did nothing). */
  ran: boolean;
}

interface Row {
  id: string;
  team_id: string;
  status: string;
  total_chunks: number;
  landed: number[];
  jobs: { id: string; state: string }[];
  combining: boolean;
  idle_s: number;
}

export async function reconcileStudies(ctx: RunnerContext, o: { chunkExpireSeconds: number; stallSeconds: number }): Promise<ReconcileOutcome> {
  const out: ReconcileOutcome = { requeuedChunks: 0, resentCombines: 0, failedStudies: 0, ran: false };
  const toFail: { id: string; total: number; chunks: number[] }[] = [];
  await inTransaction(ctx.db.pool, async (client) => {
    const lock = await client.query<{ ok: boolean }>('SELECT pg_try_advisory_xact_lock($1) AS ok', [RECONCILE_LOCK.toString()]);
    if (!lock.rows[0]?.ok) return;
    out.ran = true;
    // One statement: one snapshot of the studies, their landed chunks and their queue jobs
    // (a chunk lands before its job completes, so a completed job here has its chunk landed here).
    const { rows } = await client.query<Row>(
      `SELECT s.id, s.team_id, s.status, s.total_chunks,
              ARRAY(SELECT c.chunk_index FROM study_chunks c WHERE c.study_id = s.id) AS landed,
              coalesce((SELECT json_agg(json_build_object('id', j.id, 'state', j.state))
                          FROM pgboss.job j WHERE j.name = $1 AND j.data->>'studyId' = s.id::text), '[]') AS jobs,
              EXISTS (SELECT 1 FROM pgboss.job j WHERE j.name = $2 AND j.data->>'studyId' = s.id::text AND j.state < 'completed') AS combining,
              extract(epoch FROM now() - greatest(s.created_at, s.started_at,
                (SELECT max(c.finished_at) FROM study_chunks c WHERE c.study_id = s.id)))::float AS idle_s
         FROM studies s WHERE s.status IN ('queued', 'running')`,
      [QUEUES.studyChunk, QUEUES.studyCombine],
    );
    const boss = ctx.boss;
    for (const s of rows) {
      const landed = new Set(s.landed);
      const state = new Map(s.jobs.map((j) => [j.id, j.state]));
      const gone: number[] = [];
      const ended: number[] = [];
      for (let i = 0; i < s.total_chunks; i++) {
        if (landed.has(i)) continue;
        const st = state.get(chunkJobId(s.id, i));
        if (st === undefined) gone.push(i);
        else if (st === 'completed' || st === 'cancelled' || st === 'failed') ended.push(i);
      }
      if (gone.length) {
        const jobs = chunkJobs(s.id, s.team_id, gone, o.chunkExpireSeconds);
        for (let k = 0; k < jobs.length; k += 1000) await boss.insert(jobs.slice(k, k + 1000), { db: bossDb(client) });
        out.requeuedChunks += gone.length;
      }
      if (landed.size === s.total_chunks && s.status === 'running' && !s.combining) {
        const combine: QueueJobData = { kind: 'study-combine', studyId: s.id };
        await boss.send(QUEUES.studyCombine, combine, { retryLimit: 4, retryDelay: 1, retryBackoff: true, expireInSeconds: 900, deadLetter: QUEUES.lost, db: bossDb(client) });
        out.resentCombines++;
      }
      if (ended.length && s.idle_s >= o.stallSeconds) {
        const list = ended.slice(0, 5).map((i) => i + 1).join(', ') + (ended.length > 5 ? ', …' : '');
        const failed = await client.query(
          `UPDATE studies SET status = 'failed', finished_at = now(), error = $2 WHERE id = $1 AND status IN ('queued', 'running')`,
          [
            s.id,
            {
              code: 'job_gone',
              message: `The study was lost: the queue job of chunk ${list} ended without its result (it was cancelled or removed outside Rollwise), and the study made no progress for ${Math.round(s.idle_s)} s. Start the study again.`,
            },
          ],
        );
        if (failed.rowCount) {
          out.failedStudies++;
          toFail.push({ id: s.id, total: s.total_chunks, chunks: ended });
        }
      }
    }
    if (out.requeuedChunks || out.resentCombines) await ctx.queue.notify('wake', client);
    return true;
  });
  for (const f of toFail) await cancelStudyChunks(ctx.queue, f.id, f.total);
  return out;
}
