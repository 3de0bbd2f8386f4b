/** startServer (migrates, seeds, listens) and loadConfig. */
import { describe, expect, it } from 'vitest';
import { freshDatabaseUrl } from '../support/db.js';
import { loadConfig, DEV_SESSION_SECRET } from '../../server/config.js';
import { startServer } from '../../server/main.js';

describe('loadConfig', () => {
  it('has safe development defaults', () => {
    const c = loadConfig({});
    expect(c).toMatchObject({ host: '127.0.0.1', port: 4200, production: false, seedDemo: true, publicUrl: 'http://127.0.0.1:4200', sessionSecret: DEV_SESSION_SECRET });
    expect(c.staticDir).toMatch(/dist\/rollwise\/browser$/);
  });
  it('is silent in tests unless told otherwise', () => {
    expect(loadConfig({ NODE_ENV: 'test' }).logLevel).toBe('silent');
    expect(loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'debug' }).logLevel).toBe('debug');
  });
  it('requires a real session secret in production and never seeds there', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET/);
    expect(() => loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'short' })).toThrow(/SESSION_SECRET/);
    const c = loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'x'.repeat(40), ROLLWISE_SEED_DEMO: 'true', PUBLIC_URL: 'https://rollwise.example/' });
    expect(c).toMatchObject({ production: true, seedDemo: false, publicUrl: 'https://rollwise.example' });
  });
  it('reads the environment and refuses nonsense', () => {
    const c = loadConfig({ HOST: '0.0.0.0', PORT: '8080', DATABASE_URL: 'postgres://db/x', ROLLWISE_SEED_DEMO: 'no', SIGN_IN_MAX_ATTEMPTS: '3', SMTP_URL: 'smtp://127.0.0.1:2525' });
    expect(c).toMatchObject({ host: '0.0.0.0', port: 8080, databaseUrl: 'postgres://db/x', seedDemo: false, smtpUrl: 'smtp://127.0.0.1:2525' });
    expect(c.signInLimit.max).toBe(3);
    expect(() => loadConfig({ PORT: 'eighty' })).toThrow(/PORT/);
    expect(() => loadConfig({ ROLLWISE_SEED_DEMO: 'perhaps' })).toThrow(/ROLLWISE_SEED_DEMO/);
    expect(() => loadConfig({ PUBLIC_URL: 'not a url' })).toThrow(/PUBLIC_URL/);
  });
});

describe('startServer', () => {
  it('migrates, seeds, listens on a free port, and closes', async () => {
    const databaseUrl = freshDatabaseUrl();
    const s = await startServer({ databaseUrl, port: 0, seedDemo: true, logLevel: 'silent', bcryptRounds: 4 });
    try {
      expect(s.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
      const health = await fetch(`${s.url}/api/health`);
      expect(health.status).toBe(200);
      expect(await health.json()).toMatchObject({ database: 'reachable' });
      const r = await fetch(`${s.url}/api/auth/sign-in`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', 'X-Rollwise-Request': '1', Origin: s.url },
        body: JSON.stringify({ email: 'owner@tallowmere.example', password: 'demo-pass-2026' }),
      });
      expect(r.status).toBe(200);
    } finally {
      await s.close();
    }
    await expect(fetch(`${s.url}/api/health`)).rejects.toThrow();
    // A second start on the same database migrates and seeds again without harm.
    const again = await startServer({ databaseUrl, port: 0, seedDemo: true, logLevel: 'silent', bcryptRounds: 4 });
    await again.close();
  });

  it('fails to start with a clear error when the database is unreachable', async () => {
    await expect(startServer({ databaseUrl: 'postgres://postgres@127.0.0.1:1/none', port: 0, logLevel: 'silent', dbConnectTimeoutMs: 500 })).rejects.toThrow();
  });
});

describe('migrations', () => {
  it('several servers migrating one database at once all succeed', async () => {
    const { createDatabase } = await import('../../server/db/client.js');
    const { migrateDatabase } = await import('../../server/db/migrate.js');
    const url = freshDatabaseUrl();
    const dbs = [createDatabase(url), createDatabase(url), createDatabase(url)];
    try {
      await Promise.all(dbs.map((d) => migrateDatabase(d)));
      const r = await dbs[0]!.pool.query(`SELECT count(*)::int AS n FROM drizzle.__drizzle_migrations`);
      expect(r.rows[0].n).toBeGreaterThanOrEqual(1);
      const tables = await dbs[0]!.pool.query(`SELECT tablename FROM pg_tables WHERE schemaname = 'public' ORDER BY tablename`);
      // Every table of the schema exists after the migrations, and nothing else.
      const { getTableName, is } = await import('drizzle-orm');
      const { PgTable } = await import('drizzle-orm/pg-core');
      const schema = await import('../../server/db/schema.js');
      const expected = Object.values(schema)
        .filter((x) => is(x, PgTable))
        .map((x) => getTableName(x as InstanceType<typeof PgTable>))
        .sort();
      expect(expected).toContain('configurations');
      expect(tables.rows.map((x: { tablename: string }) => x.tablename)).toEqual(expected);
    } finally {
      await Promise.all(dbs.map((d) => d.close()));
    }
  });
});

describe('shutdown', () => {
  it('lets a request in flight finish before closing', async () => {
    const s = await startServer({ databaseUrl: freshDatabaseUrl(), port: 0, seedDemo: false, logLevel: 'silent', bcryptRounds: 4 });
    const reg = await fetch(`${s.url}/api/auth/register`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', 'X-Rollwise-Request': '1' },
      body: JSON.stringify({ email: 'late@test.example', password: 'long-enough-pass', displayName: 'Late' }),
    });
    const cookie = reg.headers.get('set-cookie')!.split(';')[0]!;
    // A solve takes a while in the worker; close once the server has the request (not after a guessed
    // delay: on a loaded machine the request may not have been read yet, and an unread connection is idle).
    const received = new Promise((resolve) => s.http.once('request', resolve));
    const inFlight = fetch(`${s.url}/api/compute/axle-roll`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', 'X-Rollwise-Request': '1', Cookie: cookie },
      body: JSON.stringify({ corner: (await import('../../shared/kinematics/examples.js')).exampleCorners.fsRearWishbone, roll: { from: -3, to: 3, step: 0.25 } }),
    });
    await received;
    const closing = s.close();
    const r = await inFlight;
    expect(r.status).toBe(200);
    await closing;
  });
});
