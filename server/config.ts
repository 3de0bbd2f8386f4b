/**
 * Server configuration from environment variables, with safe development
 * defaults. Production refuses to start without a real session secret.
 * Every variable is documented in docs/operations.md.
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { resolve } from 'node:path';

export type LogLevel = 'fatal' | 'error' | 'warn' | 'info' | 'debug' | 'trace' | 'silent';

export interface Config {
  /** PostgreSQL connection string. */
  databaseUrl: string;
  /** Signs the session cookie. Required (≥ 32 chars) in production. */
  sessionSecret: string;
  /** The origin users reach the app at, e.g. https://rollwise.example (no trailing slash). */
  publicUrl: string;
  host: string;
  /** 0 = any free port. */
  port: number;
  production: boolean;
  /** Seed the invented demo scenario at start (never in production). */
  seedDemo: boolean;
  /** Built Angular app served with SPA fallback; absent folder = API only. */
  staticDir: string;
  logLevel: LogLevel;
  /** Outgoing mail server, e.g. smtp://127.0.0.1:2525; unset = mail waits in the outbox. */
  smtpUrl: string | undefined;
  /** Sender of every mail. */
  mailFrom: string;
  /** How often the mail worker looks for due mail, and its retry policy. */
  mailPollMs: number;
  mailMaxAttempts: number;
  mailBackoffMs: number;
  /** Start the local fake SMTP server in the server process and send to it (never in production). */
  fakeSmtp: boolean;
  /** Its port (0 = any free port). */
  fakeSmtpPort: number;
  /** Team invitation links expire after this long. */
  invitationTtlMs: number;
  /** Password reset links expire after this long. */
  passwordResetTtlMs: number;
  /** Sessions end after this long without a request (rolling). */
  sessionIdleMs: number;
  /** Sessions end this long after sign-in whatever the activity. */
  sessionAbsoluteMs: number;
  /** Sign-in attempts allowed per IP and e-mail address within the window. */
  signInLimit: { windowMs: number; max: number };
  /**
   * Per client address, whatever the account: failed sign-ins, registrations
   * and confirmation resends allowed within the window (bounds the bcrypt work
   * one address can cause and how fast it can probe which addresses exist).
   */
  addressLimit: { windowMs: number; max: number };
  /** Largest JSON body of the routes that take a whole document (express/body-parser size syntax); other routes take less (server/http/body.ts). */
  bodyLimit: string;
  /** Milliseconds to wait for a database connection before answering 503. */
  dbConnectTimeoutMs: number;
  /** On shutdown, how long requests in flight may take to finish before their connections are closed. */
  shutdownGraceMs: number;
  /** Compute worker pool: threads and per-task time limit. */
  computeThreads: number;
  computeTimeLimitMs: number;
  /** Start a compute worker at start-up rather than on the first request (off in tests). */
  computeWarmStart: boolean;
  /** Chromium that prints review records to PDF (Debian's package). */
  chromiumPath: string;
  /** Time limit of a background solve job (longer family sweeps). */
  solveJobTimeLimitMs: number;
  /** A finished solve job keeps its answer this long; then its id answers 410 job_gone (expired). */
  solveJobRetainMs: number;
  /** bcrypt cost factor for password hashes. */
  bcryptRounds: number;
  /** Job queue workers (server/worker.ts): concurrent solve jobs and study chunks per worker process. */
  workerSolveSlots: number;
  workerStudySlots: number;
  /** A worker process starts its threads and has each study thread solve a small built-in study before taking jobs. */
  workerWarmStart: boolean;
  /** A worker process (`npm run worker`) lowers its own CPU priority by this much (Linux nice, 0–19) at start, every thread. */
  workerNice: number;
  /**
   * Compute threads run below their process's priority (requests +2, solve jobs +5, study chunks +10, Linux nice):
   * on a machine the API shares with workers, answering comes first. Off in tests, where every process is the
   * test's own and a lowered thread only waits behind the browser and the build (the rule has its own test).
   */
  computeNice: boolean;
  /** Idle workers look for jobs this often (a NOTIFY wakes them sooner). */
  queuePollMs: number;
  /** pg-boss maintenance interval: how soon a dead worker's job is noticed after its expiry. */
  queueMaintenanceSeconds: number;
  /** A study chunk taken by a worker that then goes silent is handed to another after this long. */
  studyChunkExpireSeconds: number;
  /** Time limit of one study chunk on a worker thread. */
  studyChunkTimeLimitMs: number;
  /** Workers check running studies this often for chunk jobs that left the queue undone (server/compute/reconcile.ts). */
  studyReconcileSeconds: number;
  /** A study with a chunk whose job ended without landing fails (410 job_gone) after this long without progress. */
  studyStallSeconds: number;
  /** Studies a team may have queued or running at once (more: 429). */
  studyMaxActivePerTeam: number;
  /** Run a queue worker inside the server process (tests and single-process set-ups; `npm start` runs a worker process instead). */
  inProcessWorker: boolean;
}

