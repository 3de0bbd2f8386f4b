/**
 * Backups (issue 8, "Nothing lost"): the seeded database, plus a session and
 * an edit, is dumped with server/tools/backup.ts (pg_dump -Fc), restored into
 * a database in a fresh PostgreSQL cluster, and every table compared row by
 * row (ordered) with the original. Also: a restore refuses a non-empty
 * database without --clean, and a failed dump leaves no file behind.
 */
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { startThrowawayCluster, createDatabase, type Cluster } from '../../server/tools/pg.js';
import { dumpDatabase, restoreDatabase } from '../../server/tools/backup.js';
import { signIn, startTestApp, type TestApp } from './helpers.js';

const ROOT = resolve('.');
const dir = mkdtempSync(join(tmpdir(), 'rollwise-backup-'));
let t: TestApp;
let cluster: (Cluster & { remove(): void }) | undefined;

beforeAll(async () => {
  // No queue worker in this app: its pg-boss maintenance would stamp pgboss.version between the dump and the comparison.
  t = await startTestApp({ seed: true, config: { inProcessWorker: false } });
  // A session row and an edited vehicle revision, on top of the seed.
  const engineer = await signIn(t.app, 'engineer@tallowmere.example');
  const teams = await engineer.get('/api/teams').expect(200);
  const team = (teams.body as { id: string; slug: string }[]).find((x) => x.slug === 'tallowmere')!;
  const vehicles = await engineer.get(`/api/teams/${team.id}/vehicles`).expect(200);
  const v = (vehicles.body as { id: string; revision: number }[])[0]!;
  await engineer.patch(`/api/teams/${team.id}/vehicles/${v.id}`).send({ name: 'TUR-26 Ember (backup test)', baseRevision: v.revision }).expect(200);
  cluster = await startThrowawayCluster('restored');
}, 120_000);

afterAll(async () => {
  await t?.close();
  cluster?.remove();
  rmSync(dir, { recursive: true, force: true });
});

async function snapshot(url: string): Promise<Map<string, string[]>> {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    const tables = await c.query<{ schemaname: string; tablename: string }>(
      "SELECT schemaname, tablename FROM pg_tables WHERE schemaname NOT IN ('pg_catalog', 'information_schema') ORDER BY 1, 2",
    );
    const out = new Map<string, string[]>();
    for (const { schemaname, tablename } of tables.rows) {
      const name = `"${schemaname}"."${tablename}"`;
      // Rows as JSON text, ordered by that text: every column compared, json columns included.
      const rows = await c.query<{ r: string }>(`SELECT row_to_json(t)::text AS r FROM ${name} t ORDER BY 1`);
      out.set(name, rows.rows.map((x) => x.r));
    }
    return out;
  } finally {
    await c.end();
  }
}

const backup = (...args: string[]) =>
  spawnSync(process.execPath, ['--import', 'tsx', join(ROOT, 'server', 'tools', 'backup.ts'), ...args], { cwd: ROOT, encoding: 'utf8', timeout: 120_000 });

