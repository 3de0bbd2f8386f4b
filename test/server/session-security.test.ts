/**
 * Sessions under attack: fixation, cookie flags, CSRF on every state-changing
 * route (enumerated from the router, see listRoutes), rate limits on sign-in
 * and password reset, and account enumeration. The basics (one CSRF refusal,
 * the sign-in limit per account, sessions across restarts, Secure in
 * production) are in http.test.ts and auth.test.ts; this file goes wider.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import bcrypt from 'bcryptjs';
import request from 'supertest';
import { createApp } from '../../server/app.js';
import { SESSION_COOKIE, SESSION_TABLE } from '../../server/http/session.js';
import { agent, DEMO_PASSWORD, expectError, idOf, listRoutes, registerUser, signIn, startTestApp, testConfig, type Agent, type TestApp } from './helpers.js';

const LIMIT = 4;
let t: TestApp;
let teamId = '';
beforeAll(async () => {
  // bcrypt cost 8 (not the suite's 4) so a skipped hash would show in the timing check below.
  t = await startTestApp({ seed: true, config: { signInLimit: { windowMs: 60_000, max: LIMIT }, bcryptRounds: 8 } });
  const owner = await signIn(t.app, 'owner@tallowmere.example');
  teamId = await idOf(owner, '/api/teams', 'tallowmere');
});
afterAll(async () => {
  await t?.close();
});

/** The rollwise.sid cookie of a response: its value and attributes (lower-cased names). */
function sessionCookie(r: request.Response): { value: string; attrs: Record<string, string | true> } | undefined {
  const raw = ([] as string[]).concat(r.headers['set-cookie'] ?? []).find((c) => c.startsWith(`${SESSION_COOKIE}=`));
  if (!raw) return undefined;
  const [pair, ...attrs] = raw.split(';').map((s) => s.trim());
  const value = pair!.slice(SESSION_COOKIE.length + 1);
  return { value, attrs: Object.fromEntries(attrs.map((a) => (a.includes('=') ? [a.split('=')[0]!.toLowerCase(), a.slice(a.indexOf('=') + 1)] : [a.toLowerCase(), true]))) };
}
/** The session id inside a signed cookie value (`s:<sid>.<signature>`, URL-encoded). */
const sidOf = (cookieValue: string) => /^s:([^.]+)\./.exec(decodeURIComponent(cookieValue))?.[1];
const asCookie = (value: string) => `${SESSION_COOKIE}=${value}`;
const sessionRows = async (sid: string) => (await t.db.pool.query(`SELECT 1 FROM "${SESSION_TABLE}" WHERE sid = $1`, [sid])).rowCount;

describe('session fixation', () => {
  it('a session id known before sign-in is worthless after it: a new id is issued and the old row is gone', async () => {
    // The attacker signs in and plants their own session cookie in the victim's browser.
    const attacker = await request(t.app).post('/api/auth/sign-in').set('X-Rollwise-Request', '1').send({ email: 'viewer@tallowmere.example', password: DEMO_PASSWORD });
    const planted = sessionCookie(attacker)!.value;
    expect(await sessionRows(sidOf(planted)!)).toBe(1);
    // The victim signs in carrying it.
    const victim = await request(t.app)
      .post('/api/auth/sign-in')
      .set('X-Rollwise-Request', '1')
      .set('Cookie', asCookie(planted))
      .send({ email: 'designer@tallowmere.example', password: DEMO_PASSWORD });
    expect(victim.status).toBe(200);
    const issued = sessionCookie(victim)!.value;
    expect(sidOf(issued)).toBeTruthy();
    expect(sidOf(issued)).not.toBe(sidOf(planted));
    expect(await sessionRows(sidOf(planted)!)).toBe(0);
    // The planted cookie now signs nobody in; the issued one is the victim's.
    expectError(await request(t.app).get('/api/auth/me').set('Cookie', asCookie(planted)), 401, 'unauthenticated');
    expect((await request(t.app).get('/api/auth/me').set('Cookie', asCookie(issued)).expect(200)).body.user.email).toBe('designer@tallowmere.example');
  });

  it('registration and a forged cookie get a fresh id too', async () => {
    const forged = encodeURIComponent('s:attacker-chosen-id.not-a-signature');
    const r = await request(t.app)
      .post('/api/auth/register')
      .set('X-Rollwise-Request', '1')
      .set('Cookie', asCookie(forged))
      .send({ email: `fixation-${Date.now()}@test.example`, password: 'long-enough-pass', displayName: 'Fix Ation' });
    expect(r.status).toBe(201);
    const sid = sidOf(sessionCookie(r)!.value);
    expect(sid).toBeTruthy();
    expect(sid).not.toBe('attacker-chosen-id');
    expect(await sessionRows('attacker-chosen-id')).toBe(0);
  });
});