export const DEV_SESSION_SECRET = 'rollwise-development-secret-not-for-production';

function int(env: NodeJS.ProcessEnv, name: string, fallback: number, min = 0): number {
  const raw = env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < min) throw new Error(`${name} must be an integer ≥ ${min} (got "${raw}")`);
  return n;
}

function flag(env: NodeJS.ProcessEnv, name: string, fallback: boolean): boolean {
  const raw = env[name];
  if (raw === undefined || raw === '') return fallback;
  if (/^(1|true|yes|on)$/i.test(raw)) return true;
  if (/^(0|false|no|off)$/i.test(raw)) return false;
  throw new Error(`${name} must be true or false (got "${raw}")`);
}

const LOG_LEVELS: LogLevel[] = ['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'];

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const production = env['NODE_ENV'] === 'production';
  const test = env['NODE_ENV'] === 'test' || env['VITEST'] !== undefined;
  const host = env['HOST'] || '127.0.0.1';
  const port = int(env, 'PORT', 4200);

  const sessionSecret = env['SESSION_SECRET'] || (production ? '' : DEV_SESSION_SECRET);
  if (production && sessionSecret.length < 32) {
    throw new Error('SESSION_SECRET must be set to a random string of at least 32 characters in production');
  }

  const publicUrl = (env['PUBLIC_URL'] || `http://${host === '0.0.0.0' ? '127.0.0.1' : host}:${port}`).replace(/\/+$/, '');
  try {
    new URL(publicUrl);
  } catch {
    throw new Error(`PUBLIC_URL must be an absolute URL (got "${publicUrl}")`);
  }

  const logLevel = (env['LOG_LEVEL'] || (test ? 'silent' : 'info')) as LogLevel;
  if (!LOG_LEVELS.includes(logLevel)) throw new Error(`LOG_LEVEL must be one of ${LOG_LEVELS.join(', ')}`);

  const seedDemo = production ? false : flag(env, 'ROLLWISE_SEED_DEMO', true);

  return {
    databaseUrl: env['DATABASE_URL'] || 'postgres://postgres@127.0.0.1:54329/rollwise',
    sessionSecret,
    publicUrl,
    host,
    port,
    production,
    seedDemo,
    staticDir: resolve(env['ROLLWISE_STATIC_DIR'] || 'dist/rollwise/browser'),
    logLevel,
    smtpUrl: env['SMTP_URL'] || undefined,
    mailFrom: env['MAIL_FROM'] || 'Rollwise <no-reply@rollwise.invalid>',
    mailPollMs: int(env, 'MAIL_POLL_MS', test ? 100 : 2000, 10),
    mailMaxAttempts: int(env, 'MAIL_MAX_ATTEMPTS', 10, 1),
    mailBackoffMs: int(env, 'MAIL_BACKOFF_MS', test ? 50 : 30_000, 1),
    fakeSmtp: production ? false : flag(env, 'ROLLWISE_FAKE_SMTP', false),
    fakeSmtpPort: int(env, 'ROLLWISE_FAKE_SMTP_PORT', 0),
    invitationTtlMs: int(env, 'INVITATION_TTL_HOURS', 24 * 7, 1) * 3_600_000,
    passwordResetTtlMs: int(env, 'PASSWORD_RESET_TTL_MINUTES', 60, 1) * 60_000,
    sessionIdleMs: int(env, 'SESSION_IDLE_MINUTES', 120, 1) * 60_000,
    sessionAbsoluteMs: int(env, 'SESSION_ABSOLUTE_HOURS', 24 * 7, 1) * 3_600_000,
    signInLimit: {
      windowMs: int(env, 'SIGN_IN_WINDOW_MINUTES', 15, 1) * 60_000,
      max: int(env, 'SIGN_IN_MAX_ATTEMPTS', 10, 1),
    },
    addressLimit: {
      windowMs: int(env, 'SIGN_IN_WINDOW_MINUTES', 15, 1) * 60_000,
      // Test suites register hundreds of throwaway accounts from 127.0.0.1.
      max: int(env, 'ADDRESS_MAX_ATTEMPTS', test ? 100_000 : 50, 1),
    },
    bodyLimit: env['BODY_LIMIT'] || '256kb',
    dbConnectTimeoutMs: int(env, 'DB_CONNECT_TIMEOUT_MS', 3000, 100),
    // One core stays with the event loop so reads keep their latency while solves run.
    computeThreads: int(env, 'COMPUTE_THREADS', Math.max(1, availableParallelism() - 1), 1),
    computeTimeLimitMs: int(env, 'COMPUTE_TIME_LIMIT_MS', 10_000, 50),
    // A compute request may run for its whole time limit: shutdown waits that long, and a little more for the answer.
    shutdownGraceMs: int(env, 'SHUTDOWN_GRACE_MS', int(env, 'COMPUTE_TIME_LIMIT_MS', 10_000, 50) + 5_000, 0),
    computeWarmStart: !test,
    chromiumPath: env['CHROMIUM_PATH'] || defaultChromiumPath(),
    solveJobTimeLimitMs: int(env, 'SOLVE_JOB_TIME_LIMIT_MS', 120_000, 50),
    solveJobRetainMs: int(env, 'SOLVE_JOB_RETAIN_MINUTES', 15, 0) * 60_000,
    // Tests hash many throwaway passwords; everything else uses a real cost.
    bcryptRounds: int(env, 'BCRYPT_ROUNDS', test ? 4 : 12, 4),
    workerSolveSlots: int(env, 'WORKER_SOLVE_SLOTS', 1, 0),
    workerStudySlots: int(env, 'WORKER_STUDY_SLOTS', 1, 0),
    // The warm-up is a throughput matter (the first chunk runs compiled code); tests start many workers.
    workerWarmStart: flag(env, 'WORKER_WARM_START', !test),
    // Where workers share cores with the API (one machine), requests run first and studies take the cycles left.
    // Tests: 0, as computeNice (a lowered worker waited minutes behind the browser tests and the build).
    workerNice: Math.min(19, int(env, 'WORKER_NICE', test ? 0 : 10, 0)),
    computeNice: flag(env, 'COMPUTE_NICE', !test),
    queuePollMs: int(env, 'QUEUE_POLL_MS', test ? 1000 : 2000, 50),
    queueMaintenanceSeconds: int(env, 'QUEUE_MAINTENANCE_SECONDS', test ? 1 : 30, 1),
    studyChunkExpireSeconds: int(env, 'STUDY_CHUNK_EXPIRE_SECONDS', 120, 1),
    studyChunkTimeLimitMs: int(env, 'STUDY_CHUNK_TIME_LIMIT_MS', 60_000, 50),
    studyReconcileSeconds: int(env, 'STUDY_RECONCILE_SECONDS', test ? 1 : 60, 1),
    studyStallSeconds: int(env, 'STUDY_STALL_SECONDS', 600, 1),
    studyMaxActivePerTeam: int(env, 'STUDY_MAX_ACTIVE_PER_TEAM', 3, 1),
    inProcessWorker: flag(env, 'ROLLWISE_IN_PROCESS_WORKER', test),
  };
}

const HEADLESS_CHROMIUM = '/usr/lib/chromium/chromium-headless-shell';

/**
 * Debian's Chromium for printing and the browser tests: its headless build
 * (package chromium-headless-shell) when installed, else the full browser.
 * The headless build renders with the same engine without the desktop
 * browser's machinery: in the browser tests it used about a quarter less CPU
 * (146 against 199 CPU-s for the whole e2e project on the 2-core machine).
 */
export function defaultChromiumPath(): string {
  return existsSync(HEADLESS_CHROMIUM) ? HEADLESS_CHROMIUM : '/usr/bin/chromium';
}