describe('backup and restore', () => {
  it('the command-line dump restored into a fresh cluster holds every table with identical rows', async () => {
    const file = join(dir, 'rollwise.dump');
    const dump = backup('dump', file, `--database-url=${t.databaseUrl}`);
    expect(dump.status, dump.stderr).toBe(0);
    expect(dump.stdout).toMatch(/backup: dumped .* \(\d+ kB, \d+ tables with data\)/);
    expect(existsSync(`${file}.partial`)).toBe(false);

    const target = cluster!.url;
    const restore = backup('restore', file, `--database-url=${target}`);
    expect(restore.status, restore.stderr).toBe(0);

    const before = await snapshot(t.databaseUrl);
    const after = await snapshot(target);
    expect([...after.keys()]).toEqual([...before.keys()]);
    // The product's own tables are there and hold the seed.
    for (const table of ['"public"."users"', '"public"."teams"', '"public"."memberships"', '"public"."vehicles"', '"public"."session"']) {
      expect(before.get(table)?.length, table).toBeGreaterThan(0);
    }
    for (const [table, rows] of before) expect(after.get(table), table).toEqual(rows);
    expect(after.get('"public"."vehicles"')!.some((r) => r.includes('TUR-26 Ember (backup test)'))).toBe(true);
  });

  it('a restore into a database that already holds tables is refused without --clean, and replaces it with --clean', async () => {
    const file = join(dir, 'again.dump');
    await dumpDatabase(t.databaseUrl, file);
    // The target holds the tables, whatever ran before this test.
    await restoreDatabase(cluster!.url, file, { clean: true });
    await expect(restoreDatabase(cluster!.url, file)).rejects.toThrow(/already holds \d+ tables; restore into an empty database, or pass --clean/);
    await restoreDatabase(cluster!.url, file, { clean: true });
    expect(await snapshot(cluster!.url)).toEqual(await snapshot(t.databaseUrl));
  });

  it('a dump far larger than a pipe buffer is dumped, listed and restored by the command line (pg_restore --list stops reading early)', async () => {
    // About 8 MB of hex text, most of it kept by the dump's compression: the listing reads only the dump's
    // table of contents and exits while the rest is still being written to it.
    const source = createDatabase(cluster!.port, 'big_source');
    const c = new pg.Client({ connectionString: source });
    await c.connect();
    try {
      await c.query('CREATE TABLE bulk (id int PRIMARY KEY, body text NOT NULL)');
      await c.query("INSERT INTO bulk SELECT g, (SELECT string_agg(md5(g::text || ':' || k::text), '') FROM generate_series(1, 2500) k) FROM generate_series(1, 100) g");
    } finally {
      await c.end();
    }
    const file = join(dir, 'big.dump');
    const dump = backup('dump', file, `--database-url=${source}`);
    expect(dump.status, dump.stderr).toBe(0);
    expect(statSync(file).size).toBeGreaterThan(1_000_000);
    const target = createDatabase(cluster!.port, 'big_target');
    const restore = backup('restore', file, `--database-url=${target}`);
    expect(restore.status, restore.stderr).toBe(0);
    expect(await snapshot(target)).toEqual(await snapshot(source));
  });

  it('a dump that fails leaves no file; a file that is no dump is refused before anything is restored', async () => {
    const file = join(dir, 'nothing.dump');
    const r = backup('dump', file, `--database-url=postgres://postgres@127.0.0.1:${cluster!.port}/no_such_database`);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/^backup: pg_dump failed \(exit 1\): .*no_such_database/);
    expect(existsSync(file) || existsSync(`${file}.partial`)).toBe(false);

    const junk = join(dir, 'junk.dump');
    writeFileSync(junk, 'not a dump at all');
    const empty = createDatabase(cluster!.port, 'empty_target');
    await expect(restoreDatabase(empty, junk)).rejects.toThrow(/pg_restore failed/);
    expect((await snapshot(empty)).size).toBe(0);
  });

  it('run from a folder the postgres user cannot enter (a fresh clone in a mode-700 folder), its messages stay clean', () => {
    // The tools run as the postgres OS user when we are root; they must not start in our working directory.
    const closed = mkdtempSync(join(tmpdir(), 'rollwise-closed-'));
    chmodSync(closed, 0o700);
    try {
      const tsx = pathToFileURL(join(ROOT, 'node_modules', 'tsx', 'dist', 'loader.mjs')).href;
      const file = join(dir, 'closed.dump');
      const run = (...args: string[]) =>
        spawnSync(process.execPath, ['--import', tsx, join(ROOT, 'server', 'tools', 'backup.ts'), ...args], { cwd: closed, encoding: 'utf8', timeout: 120_000 });
      const ok = run('dump', file, `--database-url=${t.databaseUrl}`);
      expect(ok.status, ok.stderr).toBe(0);
      expect(ok.stderr).toBe('');
      const bad = run('dump', file, `--database-url=postgres://postgres@127.0.0.1:${cluster!.port}/no_such_database`);
      expect(bad.status).toBe(1);
      expect(bad.stderr).toMatch(/^backup: pg_dump failed \(exit 1\): .*no_such_database/);
      expect(bad.stderr).not.toMatch(/could not change directory|Permission denied/);
    } finally {
      rmSync(closed, { recursive: true, force: true });
    }
  });

  it('usage errors exit 2 with the usage text', () => {
    const r = backup('copy', 'x');
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/usage:\n.*backup\.ts dump FILE/);
  });
});