describe('cookie flags', () => {
  const idleSeconds = () => t.config.sessionIdleMs / 1000;

  it('development: HttpOnly, SameSite=Lax, Path=/, no Domain, expires with the idle timeout, not Secure (plain http)', async () => {
    const r = await agent(t.app).post('/api/auth/sign-in').send({ email: 'viewer@tallowmere.example', password: DEMO_PASSWORD }).expect(200);
    const c = sessionCookie(r)!;
    expect(c.attrs['httponly']).toBe(true);
    expect(String(c.attrs['samesite']).toLowerCase()).toBe('lax');
    expect(c.attrs['path']).toBe('/');
    expect(c.attrs['domain']).toBeUndefined();
    expect(c.attrs['secure']).toBeUndefined();
    const expires = Date.parse(String(c.attrs['expires']));
    expect(Math.abs((expires - Date.now()) / 1000 - idleSeconds())).toBeLessThan(60);
  });

  it('production: Secure as well, on sign-in and on the sign-out that clears it', async () => {
    const prod = createApp(testConfig(t.databaseUrl, { production: true, publicUrl: 'https://rollwise.example' }), t.db);
    try {
      const https = (req: request.Test) => req.set('X-Rollwise-Request', '1').set('X-Forwarded-Proto', 'https').set('Origin', 'https://rollwise.example');
      const r = await https(request(prod).post('/api/auth/sign-in')).send({ email: 'viewer@tallowmere.example', password: DEMO_PASSWORD });
      expect(r.status).toBe(200);
      const c = sessionCookie(r)!;
      expect(c.attrs).toMatchObject({ httponly: true, secure: true, path: '/' });
      expect(String(c.attrs['samesite']).toLowerCase()).toBe('lax');
      const out = await https(request(prod).post('/api/auth/sign-out')).set('Cookie', asCookie(c.value));
      expect(out.status).toBe(204);
      const cleared = sessionCookie(out)!;
      expect(cleared.value).toBe('');
      expect(cleared.attrs).toMatchObject({ httponly: true, secure: true, path: '/' });
      expect(Date.parse(String(cleared.attrs['expires']))).toBeLessThan(Date.now());
    } finally {
      await prod.close();
    }
  });
});

describe('CSRF on every state-changing route (from the router)', () => {
  const OTHER_ID = '7d1e6c1a-3b9f-4e7a-8c2d-5f0a1b2c3d4e';

  /** Every mounted non-GET /api route, params filled in with the owner's team and well-formed ids. */
  function stateChanging() {
    return listRoutes(t.app)
      .filter((r) => r.path.startsWith('/api/') && !['GET', 'HEAD', 'OPTIONS'].includes(r.method))
      .map((r) => ({ ...r, url: r.path.replace(':teamId', teamId).replace(/:[A-Za-z]+/g, (p) => (p === ':token' ? 'some-invitation-link' : p === ':revision' ? '1' : OTHER_ID)) }));
  }

  /** A digest of every table's content, to show that refused requests changed nothing. */
  async function databaseDigest(): Promise<string> {
    const tables = (await t.db.pool.query<{ t: string }>("SELECT quote_ident(tablename) AS t FROM pg_tables WHERE schemaname = 'public' ORDER BY tablename")).rows.map((r) => r.t);
    const parts = await Promise.all(tables.map(async (tb) => (await t.db.pool.query<{ d: string }>(`SELECT ${"'"}${tb}:${"'"} || count(*) || ':' || coalesce(md5(string_agg(x::text, '|' ORDER BY x::text)), '') AS d FROM ${tb} x`)).rows[0]!.d));
    return parts.join('\n');
  }

  it('without X-Rollwise-Request, with a wrong value, with a foreign or null Origin: 403 csrf_refused, nothing changed', async () => {
    const routes = stateChanging();
    expect(routes.length).toBeGreaterThan(50);
    const signedIn = await request(t.app).post('/api/auth/sign-in').set('X-Rollwise-Request', '1').send({ email: 'owner@tallowmere.example', password: DEMO_PASSWORD }).expect(200);
    const sessionCookieHeader = asCookie(sessionCookie(signedIn)!.value);
    const before = await databaseDigest();
    const attempts: [string, (req: request.Test) => request.Test][] = [
      ['no header', (req) => req],
      ['wrong header value', (req) => req.set('X-Rollwise-Request', 'true')],
      ['foreign Origin', (req) => req.set('X-Rollwise-Request', '1').set('Origin', 'https://evil.example')],
      ['look-alike Origin', (req) => req.set('X-Rollwise-Request', '1').set('Origin', `${t.config.publicUrl}.evil.example`)],
      ['null Origin (sandboxed frame)', (req) => req.set('X-Rollwise-Request', '1').set('Origin', 'null')],
    ];
    const wrong: string[] = [];
    for (const r of routes) {
      for (const [what, how] of attempts) {
        const m = r.method.toLowerCase() as 'post' | 'put' | 'patch' | 'delete';
        const res = await how(request(t.app)[m](r.url).set('Cookie', sessionCookieHeader)).send({ name: 'csrf probe' });
        if (res.status !== 403 || res.body?.error?.code !== 'csrf_refused') wrong.push(`${r.method} ${r.path} (${what}): ${res.status} ${JSON.stringify(res.body)}`);
      }
    }
    expect(wrong).toEqual([]);
    expect(await databaseDigest()).toBe(before);
    // The same session with the header and our own origin gets through (so the refusals above were the CSRF check).
    const own = await request(t.app).patch('/api/auth/me').set('Cookie', sessionCookieHeader).set('X-Rollwise-Request', '1').set('Origin', t.config.publicUrl).send({ displayUnits: 'si' });
    expect(own.status, JSON.stringify(own.body)).toBe(200);
  });
});

