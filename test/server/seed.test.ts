/** The demo seed: the invented scenario of team-rules.md, idempotent, and its data valid against the shared schemas. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { seedDemo } from '../../server/db/seed.js';
import { vehicleSchema } from '../../shared/schema/vehicle.js';
import { cornerSchema } from '../../shared/schema/corner.js';
import { signIn, startTestApp, type TestApp } from './helpers.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ seed: true });
});
afterAll(async () => {
  await t?.close();
});

const count = async (table: string) => Number((await t.db.pool.query(`SELECT count(*)::int AS n FROM ${table}`)).rows[0].n);

describe('demo seed', () => {
  it('running it again changes nothing', async () => {
    const before = await Promise.all(['users', 'teams', 'memberships', 'vehicles', 'vehicle_revisions', 'axle_designs', 'axle_design_revisions'].map(count));
    await seedDemo(t.db.orm, { bcryptRounds: 4 });
    const after = await Promise.all(['users', 'teams', 'memberships', 'vehicles', 'vehicle_revisions', 'axle_designs', 'axle_design_revisions'].map(count));
    expect(after).toEqual(before);
    expect(before.slice(0, 4)).toEqual([8, 2, 8, 4]);
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

  it('every demo account signs in with the demo password', async () => {
    for (const email of ['owner@tallowmere.example', 'viewer@tallowmere.example', 'reviewer@brackenfield.example', 'instructor@programme.example']) {
      await signIn(t.app, email);
    }
  });
});
