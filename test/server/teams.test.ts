/** Teams and members: creation, switching, adding by e-mail, roles, last-owner protection. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addMember, expectError, mailedLink, registerUser, signIn, startTestApp, type TestApp } from './helpers.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ seed: true });
});
afterAll(async () => {
  await t?.close();
});

describe('teams', () => {
  it('a new team makes its creator the owner and appears in Me', async () => {
    const u = await registerUser(t.app, 'Founder');
    const r = await u.agent.post('/api/teams').send({ name: 'Hollin Works', slug: 'hollin-works' });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ name: 'Hollin Works', slug: 'hollin-works', roles: ['owner'] });
    const me = await u.agent.get('/api/auth/me').expect(200);
    expect(me.body.memberships).toEqual([{ teamId: r.body.id, teamName: 'Hollin Works', teamSlug: 'hollin-works', roles: ['owner'] }]);
    const detail = await u.agent.get(`/api/teams/${r.body.id}`).expect(200);
    expect(detail.body.permissions).toEqual(['team:read', 'members:manage', 'vehicle:manage', 'review:comment']);
  });

  it('refuses a taken slug and a malformed one', async () => {
    const u = await registerUser(t.app);
    expectError(await u.agent.post('/api/teams').send({ name: 'Again', slug: 'tallowmere' }), 409, 'slug_taken');
    const bad = await u.agent.post('/api/teams').send({ name: 'Bad', slug: 'Has Spaces!' });
    expectError(bad, 400, 'invalid_input');
    expect(bad.body.error.details.fields[0].path).toBe('slug');
  });

  it('a user in two teams sees both (team switching)', async () => {
    const eli = await signIn(t.app, 'engineer@tallowmere.example');
    const r = await eli.get('/api/teams').expect(200);
    expect(r.body.map((x: { slug: string; roles: string[] }) => [x.slug, x.roles])).toEqual([
      ['brackenfield', ['engineer']],
      ['tallowmere', ['engineer']],
    ]);
  });

  it('an owner can delete their team; it is gone for everyone', async () => {
    const u = await registerUser(t.app);
    const team = (await u.agent.post('/api/teams').send({ name: 'Short-lived', slug: 'short-lived' })).body;
    await u.agent.delete(`/api/teams/${team.id}`).expect(204);
    expectError(await u.agent.get(`/api/teams/${team.id}`), 404, 'not_found');
  });
});

describe('members', () => {
  async function ownTeam() {
    const owner = await registerUser(t.app, 'Owner');
    const team = (await owner.agent.post('/api/teams').send({ name: 'Members Lab', slug: `lab-${Date.now()}-${Math.round(Math.random() * 1e6)}` })).body;
    return { owner, teamId: team.id as string };
  }

  it('there is no direct adding: a person joins by accepting an invitation, with the set of roles it names', async () => {
    const { owner, teamId } = await ownTeam();
    const other = await registerUser(t.app, 'Zed Second');
    // The old direct route is gone (404 "no API route"); nothing was added.
    const direct = await owner.agent.post(`/api/teams/${teamId}/members`).send({ email: other.email, roles: ['viewer'] });
    expectError(direct, 404, 'not_found');
    const inv = await owner.agent.post(`/api/teams/${teamId}/invitations`).send({ email: other.email.toUpperCase(), roles: ['viewer', 'engineer', 'engineer'] });
    expect(inv.status, JSON.stringify(inv.body)).toBe(201);
    // Invited, not a member, no roles, until they accept.
    expect((await owner.agent.get(`/api/teams/${teamId}/members`).expect(200)).body).toHaveLength(1);
    expect((await other.agent.get('/api/auth/me').expect(200)).body.memberships).toEqual([]);
    expectError(await other.agent.get(`/api/teams/${teamId}`), 404, 'not_found');
    await addMember(t, owner.agent, teamId, other, ['viewer', 'engineer']);
    const list = await owner.agent.get(`/api/teams/${teamId}/members`).expect(200);
    expect(list.body).toHaveLength(2);
    expect(list.body.find((m: { userId: string }) => m.userId === other.id).roles).toEqual(['engineer', 'viewer']);
    const me = await other.agent.get('/api/auth/me').expect(200);
    expect(me.body.memberships.map((m: { teamId: string }) => m.teamId)).toEqual([teamId]);
  });

  it('inviting a known and an unknown address answers alike; a member again → 409 naming nobody; bad role → 400', async () => {
    const { owner, teamId } = await ownTeam();
    const known = await registerUser(t.app, 'Known Person');
    const a = await owner.agent.post(`/api/teams/${teamId}/invitations`).send({ email: known.email, roles: ['viewer'] });
    const b = await owner.agent.post(`/api/teams/${teamId}/invitations`).send({ email: 'ghost@nowhere.example', roles: ['viewer'] });
    expect([a.status, b.status]).toEqual([201, 201]);
    const shape = (r: typeof a) => Object.keys(r.body).sort();
    expect(shape(a)).toEqual(shape(b));
    expect(shape(a)).toEqual(['acceptedAt', 'email', 'expiresAt', 'id', 'roles']);
    expect(JSON.stringify(a.body)).not.toContain('Known Person');
    // The invitation page reads alike too: no word on whether an account exists.
    const info = (await owner.agent.get(`/api/invitations/${await mailedLink(t, known.email, 'invitation')}`).expect(200)).body;
    const ghost = (await owner.agent.get(`/api/invitations/${await mailedLink(t, 'ghost@nowhere.example', 'invitation')}`).expect(200)).body;
    expect(Object.keys(info).sort()).toEqual(Object.keys(ghost).sort());
    expect(info).not.toHaveProperty('accountExists');
    const again = await owner.agent.post(`/api/teams/${teamId}/invitations`).send({ email: owner.email, roles: ['viewer'] });
    expectError(again, 409, 'already_member');
    expect(again.body.error.message).not.toContain('Owner');
    expectError(await owner.agent.post(`/api/teams/${teamId}/invitations`).send({ email: known.email, roles: ['admin'] }), 400, 'invalid_input');
    expectError(await owner.agent.post(`/api/teams/${teamId}/invitations`).send({ email: known.email, roles: [] }), 400, 'invalid_input');
  });

  it('never leaves a team without an owner', async () => {
    const { owner, teamId } = await ownTeam();
    expectError(await owner.agent.patch(`/api/teams/${teamId}/members/${owner.id}`).send({ roles: ['engineer'] }), 409, 'last_owner');
    expectError(await owner.agent.delete(`/api/teams/${teamId}/members/${owner.id}`), 409, 'last_owner');
    const other = await registerUser(t.app);
    await addMember(t, owner.agent, teamId, other, ['owner']);
    // With a second owner the first may step down.
    const r = await owner.agent.patch(`/api/teams/${teamId}/members/${owner.id}`).send({ roles: ['engineer'] });
    expect(r.status).toBe(200);
    expect(r.body.roles).toEqual(['engineer']);
    expectError(await other.agent.delete(`/api/teams/${teamId}/members/${other.id}`), 409, 'last_owner');
    await other.agent.delete(`/api/teams/${teamId}/members/${owner.id}`).expect(204);
    expectError(await owner.agent.get(`/api/teams/${teamId}`), 404, 'not_found');
  });

  it('concurrent demotions of the two owners cannot both succeed', async () => {
    const { owner, teamId } = await ownTeam();
    const other = await registerUser(t.app);
    await addMember(t, owner.agent, teamId, other, ['owner']);
    const [a, b] = await Promise.all([
      owner.agent.patch(`/api/teams/${teamId}/members/${owner.id}`).send({ roles: ['viewer'] }),
      other.agent.patch(`/api/teams/${teamId}/members/${other.id}`).send({ roles: ['viewer'] }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
  });

  it('any member may leave; the last owner may not', async () => {
    const { owner, teamId } = await ownTeam();
    const other = await registerUser(t.app);
    await addMember(t, owner.agent, teamId, other, ['viewer']);
    await other.agent.delete(`/api/teams/${teamId}/membership`).expect(204);
    expectError(await other.agent.get(`/api/teams/${teamId}`), 404, 'not_found');
    expectError(await owner.agent.delete(`/api/teams/${teamId}/membership`), 409, 'last_owner');
  });

  it('changing a non-member or a malformed id is 404', async () => {
    const { owner, teamId } = await ownTeam();
    const stranger = await registerUser(t.app);
    expectError(await owner.agent.patch(`/api/teams/${teamId}/members/${stranger.id}`).send({ roles: ['viewer'] }), 404, 'not_found');
    expectError(await owner.agent.delete(`/api/teams/${teamId}/members/123`), 404, 'not_found');
  });
});
