/**
 * Mail through the outbox: the fake SMTP server receives review mail; with
 * the server stopped the action still succeeds and the mail goes out when it
 * returns; enqueueing is idempotent and two workers never send a row twice;
 * the development mailbox shows each person only the mail addressed to them.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq, sql } from 'drizzle-orm';
import { capturedMail, mailOutbox } from '../../server/db/schema.js';
import { enqueueMail, MailWorker } from '../../server/mail/outbox.js';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp.js';
import { agent, expectError, idOf, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let fake: FakeSmtp;
let smtpPort = 0;
let owner: Agent, engineer: Agent, designer: Agent, reviewer: Agent;
let teamId = '';
let body: Record<string, string> = {};

async function startFake(port = 0): Promise<FakeSmtp> {
  return startFakeSmtp({
    port,
    store: async (m) => {
      await t.db.orm
        .insert(capturedMail)
        .values({ messageId: m.messageId, fromAddress: m.from, toAddresses: m.to, subject: m.subject, textBody: m.text })
        .onConflictDoNothing();
    },
  });
}

beforeAll(async () => {
  // The app needs the SMTP address before it starts; the fake needs the database to store into.
  const probe = await startFakeSmtp();
  smtpPort = probe.port;
  await probe.close();
  t = await startTestApp({ seed: true, config: { smtpUrl: `smtp://127.0.0.1:${smtpPort}`, mailPollMs: 50, mailBackoffMs: 20 } });
  fake = await startFake(smtpPort);
  owner = await signIn(t.app, 'owner@tallowmere.example');
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  designer = await signIn(t.app, 'designer@tallowmere.example');
  reviewer = await signIn(t.app, 'reviewer@tallowmere.example');
  teamId = await idOf(owner, '/api/teams', 'tallowmere');
  const vehicleId = await idOf(owner, `/api/teams/${teamId}/vehicles`, 'TUR-26 Ember');
  const designs = (await owner.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  body = {
    vehicleId,
    frontDesignId: designs.find((d) => d.name === 'Front baseline')!.id,
    rearDesignId: designs.find((d) => d.name === 'Rear baseline')!.id,
    trackProfile: 'smooth-circuit',
  };
});
afterAll(async () => {
  await t?.close();
  await fake?.close();
});

async function configuration(name: string): Promise<string> {
  const r = await designer.post(`/api/teams/${teamId}/configurations`).send({ ...body, name });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return r.body.id;
}

describe('mail', () => {
  it('review requested goes to the reviewers; the decision to who submitted it', async () => {
    const id = await configuration('Mail walk');
    await designer.post(`/api/teams/${teamId}/configurations/${id}/submit`).send({ message: 'please look at the rear' }).expect(200);
    const asked = await fake.waitFor((m) => m.subject.includes('Review requested: Mail walk'));
    expect(asked.to).toEqual(['reviewer@tallowmere.example']);
    expect(asked.text).toContain('Dana Quist submitted the configuration "Mail walk", revision 1, of Tallowmere University Racing');
    expect(asked.text).toContain('please look at the rear');
    expect(asked.text).toContain(`/teams/${teamId}/configurations/${id}`);
    expect(asked.from).toBe('no-reply@rollwise.invalid');

    await reviewer.post(`/api/teams/${teamId}/configurations/${id}/request-changes`).send({ message: 'ε rear too small — raise the toe link' }).expect(200);
    const decided = await fake.waitFor((m) => m.subject.startsWith('Mail walk (revision 1): returned for rework'));
    expect(decided.to).toEqual(['designer@tallowmere.example']);
    expect(decided.text).toContain('Ravi Osei decided');
    expect(decided.text).toContain('ε rear too small — raise the toe link');
  });

  it('with the mail server stopped the action succeeds, and the mail goes out once it is back', async () => {
    await fake.close();
    const id = await configuration('While down');
    await engineer.post(`/api/teams/${teamId}/configurations/${id}/submit`).send({}).expect(200);
    const [row] = await t.db.orm.select().from(mailOutbox).where(sql`${mailOutbox.subject} LIKE 'Review requested: While down%'`);
    expect(row).toBeDefined();
    // The worker keeps trying and records why it could not send.
    await expect.poll(async () => (await t.db.orm.select().from(mailOutbox).where(eq(mailOutbox.id, row!.id)))[0]!.attempts, { timeout: 5000 }).toBeGreaterThanOrEqual(1);
    const failed = (await t.db.orm.select().from(mailOutbox).where(eq(mailOutbox.id, row!.id)))[0]!;
    expect(failed.status).toBe('pending');
    expect(failed.lastError).toMatch(/ECONNREFUSED|connect/i);
    expect(failed.nextAttemptAt.getTime()).toBeGreaterThan(failed.createdAt.getTime());

    fake = await startFake(smtpPort);
    const m = await fake.waitFor((x) => x.subject.startsWith('Review requested: While down'), 10_000);
    expect(m.to).toEqual(['reviewer@tallowmere.example']);
    await expect.poll(async () => (await t.db.orm.select().from(mailOutbox).where(eq(mailOutbox.id, row!.id)))[0]!.status, { timeout: 5000 }).toBe('sent');
    expect(fake.messages.filter((x) => x.subject.startsWith('Review requested: While down'))).toHaveLength(1);
  });

  it('enqueueing is idempotent and two workers claiming together send each mail once', async () => {
    // Stop the app's own worker before anything is enqueued, so only the two workers below can claim these rows
    // (stopped after the first enqueue, it sometimes sent the once-only mail itself: a race, not a double send).
    await t.app.mail!.stop();
    // Mail of earlier tests the app's worker had not sent yet is the two workers' to send as well; made due now,
    // so the count below does not depend on where a retry's back-off stands.
    const earlier = (await t.db.orm.update(mailOutbox).set({ nextAttemptAt: sql`now()` }).where(eq(mailOutbox.status, 'pending')).returning()).length;
    await enqueueMail(t.db.orm, { kind: 'test', to: 'a@test.example', subject: 'Once only', text: 'x', dedupeKey: 'once-only' });
    await enqueueMail(t.db.orm, { kind: 'test', to: 'a@test.example', subject: 'Once only', text: 'x', dedupeKey: 'once-only' });
    expect(await t.db.orm.select().from(mailOutbox).where(eq(mailOutbox.dedupeKey, 'once-only'))).toHaveLength(1);

    await enqueueMail(
      t.db.orm,
      Array.from({ length: 12 }, (_, i) => ({ kind: 'test', to: `batch${i}@test.example`, subject: `Batch ${i}`, text: `mail ${i}` })),
    );
    const options = { smtpUrl: fake.url, from: 'Rollwise <no-reply@rollwise.invalid>', pollMs: 1000, maxAttempts: 3, backoffBaseMs: 10, batchSize: 5 };
    const w1 = new MailWorker(t.db.orm, options);
    const w2 = new MailWorker(t.db.orm, options);
    let sent = 0;
    for (let i = 0; i < 6; i++) sent += (await Promise.all([w1.runOnce(), w2.runOnce()])).reduce((a, b) => a + b, 0);
    await w1.stop();
    await w2.stop();
    expect(sent).toBe(earlier + 13); // the 12 and the once-only mail (and any left over), each once
    expect(fake.messages.filter((m) => m.subject === 'Once only')).toHaveLength(1);
    for (let i = 0; i < 12; i++) expect(fake.messages.filter((m) => m.subject === `Batch ${i}`), `Batch ${i}`).toHaveLength(1);
    const pending = await t.db.orm.select().from(mailOutbox).where(eq(mailOutbox.status, 'pending'));
    expect(pending).toEqual([]);
  });

  /** Sends everything due, through a worker of our own (the app's was stopped above); resolves once it is stored. */
  async function deliverAll(): Promise<void> {
    const w = new MailWorker(t.db.orm, { smtpUrl: fake.url, from: 'Rollwise <no-reply@rollwise.invalid>', pollMs: 1000, maxAttempts: 3, backoffBaseMs: 10 });
    try {
      while ((await w.runOnce()) > 0);
    } finally {
      await w.stop();
    }
  }

  it('the development mailbox shows each person only the mail addressed to them', async () => {
    const subjects = async (a: Agent) => ((await a.get('/api/dev/mail').expect(200)).body as { subject: string; to: string[] }[]).map((m) => m.subject);
    // Ravi was asked to review "Mail walk"; Dana was told the decision. Ana, their owner, sees neither.
    expect((await subjects(reviewer)).some((x) => x.startsWith('Review requested: Mail walk'))).toBe(true);
    expect((await subjects(designer)).some((x) => x.startsWith('Mail walk (revision 1): returned for rework'))).toBe(true);
    expect((await subjects(owner)).some((x) => x.includes('Mail walk'))).toBe(false);
    expect(await subjects(reviewer)).not.toContain('Batch 1');
    const kit = await signIn(t.app, 'owner@brackenfield.example');
    expect((await subjects(kit)).some((x) => x.includes('Mail walk'))).toBe(false);
    // Every row is addressed to the reader.
    for (const m of (await reviewer.get('/api/dev/mail').expect(200)).body as { to: string[] }[]) expect(m.to).toEqual(['reviewer@tallowmere.example']);
  });

  it("the account takeover through the development mailbox is closed: a victim's reset link reaches only the victim", async () => {
    // The attack of issue 12: register, make a team, invite the victim, ask a reset for the victim, read the team's mail.
    const attacker = agent(t.app);
    await attacker.post('/api/auth/register').send({ email: 'mallory@test.example', password: 'long-enough-pass', displayName: 'Mallory' }).expect(201);
    const team = (await attacker.post('/api/teams').send({ name: 'Bait', slug: 'bait-team' }).expect(201)).body.id;
    await attacker.post(`/api/teams/${team}/invitations`).send({ email: 'viewer@tallowmere.example', roles: ['owner'] }).expect(201);
    await attacker.post('/api/auth/password-reset').send({ email: 'viewer@tallowmere.example' }).expect(202);
    await deliverAll();
    expect(fake.messages.filter((m) => m.to.includes('viewer@tallowmere.example') && /\/(reset-password|invitations)\//.test(m.text))).toHaveLength(2);
    const seen = JSON.stringify((await attacker.get('/api/dev/mail').expect(200)).body);
    expect(seen).not.toContain('/reset-password/');
    expect(seen).not.toContain('/invitations/');
    expect(seen).not.toContain('viewer@tallowmere.example');
    // The old team mailbox is gone.
    expectError(await attacker.get(`/api/teams/${team}/dev/mail`), 404, 'not_found');
    // The victim, and only the victim, finds both links.
    const vera = await signIn(t.app, 'viewer@tallowmere.example');
    const hers = JSON.stringify((await vera.get('/api/dev/mail').expect(200)).body);
    expect(hers).toContain('/reset-password/');
    expect(hers).toContain('/invitations/');
  });

  it("an account registered with someone's address sees only its own confirmation mail until the address is confirmed", async () => {
    const victim = 'squatted@test.example';
    // Mail already on its way to the address (an invitation) before anyone registers it.
    await owner.post(`/api/teams/${teamId}/invitations`).send({ email: victim, roles: ['engineer'] }).expect(201);
    await deliverAll();
    const squatter = agent(t.app);
    await squatter.post('/api/auth/register').send({ email: victim, password: 'long-enough-pass', displayName: 'Squatter' }).expect(201);
    await squatter.post('/api/auth/password-reset').send({ email: victim }).expect(202);
    await deliverAll();
    expect(fake.messages.filter((m) => m.to.includes(victim)).map((m) => m.text.match(/\/(verify-email|reset-password|invitations)\//)?.[1]).sort()).toEqual([
      'invitations',
      'reset-password',
      'verify-email',
    ]);
    const rows = (await squatter.get('/api/dev/mail').expect(200)).body as { text: string }[];
    expect(rows.length).toBeGreaterThan(0);
    for (const m of rows) {
      expect(m.text).toContain('/verify-email/');
      expect(m.text).not.toMatch(/\/reset-password\/|\/invitations\//);
    }
  });

  it('an API token cannot read the development mailbox', async () => {
    const tok = (await reviewer.post('/api/auth/tokens').send({ name: 'mail reader', teamId, scope: 'read' }).expect(201)).body.token;
    const r = await request(t.app).get('/api/dev/mail').set('Authorization', `Bearer ${tok}`);
    expectError(r, 403, 'session_required');
  });

  it('a production server has no development mail API', async () => {
    // Anonymous callers see the difference without a session: 401 where the route exists, 404 "no route" where it does not.
    expectError(await agent(t.app).get('/api/dev/mail'), 401, 'unauthenticated');
    const prod = await startTestApp({ databaseUrl: t.databaseUrl, config: { production: true, sessionSecret: 'x'.repeat(40) } });
    try {
      const r = await agent(prod.app).get('/api/dev/mail');
      expectError(r, 404, 'not_found');
      expect(r.body.error.message).toContain('No API route');
    } finally {
      await prod.close();
    }
  });
});
