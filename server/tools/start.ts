/**
 * `npm start`: a local PostgreSQL cluster under .data/ (created on first run,
 * kept between runs), migrations, the demo seed, a production build of the
 * app, app + API on one origin, and queue worker processes
 * (ROLLWISE_WORKERS, default 1; server/worker.ts). Ctrl-C stops the workers
 * (each finishes its running job), the server and the database.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync, existsSync, readFileSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { join, resolve } from 'node:path';
import { startCluster, postgresCanUse } from './pg.js';
import { run, bin } from './run.js';

const root = resolve(import.meta.dirname, '..', '..');
const port = Number(process.env['PORT'] ?? 4200);
const pgPort = Number(process.env['ROLLWISE_PG_PORT'] ?? 54329);

function dataRoot(): string {
  const inRepo = join(root, '.data');
  mkdirSync(inRepo, { recursive: true });
  if (postgresCanUse(inRepo)) return inRepo;
  // The postgres OS user cannot enter the checkout (e.g. a clone under a 700
  // home folder): keep the cluster in a fixed folder it can use instead.
  const alt = join('/var/lib/rollwise', createHash('sha256').update(root).digest('hex').slice(0, 12));
  mkdirSync(alt, { recursive: true });
  console.log(`[rollwise] PostgreSQL cannot use ${inRepo}; keeping its data in ${alt}`);
  return alt;
}

async function main(): Promise<void> {
  const data = dataRoot();
  console.log(`[rollwise] starting PostgreSQL on 127.0.0.1:${pgPort}…`);
  const cluster = await startCluster({ dataDir: join(data, 'pg'), port: pgPort, database: 'rollwise' });
  const stopDb = () => cluster.stop();

  console.log('[rollwise] building the app…');
  const build = await run(bin('ng'), ['build', '--configuration', 'production'], { ...process.env, NG_CLI_ANALYTICS: 'false' });
  if (build.code !== 0) {
    stopDb();
    throw new Error('the app did not build (see above)');
  }

  const secretFile = join(data, 'session-secret');
  if (!existsSync(secretFile)) writeFileSync(secretFile, createHash('sha256').update(`${Math.random()}${Date.now()}`).digest('hex'), { mode: 0o600 });

  process.env['DATABASE_URL'] = cluster.url;
  process.env['PORT'] = String(port);
  process.env['SESSION_SECRET'] ??= readFileSync(secretFile, 'utf8').trim();
  process.env['ROLLWISE_STATIC_DIR'] ??= join(root, 'dist', 'rollwise', 'browser');
  // Development mail: a local fake SMTP server on loopback stores every message;
  // team owners read them in the app. Set SMTP_URL to use a real server instead.
  if (!process.env['SMTP_URL']) process.env['ROLLWISE_FAKE_SMTP'] ??= 'true';
  const { startServer } = await import('../main.js');
  let server: Awaited<ReturnType<typeof startServer>>;
  try {
    server = await startServer();
  } catch (err) {
    stopDb();
    throw err;
  }
  const workers = startWorkers(Number(process.env['ROLLWISE_WORKERS'] ?? 1));
  console.log(`
Rollwise is running at ${server.url}${server.smtpUrl ? `\nDevelopment mail goes to the local fake SMTP server at ${server.smtpUrl}` : ''}

Demo sign-ins (password for all: demo-pass-2026):
  owner@tallowmere.example        owner     Tallowmere University Racing
  engineer@tallowmere.example     engineer  Tallowmere + Brackenfield
  designer@tallowmere.example     designer  Tallowmere University Racing
  reviewer@tallowmere.example     reviewer  Tallowmere University Racing
  viewer@tallowmere.example       viewer    Tallowmere University Racing
  owner@brackenfield.example      owner, engineer, designer  Brackenfield Road Programme
  reviewer@brackenfield.example   reviewer  Brackenfield Road Programme
  instructor@programme.example    instructor (programmes; no team role)

Press Ctrl-C to stop (the data is kept for the next npm start).`);

  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    console.log('\n[rollwise] stopping…');
    await Promise.all([stopWorkers(workers), server.close().catch(() => undefined)]);
    stopDb();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

/** Queue workers as child processes with the server's environment; one that dies is restarted. */
function startWorkers(n: number): { children: ChildProcess[]; stopping: boolean } {
  const state = { children: [] as ChildProcess[], stopping: false };
  const launch = (slot: number) => {
    const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'server', 'worker.ts')], { env: process.env, stdio: 'inherit' });
    state.children[slot] = child;
    child.on('exit', (code, signal) => {
      if (state.stopping) return;
      console.log(`[rollwise] queue worker ${slot + 1} stopped (${signal ?? `exit ${code}`}); starting it again`);
      setTimeout(() => launch(slot), 1000);
    });
  };
  for (let i = 0; i < n; i++) launch(i);
  console.log(`[rollwise] started ${n} queue worker process(es)`);
  return state;
}

/** SIGTERM: each worker finishes its running job (up to 30 s) and exits; a worker still there after 35 s is killed. */
async function stopWorkers(state: { children: ChildProcess[]; stopping: boolean }): Promise<void> {
  state.stopping = true;
  await Promise.all(
    state.children.map(
      (c) =>
        new Promise<void>((resolve) => {
          if (c.exitCode !== null || c.signalCode !== null) return resolve();
          const kill = setTimeout(() => c.kill('SIGKILL'), 35_000);
          c.once('exit', () => {
            clearTimeout(kill);
            resolve();
          });
          c.kill('SIGTERM');
        }),
    ),
  );
}

main().catch((err: unknown) => {
  console.error(`[rollwise] could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