describe('rate limits', () => {
  it(`sign-in: after ${LIMIT} failures the account is locked for that client, the right password included, and X-Forwarded-For does not reset it`, async () => {
    const email = 'reviewer@tallowmere.example';
    for (let i = 0; i < LIMIT; i++) expectError(await agent(t.app).post('/api/auth/sign-in').send({ email, password: `wrong-${i}-password` }), 401, 'invalid_credentials');
    const limited = await agent(t.app).post('/api/auth/sign-in').send({ email, password: DEMO_PASSWORD });
    expectError(limited, 429, 'rate_limited');
    expect(limited.headers['ratelimit']).toMatch(/\br=0\b/);
    // In development the server trusts no proxy: a client-chosen X-Forwarded-For is not a new address.
    expectError(await agent(t.app).post('/api/auth/sign-in').set('X-Forwarded-For', '203.0.113.9').send({ email, password: DEMO_PASSWORD }), 429, 'rate_limited');
    // Spelling the address differently is the same account.
    expectError(await agent(t.app).post('/api/auth/sign-in').send({ email: `  ${email.toUpperCase()} `, password: DEMO_PASSWORD }), 429, 'rate_limited');
  });

  it(`password reset: after ${LIMIT} requests from one client, 429 whatever the address`, async () => {
    const app = createApp(testConfig(t.databaseUrl, { signInLimit: { windowMs: 60_000, max: LIMIT } }), t.db);
    try {
      const statuses: number[] = [];
      for (let i = 0; i < LIMIT + 2; i++) {
        const r = await agent(app).post('/api/auth/password-reset').send({ email: i % 2 ? 'owner@tallowmere.example' : `nobody-${i}@test.example` });
        statuses.push(r.status);
        if (r.status === 429) expectError(r, 429, 'rate_limited');
      }
      expect(statuses).toEqual([...Array(LIMIT).fill(202), 429, 429]);
    } finally {
      await app.close();
    }
  });
});

