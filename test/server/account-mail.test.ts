/**
 * Mail-driven account flows against the fake SMTP server: team invitations
 * (signed, expiring, single-use; GET never accepts; wrong e-mail, reused and
 * tampered links refused; a new person registers straight into the team),
 * password reset and e-mail verification; startServer starting the fake
 * SMTP server itself when the config flag asks for it.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { capturedMail, memberships } from '../../server/db/schema.js';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp.js';
import { startServer } from '../../server/main.js';
import { createApp } from '../../server/app.js';
import { freshDatabaseUrl } from '../support/db.js';
import { agent, expectError, idOf, registerUser, signIn, startTestApp, testConfig, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let fake: FakeSmtp;
let owner: Agent;
let teamId = '';

beforeAll(async () => {
  fake = await startFakeSmtp();
  t = await startTestApp({ seed: true, config: { smtpUrl: fake.url, mailPollMs: 50 } });
  owner = await signIn(t.app, 'owner@tallowmere.example');
  teamId = await idOf(owner, '/api/teams', 'tallowmere');
});
afterAll(async () => {
  await t?.close();
  await fake?.close();
});

const linkToken = (text: string, path: string) => {
  const m = new RegExp(`/${path}/([A-Za-z0-9_.-]+)`).exec(text);
  if (!m) throw new Error(`no /${path}/ link in: ${text}`);
  return m[1]!;
};

async function invite(address: string, roles: string[]): Promise<string> {
  const r = await owner.post(`/api/teams/${teamId}/invitations`).send({ email: address, roles });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  const mail = await fake.waitFor((m) => m.to.includes(address) && m.subject === 'Invitation to Tallowmere University Racing on Rollwise');
  return linkToken(mail.text, 'invitations');
}

describe('team invitations', () => {
  it('a new person opens the link (nothing happens), then registers straight into the team with the given roles', async () => {
    const token = await invite('newcomer@test.example', ['viewer', 'designer']);
    const anon = agent(t.app);
    for (let i = 0; i < 2; i++) {
      const info = await anon.get(`/api/invitations/${token}`).expect(200);
      expect(info.body).toMatchObject({ teamName: 'Tallowmere University Racing', email: 'newcomer@test.example', roles: ['designer', 'viewer'], invitedByName: 'Ana Ferreira' });
      expect(info.body).not.toHaveProperty('accountExists');
    }
    // Opening the link created neither an account nor a membership.
    expect(await t.db.orm.select().from(memberships).where(sql`${memberships.userId} IN (SELECT id FROM users WHERE email = 'newcomer@test.example')`)).toEqual([]);
    expectError(await anon.post(`/api/invitations/${token}/accept`).send({}), 400, 'invalid_input');
    const ok = await anon.post(`/api/invitations/${token}/accept`).send({ displayName: 'Nia Newcomer', password: 'long-enough-pass' });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.teamId).toBe(teamId);
    const me = await anon.get('/api/auth/me').expect(200);
    expect(me.body.user).toMatchObject({ email: 'newcomer@test.example', displayName: 'Nia Newcomer', emailVerified: true });
    expect(me.body.memberships).toEqual([{ teamId, teamName: 'Tallowmere University Racing', teamSlug: 'tallowmere', roles: ['designer', 'viewer'] }]);
    // Used once: the link neither shows nor accepts again.
    expectError(await anon.post(`/api/invitations/${token}/accept`).send({}), 410, 'invitation_used');
    expectError(await agent(t.app).get(`/api/invitations/${token}`), 410, 'invitation_used');
  });

  it('refuses a signed-in user with another address, and the invitation stays usable', async () => {
    const token = await invite('right-person@test.example', ['engineer']);
    const viewer = await signIn(t.app, 'viewer@tallowmere.example');
    expectError(await viewer.post(`/api/invitations/${token}/accept`).send({}), 403, 'wrong_email');
    await agent(t.app).get(`/api/invitations/${token}`).expect(200);
  });

  it('an existing account accepts by signing in with its confirmed address; not by registering again', async () => {
    const u = await registerUser(t.app, 'Existing Person');
    const token = await invite(u.email, ['reviewer']);
    expect((await agent(t.app).get(`/api/invitations/${token}`).expect(200)).body).not.toHaveProperty('accountExists');
    expectError(await agent(t.app).post(`/api/invitations/${token}/accept`).send({ displayName: 'Impostor', password: 'long-enough-pass' }), 409, 'email_taken');
    // Not with the address unconfirmed: whoever registered it first has not proved it is theirs.
    expectError(await u.agent.post(`/api/invitations/${token}/accept`).send({}), 403, 'email_unverified');
    expect((await u.agent.get('/api/auth/me').expect(200)).body.memberships).toEqual([]);
    const verify = await fake.waitFor((m) => m.to.includes(u.email) && m.subject === 'Confirm your e-mail address for Rollwise');
    await u.agent.post('/api/auth/verify-email').send({ token: linkToken(verify.text, 'verify-email') }).expect(200);
    const r = await u.agent.post(`/api/invitations/${token}/accept`).send({}).expect(200);
    expect(r.body.me.memberships.find((m: { teamId: string }) => m.teamId === teamId).roles).toEqual(['reviewer']);
    expectError(await owner.post(`/api/teams/${teamId}/invitations`).send({ email: u.email, roles: ['viewer'] }), 409, 'already_member');
  });

  it('a tampered link is not valid', async () => {
    const token = await invite('tamper@test.example', ['viewer']);
    const other = await invite('tamper2@test.example', ['owner']);
    const [body, mac] = token.split('.') as [string, string];
    const flipped = `${body}.${mac.slice(0, -2)}${mac.endsWith('AA') ? 'BB' : 'AA'}`;
    const swapped = `${other.split('.')[0]}.${mac}`; // someone else's invitation with this signature
    for (const bad of [flipped, swapped, `${body}`, 'not-a-token-at-all']) {
      expectError(await agent(t.app).get(`/api/invitations/${bad}`), 404, 'invitation_invalid');
      expectError(await agent(t.app).post(`/api/invitations/${bad}/accept`).send({ displayName: 'X', password: 'long-enough-pass' }), 404, 'invitation_invalid');
    }
  });

  it('an expired link shows that it expired and cannot be accepted', async () => {
    // Same database and secret, invitations that live 1 ms.
    const shortLived = createApp(testConfig(t.databaseUrl, { smtpUrl: fake.url, invitationTtlMs: 1 }), t.db);
    try {
      const o = await signIn(shortLived, 'owner@tallowmere.example');
      await o.post(`/api/teams/${teamId}/invitations`).send({ email: 'late@test.example', roles: ['viewer'] }).expect(201);
      const mail = await fake.waitFor((m) => m.to.includes('late@test.example'));
      const token = linkToken(mail.text, 'invitations');
      await new Promise((r) => setTimeout(r, 1100)); // the signed expiry has a resolution of one second
      expectError(await agent(t.app).get(`/api/invitations/${token}`), 410, 'invitation_expired');
      expectError(await agent(t.app).post(`/api/invitations/${token}/accept`).send({ displayName: 'Late', password: 'long-enough-pass' }), 410, 'invitation_expired');
    } finally {
      await shortLived.close();
    }
  });

  it('only the owner invites and lists invitations', async () => {
    const eng = await signIn(t.app, 'engineer@tallowmere.example');
    expectError(await eng.post(`/api/teams/${teamId}/invitations`).send({ email: 'x@test.example', roles: ['viewer'] }), 403, 'forbidden');
    expectError(await eng.get(`/api/teams/${teamId}/invitations`), 403, 'forbidden');
    // Its own invitation, accepted here (not one of another test: each test stands alone).
    const token = await invite('listed@test.example', ['viewer']);
    await agent(t.app).post(`/api/invitations/${token}/accept`).send({ displayName: 'Listed Person', password: 'long-enough-pass' }).expect(200);
    const list = await owner.get(`/api/teams/${teamId}/invitations`).expect(200);
    expect(list.body.find((i: { email: string }) => i.email === 'listed@test.example').acceptedAt).not.toBeNull();
  });
});

describe('password reset and e-mail verification', () => {
  it('a reset link changes the password once and ends every session', async () => {
    const u = await registerUser(t.app, 'Forgetful');
    await agent(t.app).post('/api/auth/password-reset').send({ email: u.email.toUpperCase() }).expect(202);
    const mail = await fake.waitFor((m) => m.to.includes(u.email) && m.subject === 'Reset your Rollwise password');
    const token = linkToken(mail.text, 'reset-password');
    await agent(t.app).post('/api/auth/password-reset/confirm').send({ token, newPassword: 'a-brand-new-pass' }).expect(204);
    expectError(await u.agent.get('/api/auth/me'), 401, 'unauthenticated');
    await signIn(t.app, u.email, 'a-brand-new-pass');
    expectError(await agent(t.app).post('/api/auth/password-reset/confirm').send({ token, newPassword: 'another-new-pass' }), 400, 'reset_link_invalid');
    expectError(await agent(t.app).post('/api/auth/password-reset/confirm').send({ token: 'x'.repeat(43), newPassword: 'another-new-pass' }), 400, 'reset_link_invalid');
  });

  it('an unknown address gets the same answer and no mail', async () => {
    const r = await agent(t.app).post('/api/auth/password-reset').send({ email: 'nobody-here@test.example' }).expect(202);
    expect(r.body.status).toContain('If an account uses that address');
    await t.app.mail!.runOnce();
    expect(fake.messages.some((m) => m.to.includes('nobody-here@test.example'))).toBe(false);
  });

  it('registering sends a confirmation link that verifies the address', async () => {
    const u = await registerUser(t.app, 'Verifiable');
    expect((await u.agent.get('/api/auth/me').expect(200)).body.user.emailVerified).toBe(false);
    const mail = await fake.waitFor((m) => m.to.includes(u.email) && m.subject === 'Confirm your e-mail address for Rollwise');
    const token = linkToken(mail.text, 'verify-email');
    expectError(await agent(t.app).post('/api/auth/verify-email').send({ token: `${token.slice(0, -1)}${token.endsWith('A') ? 'B' : 'A'}` }), 400, 'verification_invalid');
    await agent(t.app).post('/api/auth/verify-email').send({ token }).expect(200);
    expect((await u.agent.get('/api/auth/me').expect(200)).body.user.emailVerified).toBe(true);
    expectError(await u.agent.post('/api/auth/verify-email/resend').send({}), 409, 'already_verified');
  });
});

describe('startServer with the fake SMTP flag', () => {
  it('starts the fake SMTP server, sends to it and stores what it received', async () => {
    const databaseUrl = freshDatabaseUrl();
    const s = await startServer({ ...testConfig(databaseUrl), port: 0, seedDemo: false, fakeSmtp: true, smtpUrl: undefined, mailPollMs: 50 });
    try {
      expect(s.smtpUrl).toMatch(/^smtp:\/\/127\.0\.0\.1:\d+$/);
      const r = await fetch(`${s.url}/api/auth/register`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-rollwise-request': '1' },
        body: JSON.stringify({ email: 'started@test.example', password: 'long-enough-pass', displayName: 'Started' }),
      });
      expect(r.status).toBe(201);
      const { createDatabase } = await import('../../server/db/client.js');
      const db = createDatabase(databaseUrl);
      try {
        await expect
          .poll(async () => (await db.orm.select().from(capturedMail)).map((m) => [m.toAddresses, m.subject]), { timeout: 5000 })
          .toEqual([[['started@test.example'], 'Confirm your e-mail address for Rollwise']]);
      } finally {
        await db.close();
      }
    } finally {
      await s.close();
    }
  });
});
