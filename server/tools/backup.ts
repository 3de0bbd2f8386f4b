/**
 * Backups of the Rollwise database with PostgreSQL's own tools (docs/backups.md).
 *
 *   node --import tsx server/tools/backup.ts dump FILE [--database-url=URL]
 *   node --import tsx server/tools/backup.ts restore FILE [--database-url=URL] [--clean]
 *
 * The database URL defaults to DATABASE_URL (as the server reads it). A dump
 * is pg_dump's custom format (-Fc: compressed, restorable table by table),
 * written to FILE.partial and renamed only when pg_dump succeeded and
 * pg_restore can list it, so a failed dump never leaves a file that looks
 * good. A restore goes in one transaction and stops at the first error; it
 * refuses a database that already holds tables unless --clean is given.
 * When run as root the PostgreSQL tools run as the `postgres` OS user (as in
 * server/tools/pg.ts); the files are streamed through this process, so that
 * user needs no access to them, and they start in `/`, a folder that user
 * can always enter. A password in the URL is passed in
 * PGPASSWORD, not on a command line other users could read.
 */
import { spawn } from 'node:child_process';
import { createReadStream, createWriteStream, existsSync, renameSync, rmSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import pg from 'pg';
import { QUEUE_SCHEMA } from '../compute/queue.js';
import { loadConfig } from '../config.js';

const PG_BIN = process.env['ROLLWISE_PG_BIN'] ?? '/usr/lib/postgresql/15/bin';
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

export class BackupError extends Error {}

/** The URL without its password, and the password for PGPASSWORD. */
function splitPassword(databaseUrl: string): { url: string; password: string | undefined } {
  let u: URL;
  try {
    u = new URL(databaseUrl);
  } catch {
    throw new BackupError(`the database URL is not a URL: "${databaseUrl.replace(/:[^:@/]*@/, ':***@')}"`);
  }
  const password = u.password ? decodeURIComponent(u.password) : undefined;
  u.password = '';
  return { url: u.toString(), password };
}

interface ToolRun {
  stdin?: NodeJS.ReadableStream;
  stdout?: NodeJS.WritableStream;
}

/** Runs a PostgreSQL client tool (as the postgres OS user when we are root); rejects with its stderr on failure. */
function runTool(tool: string, args: string[], databaseUrl: string, io: ToolRun = {}): Promise<string> {
  const { password } = splitPassword(databaseUrl);
  const bin = join(PG_BIN, tool);
  if (!existsSync(bin)) throw new BackupError(`${bin} is missing: install Debian's postgresql-client-15 (or set ROLLWISE_PG_BIN)`);
  const file = isRoot ? 'runuser' : bin;
  const argv = isRoot ? ['-u', 'postgres', '--', bin, ...args] : args;
  const env = { ...process.env, ...(password !== undefined ? { PGPASSWORD: password } : {}) };
  return new Promise((resolve, reject) => {
    // The tools start in `/`: as the postgres user they cannot enter our working directory when it
    // is private (a clone inside a mode-700 folder), and would print a warning before their real message.
    // Every path they get is absolute or streamed through this process.
    const child = spawn(file, argv, { cwd: '/', env, stdio: [io.stdin ? 'pipe' : 'ignore', 'pipe', 'pipe'] });
    let stderr = '';
    let stdout = '';
    child.stderr!.on('data', (d: Buffer) => (stderr += d.toString()));
    if (io.stdout) child.stdout!.pipe(io.stdout);
    else child.stdout!.on('data', (d: Buffer) => (stdout += d.toString()));
    if (io.stdin && child.stdin) {
      io.stdin.on('error', (e) => child.kill() && reject(new BackupError(`cannot read the input: ${e.message}`)));
      // A tool may stop reading before the end (pg_restore --list reads only the dump's table of contents):
      // writing the rest then fails with EPIPE, which says nothing about the tool's work (its exit code does).
      // Unhandled, that error ended the process.
      child.stdin.on('error', (e: NodeJS.ErrnoException) => {
        if (e.code !== 'EPIPE') reject(new BackupError(`cannot write to ${tool}: ${e.message}`));
      });
      io.stdin.pipe(child.stdin);
    }
    child.on('error', (e) => reject(new BackupError(`${tool} could not start: ${e.message}`)));
    child.on('close', (code) => {
      if (code === 0) resolve(stdout);
      else reject(new BackupError(`${tool} failed (exit ${code}): ${stderr.trim() || 'no message'}`));
    });
  });
}

/** Writes a custom-format dump of the database to `file`; returns the number of table-data entries it holds. */
export async function dumpDatabase(databaseUrl: string, file: string): Promise<{ bytes: number; tables: number }> {
  const { url } = splitPassword(databaseUrl);
  const partial = `${file}.partial`;
  const out = createWriteStream(partial, { mode: 0o600 });
  const closed = new Promise<void>((resolve, reject) => {
    out.on('close', resolve);
    out.on('error', reject);
  });
  try {
    // --no-owner / --no-privileges: the dump restores under whatever role runs the restore.
    await runTool('pg_dump', ['--format=custom', '--no-owner', '--no-privileges', `--dbname=${url}`], databaseUrl, { stdout: out });
    await closed;
    const tables = await listTableData(databaseUrl, partial);
    renameSync(partial, file);
    return { bytes: statSync(file).size, tables };
  } catch (e) {
    out.destroy();
    rmSync(partial, { force: true });
    throw e;
  }
}

/** Table-data entries in a dump (pg_restore --list), which also proves the file is a readable dump. */
async function listTableData(databaseUrl: string, file: string): Promise<number> {
  const list = await runTool('pg_restore', ['--list'], databaseUrl, { stdin: createReadStream(file) });
  return list.split('\n').filter((l) => / TABLE DATA /.test(l)).length;
}

async function userTableCount(databaseUrl: string): Promise<number> {
  const client = new pg.Client({ connectionString: databaseUrl, connectionTimeoutMillis: 5000 });
  await client.connect();
  try {
    const r = await client.query<{ n: string }>(
      "SELECT count(*) AS n FROM pg_tables WHERE schemaname NOT IN ('pg_catalog', 'information_schema')",
    );
    return Number(r.rows[0]?.n ?? 0);
  } finally {
    await client.end();
  }
}

async function dropQueueSchema(databaseUrl: string): Promise<void> {
  const client = new pg.Client({ connectionString: databaseUrl, connectionTimeoutMillis: 5000 });
  await client.connect();
  try {
    await client.query(`DROP SCHEMA IF EXISTS ${QUEUE_SCHEMA} CASCADE`);
  } finally {
    await client.end();
  }
}

/** Restores a dump into `databaseUrl` in one transaction. The database must exist; with `clean` its objects are dropped first. */
export async function restoreDatabase(databaseUrl: string, file: string, o: { clean?: boolean } = {}): Promise<{ tables: number }> {
  if (!existsSync(file)) throw new BackupError(`no such file: ${file}`);
  const tables = await listTableData(databaseUrl, file);
  if (!o.clean) {
    const existing = await userTableCount(databaseUrl);
    if (existing > 0) {
      throw new BackupError(`the target database already holds ${existing} tables; restore into an empty database, or pass --clean to replace its contents`);
    }
  }
  // pg_restore --clean cannot drop the job queue's partitioned tables piece by piece (a partition's
  // inherited key cannot be dropped before its parent's); the queue schema goes whole first. It is
  // in the dump, and a server or worker re-creates it at start should the restore then fail.
  if (o.clean) await dropQueueSchema(databaseUrl);
  const { url } = splitPassword(databaseUrl);
  const args = ['--no-owner', '--no-privileges', '--exit-on-error', '--single-transaction', `--dbname=${url}`];
  if (o.clean) args.push('--clean', '--if-exists');
  await runTool('pg_restore', args, databaseUrl, { stdin: createReadStream(file) });
  return { tables };
}

const USAGE = `usage:
  node --import tsx server/tools/backup.ts dump FILE [--database-url=URL]
  node --import tsx server/tools/backup.ts restore FILE [--database-url=URL] [--clean]
The database URL defaults to DATABASE_URL.`;

export async function main(argv: string[]): Promise<number> {
  const [command, file, ...rest] = argv;
  let databaseUrl: string | undefined;
  let clean = false;
  for (const a of rest) {
    if (a.startsWith('--database-url=')) databaseUrl = a.slice('--database-url='.length);
    else if (a === '--clean' && command === 'restore') clean = true;
    else {
      process.stderr.write(`backup: unexpected argument "${a}"\n${USAGE}\n`);
      return 2;
    }
  }
  if ((command !== 'dump' && command !== 'restore') || !file) {
    process.stderr.write(`${USAGE}\n`);
    return 2;
  }
  databaseUrl ??= loadConfig(process.env).databaseUrl;
  const shown = databaseUrl.replace(/:[^:@/]*@/, ':***@');
  try {
    if (command === 'dump') {
      const r = await dumpDatabase(databaseUrl, file);
      console.log(`backup: dumped ${shown} to ${file} (${(r.bytes / 1024).toFixed(0)} kB, ${r.tables} tables with data)`);
    } else {
      const r = await restoreDatabase(databaseUrl, file, { clean });
      console.log(`backup: restored ${file} into ${shown} (${r.tables} tables with data)`);
    }
    return 0;
  } catch (e) {
    process.stderr.write(`backup: ${e instanceof Error ? e.message : String(e)}\n`);
    return 1;
  }
}

const runDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (runDirectly) {
  main(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
