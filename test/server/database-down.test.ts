/** The database going away: 503 JSON, the server keeps running, and recovers when the database returns. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHmac } from 'node:crypto';
import request from 'supertest';
import { freshDatabaseUrl } from '../support/db.js';
import { createDatabase, type Database } from '../../server/db/client.js';
import { migrateDatabase } from '../../server/db/migrate.js';
import { seedDemo } from '../../server/db/seed.js';
import { createApp, type RollwiseApp } from '../../server/app.js';
import { freePort } from '../../server/tools/pg.js';
import { agent, DatabaseRelay, expectError, testConfig } from './helpers.js';

describe('database unreachable from the start (a closed port)', () => {
  let db: Database;
  let app: RollwiseApp;
  beforeAll(async () => {
    const port = await freePort();
    const url = `postgres://postgres@127.0.0.1:${port}/nothing`;
    db = createDatabase(url, { connectTimeoutMs: 500 });
    app = createApp(testConfig(url), db);
  });
  afterAll(async () => {
    await app.close();
    await db.close();
  });

  it('health says degraded with 503', async () => {
    const r = await request(app).get('/api/health');
    expect(r.status).toBe(503);
    expect(r.body).toMatchObject({ status: 'degraded', database: 'unreachable' });
  });
  it('sign-in answers 503 database_unavailable in the error shape, without internals', async () => {
    const r = await agent(app).post('/api/auth/sign-in').send({ email: 'viewer@tallowmere.example', password: 'demo-pass-2026' });
    expectError(r, 503, 'database_unavailable');
    expect(JSON.stringify(r.body)).not.toMatch(/ECONNREFUSED|127\.0\.0\.1/);
    expect(r.headers['retry-after']).toBe('5');
  });
  it('a request with a validly signed session cookie answers 503 (session store unreachable), not 500', async () => {
    // express-session's cookie format: "s:" + id + "." + base64 HMAC-SHA256 of the id, padding removed.
    const sid = 'some-session-id';
    const mac = createHmac('sha256', testConfig('').sessionSecret).update(sid).digest('base64').replace(/=+$/, '');
    const r = await request(app).get('/api/auth/me').set('Cookie', `rollwise.sid=${encodeURIComponent(`s:${sid}.${mac}`)}`);
    expectError(r, 503, 'database_unavailable');
  });
});

describe('database lost and regained', () => {
  let db: Database;
  let app: RollwiseApp;
  let relay: DatabaseRelay;
  beforeAll(async () => {
    // Connections go through a TCP relay that is cut abruptly (faults.test.ts stops the database politely instead).
    relay = new DatabaseRelay(freshDatabaseUrl(), await freePort());
    await relay.start();
    const url = relay.url;
    db = createDatabase(url, { connectTimeoutMs: 500 });
    await migrateDatabase(db);
    await seedDemo(db.orm, { bcryptRounds: 4 });
    app = createApp(testConfig(url), db);
  });
  afterAll(async () => {
    await app.close();
    await db.close();
    await relay.cut();
  });

  it('keeps serving 503 while down and recovers, session intact', async () => {
    const a = agent(app);
    await a.post('/api/auth/sign-in').send({ email: 'owner@tallowmere.example', password: 'demo-pass-2026' }).expect(200);
    await a.get('/api/teams').expect(200);

    await relay.cut();
    expectError(await a.get('/api/teams'), 503, 'database_unavailable');
    expect((await request(app).get('/api/health')).status).toBe(503);
    expectError(await agent(app).post('/api/auth/sign-in').send({ email: 'owner@tallowmere.example', password: 'demo-pass-2026' }), 503, 'database_unavailable');

    await relay.start();
    await request(app).get('/api/health').expect(200);
    const teams = await a.get('/api/teams').expect(200);
    expect(teams.body.map((x: { slug: string }) => x.slug)).toEqual(['tallowmere']);
  });
});
