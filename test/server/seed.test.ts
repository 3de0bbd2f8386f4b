/** The demo seed: the invented scenario of team-rules.md, idempotent, and its data valid against the shared schemas. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { seedDemo } from '../../server/db/seed.js';
import { vehicleSchema } from '../../shared/schema/vehicle.js';
import { cornerSchema } from '../../shared/schema/corner.js';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { computeBalance } from '../../shared/balance/api.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import { signIn, startTestApp, type TestApp } from './helpers.js';
import { migratedDatabaseUrl } from '../support/db.js';

let t: TestApp;
beforeAll(async () => {
  // The seed itself runs here, on an unseeded database (other files copy the run's seeded template).
  t = await startTestApp({ databaseUrl: migratedDatabaseUrl(), seed: true });
});
afterAll(async () => {
  await t?.close();
});

const count = async (table: string) => Number((await t.db.pool.query(`SELECT count(*)::int AS n FROM ${table}`)).rows[0].n);

describe('demo seed', () => {
  it('running it again changes nothing', async () => {
    const tables = [
      'users', 'teams', 'memberships', 'vehicles', 'vehicle_revisions', 'axle_designs', 'axle_design_revisions',
      'configurations', 'configuration_revisions', 'configuration_transitions', 'configuration_approvals', 'review_comments', 'mail_outbox',
    ];
    const before = await Promise.all(tables.map(count));
    await seedDemo(t.db.orm, { bcryptRounds: 4 });
    const after = await Promise.all(tables.map(count));
    expect(after).toEqual(before);
    expect(before.slice(0, 4)).toEqual([8, 2, 8, 4]);
    expect(before[7]).toBe(4);
  });

  it('keeps what demo users changed', async () => {
    await t.db.orm.execute(sql`UPDATE teams SET name = 'Tallowmere Racing (renamed)' WHERE slug = 'tallowmere'`);
    await seedDemo(t.db.orm, { bcryptRounds: 4 });
    const r = await t.db.pool.query(`SELECT name FROM teams WHERE slug = 'tallowmere'`);
    expect(r.rows[0].name).toBe('Tallowmere Racing (renamed)');
  });

  it('covers every role, with Bo wearing three hats and Eli in both teams', async () => {
    const r = await t.db.pool.query(`SELECT u.email, t.slug, m.roles FROM memberships m JOIN users u ON u.id = m.user_id JOIN teams t ON t.id = m.team_id`);
    const roles = new Set(r.rows.flatMap((x: { roles: string[] }) => x.roles));
    expect([...roles].sort()).toEqual(['designer', 'engineer', 'owner', 'reviewer', 'viewer']);
    const bo = r.rows.find((x: { email: string }) => x.email === 'owner@brackenfield.example');
    expect(bo.roles).toEqual(['owner', 'engineer', 'designer']);
    const eli = r.rows.filter((x: { email: string }) => x.email === 'engineer@tallowmere.example').map((x: { slug: string }) => x.slug).sort();
    expect(eli).toEqual(['brackenfield', 'tallowmere']);
    const inst = await t.db.pool.query(`SELECT instructor FROM users WHERE email = 'instructor@programme.example'`);
    expect(inst.rows[0].instructor).toBe(true);
  });

  it('stores vehicle data and corners that pass the shared schemas', async () => {
    const v = await t.db.pool.query(`SELECT name, data FROM vehicles ORDER BY name`);
    expect(v.rows.map((x: { name: string }) => x.name)).toEqual(['Brackenfield B3 hatchback', 'Brackenfield B5 estate', 'TUR-25 Cinder', 'TUR-26 Ember']);
    for (const row of v.rows) expect(vehicleSchema.safeParse(row.data).success, row.name).toBe(true);
    const d = await t.db.pool.query(`SELECT name, axle, corner FROM axle_designs`);
    expect(d.rows.length).toBe(10);
    for (const row of d.rows) expect(cornerSchema.safeParse(row.corner).success, row.name).toBe(true);
    expect(new Set(d.rows.map((x: { axle: string }) => x.axle))).toEqual(new Set(['front', 'rear']));
  });

  it('has demo configurations in real review states: approved with a snapshot, in review with a comment, a draft', async () => {
    const ravi = await signIn(t.app, 'reviewer@tallowmere.example');
    const teams = (await ravi.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
    const tal = teams.find((x) => x.slug === 'tallowmere')!.id;
    const list = (await ravi.get(`/api/teams/${tal}/configurations`).expect(200)).body as { id: string; name: string; status: string; trackProfile: string; updatedByName: string }[];
    expect(list.map((c) => [c.name, c.status])).toEqual([
      ['Cinder carry-over', 'draft'],
      ['Ember baseline', 'approved'],
      ['Ember, rear toe link +6 mm', 'in_review'],
    ]);
    const baseline = list.find((c) => c.name === 'Ember baseline')!;
    const history = (await ravi.get(`/api/teams/${tal}/configurations/${baseline.id}/history`).expect(200)).body as { fromStatus: string; toStatus: string; actorName: string }[];
    expect(history.map((h) => [h.fromStatus, h.toStatus, h.actorName])).toEqual([
      ['draft', 'in_review', 'Dana Quist'],
      ['in_review', 'approved', 'Ravi Osei'],
    ]);
    // The snapshot is the balance engine's own answer for the seeded documents (an independent direct call).
    const [approval] = (await ravi.get(`/api/teams/${tal}/configurations/${baseline.id}/approvals`).expect(200)).body;
    const snap = (await ravi.get(`/api/teams/${tal}/configurations/${baseline.id}/approvals/${approval.id}`).expect(200)).body;
    expect(snap.inputs.rearCorner).toEqual(exampleCorners.fsRearWishbone);
    const direct = computeBalance({ vehicle: exampleVehicles.tur26Ember, frontCorner: exampleCorners.fsFrontWishbone, rearCorner: exampleCorners.fsRearWishbone });
    expect(snap.results.balance.understeerBudget.total).toBeCloseTo(direct.understeerBudget.total, 12);
    expect(snap.recompute).toEqual({ engineVersion: ENGINE_VERSION, differences: [] });
    // In review: a reviewer's comment on the budget, and the review request mailed to the reviewer.
    const inReview = list.find((c) => c.status === 'in_review')!;
    const threads = (await ravi.get(`/api/teams/${tal}/configurations/${inReview.id}/comments`).expect(200)).body as { resultRef: string; authorName: string }[];
    expect(threads.map((x) => [x.resultRef, x.authorName])).toEqual([['budget', 'Ravi Osei']]);
    const mail = await t.db.pool.query(`SELECT to_address, subject FROM mail_outbox WHERE subject LIKE 'Review requested: Ember, rear toe link%'`);
    expect(mail.rows.map((m: { to_address: string }) => m.to_address)).toEqual(['reviewer@tallowmere.example']);
    // Brackenfield has its own approved baseline, decided by its own reviewer.
    const kit = await signIn(t.app, 'reviewer@brackenfield.example');
    const bra = ((await kit.get('/api/teams').expect(200)).body as { id: string }[])[0]!.id;
    const b = (await kit.get(`/api/teams/${bra}/configurations`).expect(200)).body as { name: string; status: string; trackProfile: string }[];
    expect(b.map((c) => [c.name, c.status, c.trackProfile])).toEqual([['B3 road baseline', 'approved', 'rough-road']]);
  });

  it('every demo account signs in with the demo password', async () => {
    for (const email of ['owner@tallowmere.example', 'viewer@tallowmere.example', 'reviewer@brackenfield.example', 'instructor@programme.example']) {
      await signIn(t.app, email);
    }
  });
});
