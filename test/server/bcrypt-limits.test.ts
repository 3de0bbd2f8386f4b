/**
 * Routes that do bcrypt work cannot be used to burn the server's time (issue 12 §4):
 * a password-reset confirmation checks its link before hashing anything, and the
 * confirmation, change-password and accepting an invitation (which may create an
 * account) are rate-limited per client address, as sign-in and registration are.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import bcrypt from 'bcryptjs';
import { agent, expectError, idOf, mailedLink, registerUser, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let owner: Agent;
let teamId = '';
const MAX = 4;

beforeAll(async () => {
  t = await startTestApp({ seed: true, config: { addressLimit: { windowMs: 15 * 60_000, max: MAX }, signInLimit: { windowMs: 15 * 60_000, max: MAX } } });
  owner = await signIn(t.app, 'owner@tallowmere.example');
  teamId = await idOf(owner, '/api/teams', 'tallowmere');
});
afterAll(async () => {
  await t?.close();
});

describe('bcrypt work only for requests that earned it', () => {
  it('a reset confirmation with a link that is not valid hashes nothing', async () => {
    const hash = vi.spyOn(bcrypt, 'hash');
    try {
      expectError(await agent(t.app).post('/api/auth/password-reset/confirm').send({ token: 'x'.repeat(43), newPassword: 'a-brand-new-pass' }), 400, 'reset_link_invalid');
      expect(hash).not.toHaveBeenCalled();
      // A valid link does hash (so the spy sees what it should).
      const u = await registerUser(t.app, 'Resetting');
      await agent(t.app).post('/api/auth/password-reset').send({ email: u.email }).expect(202);
      hash.mockClear(); // registering hashed too
      await agent(t.app).post('/api/auth/password-reset/confirm').send({ token: await mailedLink(t, u.email, 'password-reset'), newPassword: 'a-brand-new-pass' }).expect(204);
      expect(hash).toHaveBeenCalledTimes(1);
    } finally {
      hash.mockRestore();
    }
  });

  it('reset confirmations are limited per client address', async () => {
    const codes: number[] = [];
    for (let i = 0; i < MAX + 2; i++) {
      codes.push((await agent(t.app).post('/api/auth/password-reset/confirm').send({ token: `${'y'.repeat(42)}${i}`, newPassword: 'a-brand-new-pass' })).status);
    }
    expect(codes.filter((c) => c === 429).length).toBeGreaterThan(0);
    const last = await agent(t.app).post('/api/auth/password-reset/confirm').send({ token: 'z'.repeat(43), newPassword: 'a-brand-new-pass' });
    expectError(last, 429, 'rate_limited');
  });

  it('change-password is limited per client address and per account', async () => {
    const u = await registerUser(t.app, 'Guesser');
    const codes: number[] = [];
    for (let i = 0; i < MAX + 2; i++) {
      codes.push((await u.agent.post('/api/auth/change-password').send({ currentPassword: `wrong-${i}`, newPassword: 'another-long-pass' })).status);
    }
    expect(codes.slice(0, MAX)).toEqual(Array(MAX).fill(400));
    expectError(await u.agent.post('/api/auth/change-password').send({ currentPassword: 'long-enough-pass', newPassword: 'another-long-pass' }), 429, 'rate_limited');
  });

  it('accepting invitations (which may create an account) is limited per client address', async () => {
    const codes: number[] = [];
    for (let i = 0; i < MAX + 2; i++) {
      await owner.post(`/api/teams/${teamId}/invitations`).send({ email: `limit-${i}@test.example`, roles: ['viewer'] }).expect(201);
      const token = await mailedLink(t, `limit-${i}@test.example`, 'invitation');
      codes.push((await agent(t.app).post(`/api/invitations/${token}/accept`).send({ displayName: `Limit ${i}`, password: 'long-enough-pass' })).status);
    }
    expect(codes.slice(0, MAX)).toEqual(Array(MAX).fill(200));
    expect(codes.slice(MAX)).toEqual([429, 429]);
  });
});
