/**
 * `npm run worker`: one queue worker process. Run any number of them, on
 * any machines that reach the same DATABASE_URL; each takes solve jobs and
 * study chunks off the PostgreSQL job queue (server/compute/runner.ts).
 * Applies pending migrations first (under the same lock as the server), so
 * a worker may start before the server. SIGINT/SIGTERM: stops taking jobs,
 * finishes the running ones (up to 30 s) and exits; a worker killed outright
 * loses nothing, its job goes to another worker after the job's expiry.
 */
import { readdirSync } from 'node:fs';
import { getPriority, setPriority } from 'node:os';
import { pathToFileURL } from 'node:url';
import { loadConfig, type Config } from './config.js';
import { createDatabase } from './db/client.js';
import { migrateDatabase } from './db/migrate.js';
import { createLogger } from './http/logging.js';
import { QueueRunner } from './compute/runner.js';
import { queueHandlers } from './compute/handlers.js';

export interface RunningWorker {
  runner: QueueRunner;
  close(): Promise<void>;
}

export async function startWorker(overrides: Partial<Config> = {}): Promise<RunningWorker> {
  const config: Config = { ...loadConfig(process.env), ...overrides };
  const logger = createLogger(config.logLevel).child({ role: 'worker' });
  const db = createDatabase(config.databaseUrl, {
    connectTimeoutMs: config.dbConnectTimeoutMs,
    max: config.workerSolveSlots + config.workerStudySlots + 3,
    onPoolError: (err) => logger.warn({ err }, 'database connection lost'),
  });
  try {
    await migrateDatabase(db);
  } catch (err) {
    await db.close();
    throw err;
  }
  const runner = new QueueRunner(db, workerOptions(config, logger), queueHandlers);
  await runner.start();
  logger.info({ worker: runner.workerName, solveSlots: config.workerSolveSlots, studySlots: config.workerStudySlots }, 'queue worker started');
  return {
    runner,
    async close() {
      await runner.stop();
      await db.close();
    },
  };
}

export function workerOptions(config: Config, logger?: ReturnType<typeof createLogger>) {
  return {
    databaseUrl: config.databaseUrl,
    solveSlots: config.workerSolveSlots,
    studySlots: config.workerStudySlots,
    warm: config.workerWarmStart,
    niceThreads: config.computeNice,
    pollMs: config.queuePollMs,
    maintenanceIntervalSeconds: config.queueMaintenanceSeconds,
    chunkTimeLimitMs: config.studyChunkTimeLimitMs,
    reconcileSeconds: config.studyReconcileSeconds,
    chunkExpireSeconds: config.studyChunkExpireSeconds,
    stallSeconds: config.studyStallSeconds,
    ...(logger ? { logger } : {}),
  };
}

/**
 * Lowers this process's CPU priority by `increment` (nice, capped at 19). On Linux a nice value belongs to a
 * thread, so every thread that exists now is reniced (the main thread and V8's and libuv's helpers); threads
 * started later (the compute pools', which add their own increment) inherit it. Returns the main thread's nice.
 */
function lowerPriority(increment: number): number {
  if (increment <= 0) return getPriority();
  let tids: number[];
  try {
    tids = readdirSync('/proc/self/task').map(Number);
  } catch {
    tids = [0]; // No /proc: the calling thread (the process, elsewhere).
  }
  for (const tid of tids) {
    try {
      setPriority(tid, Math.min(19, getPriority(tid) + increment));
    } catch {
      // A helper thread that ended meanwhile.
    }
  }
  return getPriority();
}

const runDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (runDirectly) {
  let nice = 0;
  Promise.resolve()
    .then(() => {
      const config = loadConfig(process.env);
      // Before any pool starts: the API on the same cores answers first (docs/operations.md, "CPU priority").
      nice = lowerPriority(config.workerNice);
      return startWorker(config);
    })
    .then(
      (w) => {
        console.log(`Rollwise queue worker ${w.runner.workerName} is running (nice ${nice})`);
        let stopping = false;
        const stop = () => {
          if (stopping) return;
          stopping = true;
          w.close().then(
            () => process.exit(0),
            () => process.exit(1),
          );
        };
        process.once('SIGINT', stop);
        process.once('SIGTERM', stop);
      },
      (err: unknown) => {
        console.error('The Rollwise queue worker could not start:', err instanceof Error ? err.message : err);
        process.exit(1);
      },
    );
}
