/**
 * `npm start`: a local PostgreSQL cluster under .data/ (created on first run,
 * kept between runs), migrations, the demo seed, a production build of the
 * app, and app + API on one origin. Ctrl-C stops the server and the database.
 */
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
    await server.close().catch(() => undefined);
    stopDb();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err: unknown) => {
  console.error(`[rollwise] could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
