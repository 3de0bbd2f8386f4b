/** Personal API tokens: scope (team, read/write), revocation, hashed at rest, Bearer without CSRF or session. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createHash } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { apiTokens } from '../../server/db/schema.js';
import { addMember, agent, DEMO_PASSWORD, expectError, idOf, mailedLink, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let engineer: Agent;
let tallowmere = '';
let brackenfield = '';
let vehicle = '';

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  const teams = (await engineer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  tallowmere = teams.find((x) => x.slug === 'tallowmere')!.id;
  brackenfield = teams.find((x) => x.slug === 'brackenfield')!.id;
  vehicle = `/api/teams/${tallowmere}/vehicles/${await idOf(engineer, `/api/teams/${tallowmere}/vehicles`, 'TUR-26 Ember')}`;
});
afterAll(async () => {
  await t?.close();
});

async function token(by: Agent, teamId: string, scope: 'read' | 'write', name = `${scope} token`): Promise<{ id: string; token: string }> {
  const r = await by.post('/api/auth/tokens').send({ name, teamId, scope });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return r.body;
}

/** A script: no cookie jar, no CSRF header. */
const script = (tok: string) => ({
  get: (path: string) => request(t.app).get(path).set('Authorization', `Bearer ${tok}`),
  put: (path: string) => request(t.app).put(path).set('Authorization', `Bearer ${tok}`),
  post: (path: string) => request(t.app).post(path).set('Authorization', `Bearer ${tok}`),
});

