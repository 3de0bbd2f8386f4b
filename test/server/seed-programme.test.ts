/** The demo programme seed: the invented scenario's programme, idempotent, through the real service and visible through the API. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoProgramme, DEMO_PROGRAMME } from '../../server/db/seed-programme.js';
import { expectError, idOf, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let iris: Agent;
let ana: Agent;
let bo: Agent;
let tallowmere = '';
let brackenfield = '';

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  await seedDemoProgramme(t.db.orm);
  [iris, ana, bo] = await Promise.all([signIn(t.app, 'instructor@programme.example'), signIn(t.app, 'owner@tallowmere.example'), signIn(t.app, 'owner@brackenfield.example')]);
  tallowmere = await idOf(ana, '/api/teams', 'tallowmere');
  brackenfield = await idOf(bo, '/api/teams', 'brackenfield');
});
afterAll(async () => {
  await t?.close();
});

const count = async (table: string) => Number((await t.db.pool.query(`SELECT count(*)::int AS n FROM ${table}`)).rows[0].n);

describe('demo programme seed', () => {
  it('gives the demo instructor one programme with both demo teams invited and Tallowmere accepted', async () => {
    const list = (await iris.get('/api/programmes').expect(200)).body as { id: string; name: string; trackProfile: string }[];
    expect(list.map((p) => [p.name, p.trackProfile])).toEqual([[DEMO_PROGRAMME.name, 'bumpy-circuit']]);
    const detail = (await iris.get(`/api/programmes/${list[0]!.id}`).expect(200)).body;
    expect(detail.teams.map((x: { teamSlug: string; status: string }) => [x.teamSlug, x.status])).toEqual([
      ['brackenfield', 'invited'],
      ['tallowmere', 'accepted'],
    ]);
    expect(detail.teams.find((x: { teamSlug: string }) => x.teamSlug === 'tallowmere').decidedAt).not.toBeNull();
  });

  it('the accepted team is readable by the instructor, the other is not; the owners see the invitation', async () => {
    await iris.get(`/api/teams/${tallowmere}/vehicles`).expect(200);
    expectError(await iris.get(`/api/teams/${brackenfield}/vehicles`), 404, 'not_found');
    const pending = (await bo.get(`/api/teams/${brackenfield}/programmes`).expect(200)).body;
    expect(pending).toMatchObject([{ name: DEMO_PROGRAMME.name, instructorName: 'Iris Calder', status: 'invited' }]);
    const id = (await iris.get('/api/programmes').expect(200)).body[0].id;
    await iris.get(`/api/programmes/${id}/board`).expect(200);
  });

  it('running it again changes nothing and keeps a demo user’s answer', async () => {
    const before = await Promise.all(['programmes', 'programme_teams'].map(count));
    expect(before).toEqual([1, 2]);
    const id = (await iris.get('/api/programmes').expect(200)).body[0].id;
    // Tallowmere's owner leaves the programme; the seed must not accept it again.
    await ana.post(`/api/teams/${tallowmere}/programmes/${id}/decline`).send({}).expect(200);
    await seedDemoProgramme(t.db.orm);
    await seedDemoProgramme(t.db.orm);
    expect(await Promise.all(['programmes', 'programme_teams'].map(count))).toEqual(before);
    const detail = (await iris.get(`/api/programmes/${id}`).expect(200)).body;
    expect(detail.teams.find((x: { teamSlug: string }) => x.teamSlug === 'tallowmere').status).toBe('declined');
  });

  it('two servers seeding at once create one programme', async () => {
    await t.db.pool.query('DELETE FROM programmes');
    await Promise.all([seedDemoProgramme(t.db.orm), seedDemoProgramme(t.db.orm)]);
    expect(await Promise.all(['programmes', 'programme_teams'].map(count))).toEqual([1, 2]);
  });
});
