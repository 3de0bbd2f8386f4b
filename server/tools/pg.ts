/**
 * Local PostgreSQL 15 clusters for development and tests.
 *
 * initdb and postgres refuse to run as root, so when we are root every
 * server binary runs as the `postgres` OS user (runuser). The cluster listens
 * on 127.0.0.1 only, on a non-default port, with its socket in its own folder.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, chmodSync, rmSync, mkdtempSync } from 'node:fs';
import { join } from 'node:path';
import { tmpdir } from 'node:os';
import net from 'node:net';

const PG_BIN = process.env['ROLLWISE_PG_BIN'] ?? '/usr/lib/postgresql/15/bin';
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

export interface Cluster {
  dataDir: string;
  socketDir: string;
  port: number;
  url: string;
  stop(): void;
}

function asPostgres(cmd: string, args: string[], opts: { quiet?: boolean } = {}): string {
  const file = isRoot ? 'runuser' : cmd;
  const argv = isRoot ? ['-u', 'postgres', '--', cmd, ...args] : args;
  const r = spawnSync(file, argv, { encoding: 'utf8' });
  if (r.status !== 0) {
    throw new Error(`${cmd} ${args.join(' ')} failed (${r.status}): ${r.stderr || r.stdout}`);
  }
  if (!opts.quiet && r.stderr && process.env['ROLLWISE_PG_VERBOSE']) process.stderr.write(r.stderr);
  return r.stdout;
}

/** True when the postgres OS user can enter `dir` (every parent needs o+x). */
export function postgresCanUse(dir: string): boolean {
  if (!isRoot) return true;
  return spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', dir]).status === 0;
}

export function ensurePostgresInstalled(): void {
  if (existsSync(join(PG_BIN, 'postgres'))) return;
  console.log('[rollwise] PostgreSQL 15 is missing: installing the Debian package…');
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit' });
  execFileSync('apt-get', ['install', '-y', '-qq', 'postgresql'], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

async function waitReady(socketDir: string, port: number): Promise<void> {
  for (let i = 0; i < 100; i++) {
    const r = spawnSync(join(PG_BIN, 'pg_isready'), ['-h', '127.0.0.1', '-p', String(port)], { encoding: 'utf8' });
    if (r.status === 0) return;
    await new Promise((res) => setTimeout(res, 100));
  }
  throw new Error(`PostgreSQL did not become ready on port ${port} (socket ${socketDir})`);
}

export interface StartOptions {
  dataDir: string;
  port: number;
  database: string;
  /** Throwaway clusters trade durability for speed. */
  fast?: boolean;
}

/** Creates the cluster on first use, starts it, and makes sure the database exists. */
export async function startCluster(o: StartOptions): Promise<Cluster> {
  ensurePostgresInstalled();
  const socketDir = join(o.dataDir, '..', 'pg-socket');
  mkdirSync(o.dataDir, { recursive: true });
  mkdirSync(socketDir, { recursive: true });
  if (isRoot) {
    execFileSync('chown', ['-R', 'postgres:postgres', o.dataDir, socketDir]);
  }
  chmodSync(o.dataDir, 0o700);
  if (!existsSync(join(o.dataDir, 'PG_VERSION'))) {
    asPostgres(join(PG_BIN, 'initdb'), ['-D', o.dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8'], { quiet: true });
  }
  const opts = [
    `-c listen_addresses=127.0.0.1`,
    `-c port=${o.port}`,
    `-c unix_socket_directories=${socketDir}`,
    ...(o.fast ? ['-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off'] : []),
  ].join(' ');
  const running = spawnSync(isRoot ? 'runuser' : join(PG_BIN, 'pg_ctl'),
    isRoot ? ['-u', 'postgres', '--', join(PG_BIN, 'pg_ctl'), '-D', o.dataDir, 'status'] : ['-D', o.dataDir, 'status']).status === 0;
  if (!running) {
    asPostgres(join(PG_BIN, 'pg_ctl'), ['-D', o.dataDir, '-l', join(o.dataDir, 'server.log'), '-o', opts, '-w', 'start'], { quiet: true });
  }
  await waitReady(socketDir, o.port);
  const exists = asPostgres(join(PG_BIN, 'psql'), ['-h', '127.0.0.1', '-p', String(o.port), '-U', 'postgres', '-tAc', `SELECT 1 FROM pg_database WHERE datname='${o.database}'`], { quiet: true }).trim();
  if (exists !== '1') {
    asPostgres(join(PG_BIN, 'createdb'), ['-h', '127.0.0.1', '-p', String(o.port), '-U', 'postgres', o.database], { quiet: true });
  }
  const dataDir = o.dataDir;
  return {
    dataDir,
    socketDir,
    port: o.port,
    url: `postgres://postgres@127.0.0.1:${o.port}/${o.database}`,
    stop() {
      try {
        asPostgres(join(PG_BIN, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', '-w', 'stop'], { quiet: true });
      } catch {
        /* already stopped */
      }
    },
  };
}

/** A fresh throwaway cluster under the system temp folder (readable by postgres). */
export async function startThrowawayCluster(database = 'rollwise_test'): Promise<Cluster & { remove(): void }> {
  const root = mkdtempSync(join(tmpdir(), 'rollwise-pg-'));
  chmodSync(root, 0o755);
  const port = await freePort();
  const c = await startCluster({ dataDir: join(root, 'data'), port, database, fast: true });
  return {
    ...c,
    remove() {
      c.stop();
      rmSync(root, { recursive: true, force: true });
    },
  };
}

/**
 * Creates another database in a running cluster (one per test file keeps files independent),
 * empty or as a copy of `template` (which must have no open connections).
 */
export function createDatabase(port: number, name: string, template?: string): string {
  asPostgres(join(PG_BIN, 'createdb'), ['-h', '127.0.0.1', '-p', String(port), '-U', 'postgres', ...(template ? ['-T', template] : []), name], { quiet: true });
  return `postgres://postgres@127.0.0.1:${port}/${name}`;
}

/** Drops a database of a running cluster, ending its connections first. */
export function dropDatabase(port: number, name: string): void {
  asPostgres(join(PG_BIN, 'dropdb'), ['-h', '127.0.0.1', '-p', String(port), '-U', 'postgres', '--if-exists', '--force', name], { quiet: true });
}
