/**
 * The job queue: pg-boss 10 on the application's own PostgreSQL, in its own
 * schema (`pgboss`). The server puts work on it; worker processes
 * (server/worker.ts, any number of machines with the same DATABASE_URL) take
 * it off. pg-boss runs on our pg pool (its `db` option), so it adds no
 * connections of its own; its tables come from its own migrations, applied
 * by server/db/migrate.ts beside ours.
 *
 * Queues:
 * - `solve`: background solve jobs (one per user request; small, urgent).
 * - `study-chunk`: one job per chunk of a study; priority −chunkIndex, so
 *   every running study advances a chunk at a time in turn (round-robin).
 * - `study-combine`: sent once, in the transaction that lands a study's
 *   last chunk; combines the chunks into the stored result.
 * - `lost-jobs`: pg-boss's dead-letter queue for the three above: a job
 *   whose workers died (or failed) more often than its retry limit lands
 *   here, and a worker marks the solve job or study lost (410 job_gone).
 * Workers are woken at once by NOTIFY on `rollwise_queue` (payload `wake`);
 * `cancel:<id>` stops a running solve job or study chunk on whichever worker
 * has it. Without notifications they still poll (ROLLWISE_QUEUE_POLL_MS).
 */
import PgBoss from 'pg-boss';
import type pg from 'pg';

export const QUEUE_SCHEMA = 'pgboss';
export const NOTIFY_CHANNEL = 'rollwise_queue';

export const QUEUES = {
  solve: 'solve',
  studyChunk: 'study-chunk',
  studyCombine: 'study-combine',
  lost: 'lost-jobs',
} as const;

/** What a queue job carries (the dead-letter job carries the same data). */
export type QueueJobData =
  | { kind: 'solve'; jobId: string; input: unknown; timeLimitMs: number }
  | { kind: 'study-chunk'; studyId: string; teamId: string; chunkIndex: number }
  | { kind: 'study-combine'; studyId: string };

/** Anything with `query` (a pool or a checked-out client in a transaction). */
export interface Queryable {
  query(text: string, values?: unknown[]): Promise<{ rows: unknown[] }>;
}

/** pg-boss's database adapter over a pool or client of ours. */
export function bossDb(q: Queryable): PgBoss.Db {
  return { executeSql: (text, values) => q.query(text, values) };
}

/**
 * Runs `fn` in a transaction on a client of its own, so that our rows and the
 * queue's jobs (pg-boss given `bossDb(client)`) land together or not at all.
 * `fn` returning `rollback` undoes everything without an error.
 */
export async function inTransaction<T>(pool: pg.Pool, fn: (client: pg.PoolClient) => Promise<T | typeof rollback>): Promise<T | undefined> {
  const client = await pool.connect();
  try {
    await client.query('BEGIN');
    try {
      const out = await fn(client);
      if (out === rollback) {
        await client.query('ROLLBACK');
        return undefined;
      }
      await client.query('COMMIT');
      return out;
    } catch (err) {
      await client.query('ROLLBACK').catch(() => undefined);
      throw err;
    }
  } finally {
    client.release();
  }
}
export const rollback: unique symbol = Symbol('rollback');

export interface QueueOptions {
  /** Run pg-boss maintenance here (expires jobs of dead workers, archives, drops). One process per interval does it. */
  supervise?: boolean;
  maintenanceIntervalSeconds?: number;
}

/** One pg-boss client on a pool. `ready()` starts it once (and again after a failed start). */
export class JobQueue {
  readonly boss: PgBoss;
  private starting: Promise<PgBoss> | undefined;

  constructor(
    private readonly pool: pg.Pool,
    o: QueueOptions = {},
  ) {
    this.boss = new PgBoss({
      db: bossDb(pool),
      schema: QUEUE_SCHEMA,
      migrate: false,
      schedule: false,
      supervise: o.supervise ?? false,
      maintenanceIntervalSeconds: o.maintenanceIntervalSeconds ?? 30,
    });
    // Errors of the maintenance loop (e.g. the database restarting) are retried by pg-boss itself.
    this.boss.on('error', () => undefined);
  }

  ready(): Promise<PgBoss> {
    this.starting ??= this.boss.start().catch((err: unknown) => {
      this.starting = undefined;
      throw err;
    });
    return this.starting;
  }

  /** Wakes idle workers now instead of at their next poll. */
  async notify(payload: string, q: Queryable = this.pool): Promise<void> {
    await q.query('SELECT pg_notify($1, $2)', [NOTIFY_CHANNEL, payload]);
  }

  async stop(): Promise<void> {
    if (!this.starting) return;
    const s = this.starting;
    this.starting = undefined;
    await s.then(
      (b) => b.stop({ graceful: false, close: false }),
      () => undefined,
    );
  }
}

/**
 * pg-boss's own migrations (creating or upgrading the `pgboss` schema) and
 * our queues. Idempotent; runs under the caller's migration lock.
 */
export async function installQueue(q: Queryable): Promise<void> {
  const boss = new PgBoss({ db: bossDb(q), schema: QUEUE_SCHEMA, migrate: true, schedule: false, supervise: false });
  boss.on('error', () => undefined);
  await boss.start();
  try {
    await boss.createQueue(QUEUES.lost, { name: QUEUES.lost, policy: 'standard', retryLimit: 3, retryDelay: 1, retryBackoff: true, retentionMinutes: 60 * 24 * 7 });
    for (const name of [QUEUES.solve, QUEUES.studyChunk, QUEUES.studyCombine]) {
      await boss.createQueue(name, { name, policy: 'standard', deadLetter: QUEUES.lost });
    }
  } finally {
    await boss.stop({ graceful: false, close: false });
  }
}
