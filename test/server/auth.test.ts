import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { agent, expectError, registerUser, startTestApp, type TestApp } from './helpers.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ seed: true });
});
afterAll(async () => {
  await t?.close();
});

describe('register', () => {
  it('creates the account, signs it in and returns Me', async () => {
    const a = agent(t.app);
    const r = await a.post('/api/auth/register').send({ email: '  New.Person@Test.Example ', password: 'a-long-password', displayName: 'New Person' });
    expect(r.status).toBe(201);
    expect(r.body.user).toMatchObject({ email: 'new.person@test.example', displayName: 'New Person', displayUnits: 'si' });
    expect(r.body.memberships).toEqual([]);
    const cookie = String(r.headers['set-cookie']);
    expect(cookie).toMatch(/rollwise\.sid=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const me = await a.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe('new.person@test.example');
  });

  it('refuses a taken e-mail with 409 email_taken (case-insensitive)', async () => {
    const r = await agent(t.app).post('/api/auth/register').send({ email: 'OWNER@tallowmere.example', password: 'a-long-password', displayName: 'X' });
    expectError(r, 409, 'email_taken');
  });

  it('lists every bad field', async () => {
    const r = await agent(t.app).post('/api/auth/register').send({ email: 'not-an-email', password: 'short', displayName: '' });
    expectError(r, 400, 'invalid_input');
    const paths = (r.body.error.details.fields as { path: string }[]).map((f) => f.path).sort();
    expect(paths).toEqual(['displayName', 'email', 'password']);
  });
});

describe('sign-in and sign-out', () => {
  it('signs in a demo user and shows their memberships', async () => {
    const a = agent(t.app);
    const r = await a.post('/api/auth/sign-in').send({ email: 'engineer@tallowmere.example', password: 'demo-pass-2026' });
    expect(r.status).toBe(200);
    expect(r.body.user.displayName).toBe('Eli Marsh');
    const slugs = (r.body.memberships as { teamSlug: string; roles: string[] }[]).map((m) => `${m.teamSlug}:${m.roles.join('+')}`).sort();
    expect(slugs).toEqual(['brackenfield:engineer', 'tallowmere:engineer']);
  });

  it('gives the same generic 401 for a wrong password and an unknown e-mail', async () => {
    const wrong = await agent(t.app).post('/api/auth/sign-in').send({ email: 'viewer@tallowmere.example', password: 'nope-nope-nope' });
    const unknown = await agent(t.app).post('/api/auth/sign-in').send({ email: 'nobody@tallowmere.example', password: 'nope-nope-nope' });
    expectError(wrong, 401, 'invalid_credentials');
    expectError(unknown, 401, 'invalid_credentials');
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });

  it('regenerates the session id at sign-in', async () => {
    const a = agent(t.app);
    const first = await a.post('/api/auth/sign-in').send({ email: 'viewer@tallowmere.example', password: 'demo-pass-2026' });
    const second = await a.post('/api/auth/sign-in').send({ email: 'viewer@tallowmere.example', password: 'demo-pass-2026' });
    const sid = (res: request.Response) => /rollwise\.sid=([^;]+)/.exec(String(res.headers['set-cookie']))?.[1];
    expect(sid(first)).toBeTruthy();
    expect(sid(second)).toBeTruthy();
    expect(sid(second)).not.toBe(sid(first));
  });

  it('signs out: the session no longer works', async () => {
    const a = agent(t.app);
    await a.post('/api/auth/sign-in').send({ email: 'viewer@tallowmere.example', password: 'demo-pass-2026' }).expect(200);
    await a.get('/api/auth/me').expect(200);
    await a.post('/api/auth/sign-out').expect(204);
    expectError(await a.get('/api/auth/me'), 401, 'unauthenticated');
  });

  it('answers 401 to /me without a session', async () => {
    expectError(await request(t.app).get('/api/auth/me'), 401, 'unauthenticated');
  });
});

describe('profile and password', () => {
  it('updates display name and units', async () => {
    const u = await registerUser(t.app);
    const r = await u.agent.patch('/api/auth/me').send({ displayName: 'Renamed', displayUnits: 'imperial' });
    expect(r.status).toBe(200);
    expect(r.body.user).toMatchObject({ displayName: 'Renamed', displayUnits: 'imperial' });
    expectError(await u.agent.patch('/api/auth/me').send({ displayUnits: 'furlongs' }), 400, 'invalid_input');
  });

  it('changes the password and ends the other sessions only', async () => {
    const u = await registerUser(t.app);
    const other = agent(t.app);
    await other.post('/api/auth/sign-in').send({ email: u.email, password: 'long-enough-pass' }).expect(200);
    await other.get('/api/auth/me').expect(200);

    expectError(await u.agent.post('/api/auth/change-password').send({ currentPassword: 'wrong-one-here', newPassword: 'brand-new-password' }), 400, 'wrong_password');
    expectError(await u.agent.post('/api/auth/change-password').send({ currentPassword: 'long-enough-pass', newPassword: 'short' }), 400, 'invalid_input');
    await u.agent.post('/api/auth/change-password').send({ currentPassword: 'long-enough-pass', newPassword: 'brand-new-password' }).expect(204);

    await u.agent.get('/api/auth/me').expect(200);
    expectError(await other.get('/api/auth/me'), 401, 'unauthenticated');
    expectError(await agent(t.app).post('/api/auth/sign-in').send({ email: u.email, password: 'long-enough-pass' }), 401, 'invalid_credentials');
    await agent(t.app).post('/api/auth/sign-in').send({ email: u.email, password: 'brand-new-password' }).expect(200);
  });
});