describe('API tokens', () => {
  it('are shown once and stored only as a hash', async () => {
    const created = await token(engineer, tallowmere, 'read', 'batch study');
    expect(created.token).toMatch(/^rw_[A-Za-z0-9_-]{43}$/);
    const list = await engineer.get('/api/auth/tokens').expect(200);
    const listed = list.body.find((x: { id: string }) => x.id === created.id);
    expect(listed).toMatchObject({ name: 'batch study', scope: 'read', teamId: tallowmere, teamName: 'Tallowmere University Racing', revokedAt: null });
    expect(JSON.stringify(list.body)).not.toContain(created.token);
    expect(listed.prefix).toBe(created.token.slice(0, 10));
    const [row] = await t.db.orm.select().from(apiTokens).where(eq(apiTokens.id, created.id));
    expect(row!.tokenHash).toBe(createHash('sha256').update(created.token).digest('hex'));
    expect(JSON.stringify(row)).not.toContain(created.token);
    // Another user does not see them.
    const designer = await signIn(t.app, 'designer@tallowmere.example');
    expect((await designer.get('/api/auth/tokens').expect(200)).body.map((x: { id: string }) => x.id)).not.toContain(created.id);
    expectError(await designer.delete(`/api/auth/tokens/${created.id}`), 404, 'not_found');
  });

  it('a read token reads its team and computes, but changes nothing; no CSRF header and no session needed', async () => {
    const { token: tok } = await token(engineer, tallowmere, 'read');
    const s = script(tok);
    const r = await s.get(vehicle).expect(200);
    expect(r.headers['set-cookie']).toBeUndefined();
    expect((await s.get('/api/auth/me').expect(200)).body.user.email).toBe('engineer@tallowmere.example');
    const sweep = await s.post('/api/compute/corner-sweep').send({ corner: exampleCorners.fsFrontWishbone, travel: { from: -10, to: 10, step: 5 } });
    expect(sweep.status, JSON.stringify(sweep.body)).toBe(200);
    expectError(await s.put(`${vehicle}/data`).send({ data: exampleVehicles.tur26Ember, baseRevision: r.body.revision }), 403, 'token_scope');
    expectError(await s.get(`/api/teams/${brackenfield}/vehicles`), 403, 'token_scope');
  });

  it('a write token changes data within its holder’s permissions', async () => {
    const { token: tok } = await token(engineer, tallowmere, 'write');
    const s = script(tok);
    const v = await s.get(vehicle).expect(200);
    const put = await s.put(`${vehicle}/data`).send({ data: exampleVehicles.tur26Ember, baseRevision: v.body.revision, message: 'from a script' });
    expect(put.status, JSON.stringify(put.body)).toBe(200);
    expect(put.body).toMatchObject({ revision: v.body.revision + 1, updatedByName: 'Eli Marsh' });
    // The token carries the person's roles, not more: an engineer may not edit hardpoints.
    const designs = await s.get(`${vehicle}/axle-designs`).expect(200);
    const d = designs.body[0];
    expectError(await s.put(`/api/teams/${tallowmere}/axle-designs/${d.id}/corner`).send({ corner: exampleCorners.fsFrontWishbone, baseRevision: d.revision }), 403, 'forbidden');
  });

  it('cannot manage accounts or tokens', async () => {
    const { token: tok } = await token(engineer, tallowmere, 'write');
    expectError(await script(tok).post('/api/auth/tokens').send({ name: 'x', teamId: tallowmere, scope: 'write' }), 403, 'session_required');
    expectError(await script(tok).post('/api/auth/change-password').send({ currentPassword: 'a', newPassword: 'bbbbbbbbbbbb' }), 403, 'session_required');
  });

  it('a revoked, unknown or malformed token is refused, never a fallback to the session', async () => {
    const created = await token(engineer, tallowmere, 'read');
    await script(created.token).get(vehicle).expect(200);
    await engineer.delete(`/api/auth/tokens/${created.id}`).expect(204);
    expectError(await script(created.token).get(vehicle), 401, 'invalid_token');
    expect((await engineer.get('/api/auth/tokens').expect(200)).body.find((x: { id: string }) => x.id === created.id).revokedAt).not.toBeNull();
    expectError(await script(`rw_${'A'.repeat(43)}`).get(vehicle), 401, 'invalid_token');
    // A signed-in browser sending a bad token is refused too.
    expectError(await engineer.get(vehicle).set('Authorization', 'Bearer nonsense'), 401, 'invalid_token');
    expectError(await engineer.get(vehicle).set('Authorization', 'Basic abc'), 401, 'invalid_token');
  });

  it('a token for a team one is not in cannot be made; leaving the team ends what it can do', async () => {
    const kit = await signIn(t.app, 'reviewer@brackenfield.example');
    expectError(await kit.post('/api/auth/tokens').send({ name: 'x', teamId: tallowmere, scope: 'read' }), 404, 'not_found');
    const tok = await token(kit, brackenfield, 'read');
    await script(tok.token).get(`/api/teams/${brackenfield}/vehicles`).expect(200);
    const bo = await signIn(t.app, 'owner@brackenfield.example');
    const kitId = (await kit.get('/api/auth/me').expect(200)).body.user.id;
    await bo.delete(`/api/teams/${brackenfield}/members/${kitId}`).expect(204);
    // Removal revokes the token (it was 404 for a non-member before; now the token itself is dead).
    expectError(await script(tok.token).get(`/api/teams/${brackenfield}/vehicles`), 401, 'invalid_token');
  });

  it('removed from the team, the token stays dead when its owner is invited back', async () => {
    const kit = await signIn(t.app, 'reviewer@brackenfield.example');
    const bo = await signIn(t.app, 'owner@brackenfield.example');
    const kitId = (await kit.get('/api/auth/me').expect(200)).body.user.id;
    // Kit may have been removed by the test above: bring them back first.
    if (!(await kit.get('/api/auth/me').expect(200)).body.memberships.some((m: { teamId: string }) => m.teamId === brackenfield)) {
      await addMember(t, bo, brackenfield, { agent: kit, email: 'reviewer@brackenfield.example' }, ['reviewer']);
    }
    const tok = await token(kit, brackenfield, 'read');
    await script(tok.token).get(`/api/teams/${brackenfield}/vehicles`).expect(200);
    await bo.delete(`/api/teams/${brackenfield}/members/${kitId}`).expect(204);
    // Not even for what needs no team (the compute API, the own account).
    expectError(await script(tok.token).get('/api/auth/me'), 401, 'invalid_token');
    await addMember(t, bo, brackenfield, { agent: kit, email: 'reviewer@brackenfield.example' }, ['reviewer']);
    await kit.get(`/api/teams/${brackenfield}/vehicles`).expect(200);
    expectError(await script(tok.token).get(`/api/teams/${brackenfield}/vehicles`), 401, 'invalid_token');
    expect((await kit.get('/api/auth/tokens').expect(200)).body.find((x: { id: string }) => x.id === tok.id).revokedAt).not.toBeNull();
  });

  it('leaving the team ends the token too', async () => {
    const eli = await signIn(t.app, 'engineer@tallowmere.example');
    const tok = await token(eli, brackenfield, 'read');
    await script(tok.token).get(`/api/teams/${brackenfield}/vehicles`).expect(200);
    const other = await token(eli, tallowmere, 'read');
    await eli.delete(`/api/teams/${brackenfield}/membership`).expect(204);
    expectError(await script(tok.token).get('/api/auth/me'), 401, 'invalid_token');
    // The token for the team Eli is still in keeps working.
    await script(other.token).get(vehicle).expect(200);
  });

  it('a password change ends every token of the account; so does a password reset', async () => {
    const u = agent(t.app);
    const email = `tokens-${Date.now()}@test.example`;
    await u.post('/api/auth/register').send({ email, password: 'first-password-1', displayName: 'Token Holder' }).expect(201);
    const team = (await u.post('/api/teams').send({ name: 'Token team', slug: `token-team-${Date.now()}` }).expect(201)).body.id;
    const a = await token(u, team, 'write');
    await script(a.token).get(`/api/teams/${team}/vehicles`).expect(200);
    await u.post('/api/auth/change-password').send({ currentPassword: 'first-password-1', newPassword: 'second-password-2' }).expect(204);
    expectError(await script(a.token).get(`/api/teams/${team}/vehicles`), 401, 'invalid_token');

    const b = await token(u, team, 'read');
    await script(b.token).get(`/api/teams/${team}/vehicles`).expect(200);
    await agent(t.app).post('/api/auth/password-reset').send({ email }).expect(202);
    await agent(t.app).post('/api/auth/password-reset/confirm').send({ token: await mailedLink(t, email, 'password-reset'), newPassword: 'third-password-3' }).expect(204);
    expectError(await script(b.token).get(`/api/teams/${team}/vehicles`), 401, 'invalid_token');
    // A token made after the change works.
    const again = await signIn(t.app, email, 'third-password-3');
    const c = await token(again, team, 'read');
    await script(c.token).get(`/api/teams/${team}/vehicles`).expect(200);
  });

  it("an instructor's token is held to its scope: a token for the own team does not read a programme team", async () => {
    const iris = await signIn(t.app, 'instructor@programme.example', DEMO_PASSWORD);
    const sandbox = (await iris.post('/api/teams').send({ name: 'Iris sandbox', slug: `iris-sandbox-${Date.now()}` }).expect(201)).body.id;
    const programme = (await iris.post('/api/programmes').send({ name: 'Token scope programme', trackProfile: 'smooth-circuit' }).expect(201)).body.id;
    await iris.post(`/api/programmes/${programme}/teams`).send({ teamSlug: 'tallowmere' }).expect(201);
    const ana = await signIn(t.app, 'owner@tallowmere.example');
    await ana.post(`/api/teams/${tallowmere}/programmes/${programme}/accept`).send({}).expect(200);
    // Signed in, Iris reads Tallowmere through the programme.
    await iris.get(`/api/teams/${tallowmere}/members`).expect(200);
    for (const scope of ['read', 'write'] as const) {
      const tok = await token(iris, sandbox, scope);
      await script(tok.token).get(`/api/teams/${sandbox}/vehicles`).expect(200);
      expectError(await script(tok.token).get(`/api/teams/${tallowmere}/members`), 403, 'token_scope');
      expectError(await script(tok.token).get(`/api/teams/${tallowmere}/activity`), 403, 'token_scope');
    }
  });
});