describe('limits per client address (config.addressLimit)', () => {
  const MAX = 4;
  it(`failed sign-ins over many accounts, registrations and confirmation resends: ${MAX} per window from one address, then 429`, async () => {
    const app = createApp(testConfig(t.databaseUrl, { addressLimit: { windowMs: 60_000, max: MAX } }), t.db);
    try {
      // Failed sign-ins spread over different addresses (the per-account limit never trips).
      const signIns: number[] = [];
      for (let i = 0; i < MAX + 1; i++) signIns.push((await agent(app).post('/api/auth/sign-in').send({ email: `probe-${i}@test.example`, password: 'not-the-password' })).status);
      expect(signIns).toEqual([...Array(MAX).fill(401), 429]);
      expectError(await agent(app).post('/api/auth/sign-in').send({ email: 'viewer@tallowmere.example', password: DEMO_PASSWORD }), 429, 'rate_limited');

      const stamp = Date.now();
      const registrations: number[] = [];
      let first: Agent | undefined;
      for (let i = 0; i < MAX + 1; i++) {
        const a = agent(app);
        registrations.push((await a.post('/api/auth/register').send({ email: `limit-${stamp}-${i}@test.example`, password: 'long-enough-pass', displayName: `Limit ${i}` })).status);
        first ??= a;
      }
      expect(registrations).toEqual([...Array(MAX).fill(201), 429]);
      // Nothing was created by the refused registration.
      const made = await t.db.pool.query(`SELECT count(*)::int AS n FROM users WHERE email LIKE $1`, [`limit-${stamp}-%`]);
      expect(made.rows[0].n).toBe(MAX);

      const resends: number[] = [];
      for (let i = 0; i < MAX + 1; i++) resends.push((await first!.post('/api/auth/verify-email/resend')).status);
      expect(resends).toEqual([...Array(MAX).fill(202), 429]);
    } finally {
      await app.close();
    }
  });
});

describe('account enumeration', () => {

  it('sign-in failure: same status and body for a known and an unknown address, and the same bcrypt work', async () => {
    // A fresh app so the limiter of the tests above is not in the way; an account hashed at this app's cost.
    const app = createApp(testConfig(t.databaseUrl, { bcryptRounds: 8 }), t.db);
    try {
      const known = await registerUser(app, 'Known Person');
      const unknownEmail = `never-registered-${Date.now()}@test.example`;
      const known$ = () => agent(app).post('/api/auth/sign-in').send({ email: known.email, password: 'not-the-password' });
      const unknown$ = () => agent(app).post('/api/auth/sign-in').send({ email: unknownEmail, password: 'not-the-password' });
      const a = await known$();
      const b = await unknown$();
      expectError(a, 401, 'invalid_credentials');
      expect(b.status).toBe(a.status);
      expect(b.body).toEqual(a.body);
      expect(sessionCookie(a)).toBeUndefined();
      expect(sessionCookie(b)).toBeUndefined();
      // The same bcrypt work, counted rather than timed: each sign-in compares once against a hash of the
      // app's cost, the unknown address against a stand-in hash (skipping it would answer those clearly faster).
      const compared: string[] = [];
      const compare = bcrypt.compare.bind(bcrypt);
      const spy = vi.spyOn(bcrypt, 'compare').mockImplementation(async (password: string, hash: string) => {
        compared.push(hash);
        return compare(password, hash);
      });
      try {
        expect((await known$()).status).toBe(401);
        expect(compared.map((h) => bcrypt.getRounds(h))).toEqual([8]);
        expect((await unknown$()).status).toBe(401);
        expect(compared.map((h) => bcrypt.getRounds(h))).toEqual([8, 8]);
        expect(compared[1]).not.toBe(compared[0]);
      } finally {
        spy.mockRestore();
      }
    } finally {
      await app.close();
    }
  });

  it('password reset: the same answer for a known and an unknown address; mail only for the account', async () => {
    const app = createApp(testConfig(t.databaseUrl), t.db);
    try {
      const unknown = `nobody-at-all-${Date.now()}@test.example`;
      const a = await agent(app).post('/api/auth/password-reset').send({ email: 'viewer@tallowmere.example' });
      const b = await agent(app).post('/api/auth/password-reset').send({ email: unknown });
      expect(a.status).toBe(202);
      expect(b.status).toBe(a.status);
      expect(b.body).toEqual(a.body);
      expect(Object.keys(b.headers).sort()).toEqual(Object.keys(a.headers).sort());
      const mail = await t.db.pool.query('SELECT to_address FROM mail_outbox WHERE to_address = ANY($1)', [['viewer@tallowmere.example', unknown]]);
      expect(mail.rows.filter((r) => r.to_address === unknown)).toEqual([]);
      expect(mail.rows.filter((r) => r.to_address === 'viewer@tallowmere.example').length).toBeGreaterThan(0);
    } finally {
      await app.close();
    }
  });

  it('registration with a taken address says so (409 email_taken): the one place an address is confirmed, documented in docs/security.md', async () => {
    const r = await agent(t.app).post('/api/auth/register').send({ email: 'viewer@tallowmere.example', password: 'long-enough-pass', displayName: 'Copy' });
    expectError(r, 409, 'email_taken');
    expect(sessionCookie(r)).toBeUndefined();
  });
});
