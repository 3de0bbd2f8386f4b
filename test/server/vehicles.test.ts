/** Vehicles and axle designs: validated documents, immutable revisions, stale writes refused with nothing lost. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { expectError, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let engineer: Agent;
let designer: Agent;
let owner: Agent;
let teamId = '';
let otherTeamVehicleId = '';

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  designer = await signIn(t.app, 'designer@tallowmere.example');
  owner = await signIn(t.app, 'owner@tallowmere.example');
  const teams = (await engineer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  teamId = teams.find((x) => x.slug === 'tallowmere')!.id;
  const b = teams.find((x) => x.slug === 'brackenfield')!.id;
  otherTeamVehicleId = (await engineer.get(`/api/teams/${b}/vehicles`).expect(200)).body[0].id;
});
afterAll(async () => {
  await t?.close();
});

describe('vehicles', () => {
  it('lists the seeded vehicles with who changed them last', async () => {
    const r = await engineer.get(`/api/teams/${teamId}/vehicles`).expect(200);
    expect(r.body.map((v: { name: string }) => v.name)).toEqual(['TUR-25 Cinder', 'TUR-26 Ember']);
    expect(r.body[0]).toMatchObject({ archived: false, revision: 1, updatedByName: 'Ana Ferreira' });
    expect(Object.keys(r.body[0]).sort()).toEqual(['archived', 'id', 'name', 'revision', 'updatedAt', 'updatedByName']);
  });

  it('creates with and without data; bad data lists the fields', async () => {
    const empty = await engineer.post(`/api/teams/${teamId}/vehicles`).send({ name: 'Blank car' }).expect(201);
    expect(empty.body).toMatchObject({ name: 'Blank car', revision: 1, data: null, archived: false, updatedByName: 'Eli Marsh' });
    const full = await engineer.post(`/api/teams/${teamId}/vehicles`).send({ name: 'Full car', data: exampleVehicles.tur25Cinder }).expect(201);
    expect(full.body.data.massKg).toBe(exampleVehicles.tur25Cinder.massKg);
    const bad = await engineer.post(`/api/teams/${teamId}/vehicles`).send({ name: 'Bad car', data: { ...exampleVehicles.tur25Cinder, massKg: -5, wheelbaseMm: 'long' } });
    expectError(bad, 400, 'invalid_input');
    const paths = (bad.body.error.details.fields as { path: string }[]).map((f) => f.path);
    expect(paths).toContain('massKg');
    expect(paths).toContain('wheelbaseMm');
  });

  it('a stale data write gets 409 with the current revision; both revisions are kept', async () => {
    const v = (await engineer.post(`/api/teams/${teamId}/vehicles`).send({ name: 'Contested', data: exampleVehicles.tur26Ember }).expect(201)).body;
    const heavier = { ...exampleVehicles.tur26Ember, massKg: exampleVehicles.tur26Ember.massKg + 10 };
    const lighter = { ...exampleVehicles.tur26Ember, massKg: exampleVehicles.tur26Ember.massKg - 10 };
    const first = await engineer.put(`/api/teams/${teamId}/vehicles/${v.id}/data`).send({ data: heavier, baseRevision: 1, message: 'ballast' });
    expect(first.status).toBe(200);
    expect(first.body.revision).toBe(2);
    const stale = await engineer.put(`/api/teams/${teamId}/vehicles/${v.id}/data`).send({ data: lighter, baseRevision: 1 });
    expectError(stale, 409, 'stale_revision');
    expect(stale.body.error.details.current.revision).toBe(2);
    expect(stale.body.error.details.current.data.massKg).toBe(heavier.massKg);
    const now = await engineer.get(`/api/teams/${teamId}/vehicles/${v.id}`).expect(200);
    expect(now.body.data.massKg).toBe(heavier.massKg);
    const revs = await engineer.get(`/api/teams/${teamId}/vehicles/${v.id}/revisions`).expect(200);
    expect(revs.body.map((r: { revision: number; message: string; authorName: string }) => [r.revision, r.message, r.authorName])).toEqual([
      [2, 'ballast', 'Eli Marsh'],
      [1, 'Created', 'Eli Marsh'],
    ]);
    const r1 = await engineer.get(`/api/teams/${teamId}/vehicles/${v.id}/revisions/1`).expect(200);
    expect(r1.body.data.massKg).toBe(exampleVehicles.tur26Ember.massKg);
    expectError(await engineer.get(`/api/teams/${teamId}/vehicles/${v.id}/revisions/9`), 404, 'not_found');
  });

  it('concurrent writes on the same base: exactly one wins', async () => {
    const v = (await engineer.post(`/api/teams/${teamId}/vehicles`).send({ name: 'Race', data: exampleVehicles.tur26Ember }).expect(201)).body;
    const results = await Promise.all(
      [1, 2, 3, 4].map((i) =>
        engineer.put(`/api/teams/${teamId}/vehicles/${v.id}/data`).send({ data: { ...exampleVehicles.tur26Ember, massKg: 200 + i }, baseRevision: 1 }),
      ),
    );
    expect(results.map((r) => r.status).sort()).toEqual([200, 409, 409, 409]);
    const revs = await engineer.get(`/api/teams/${teamId}/vehicles/${v.id}/revisions`).expect(200);
    expect(revs.body).toHaveLength(2);
  });

  it('rename and archive need baseRevision; archived vehicles are hidden unless asked for', async () => {
    const v = (await owner.post(`/api/teams/${teamId}/vehicles`).send({ name: 'Old mule' }).expect(201)).body;
    expectError(await owner.patch(`/api/teams/${teamId}/vehicles/${v.id}`).send({ archived: true }), 400, 'invalid_input');
    expectError(await owner.patch(`/api/teams/${teamId}/vehicles/${v.id}`).send({ baseRevision: 1 }), 400, 'invalid_input');
    const r = await owner.patch(`/api/teams/${teamId}/vehicles/${v.id}`).send({ name: 'Old mule (retired)', archived: true, baseRevision: 1 }).expect(200);
    expect(r.body).toMatchObject({ name: 'Old mule (retired)', archived: true, revision: 2 });
    const active = await owner.get(`/api/teams/${teamId}/vehicles`).expect(200);
    expect(active.body.some((x: { id: string }) => x.id === v.id)).toBe(false);
    const all = await owner.get(`/api/teams/${teamId}/vehicles?archived=true`).expect(200);
    expect(all.body.some((x: { id: string }) => x.id === v.id)).toBe(true);
    expectError(await owner.get(`/api/teams/${teamId}/vehicles?archived=maybe`), 400, 'invalid_input');
  });

  it('a stored document of an older format (no formatVersion) is upgraded when read', async () => {
    const v = (await engineer.post(`/api/teams/${teamId}/vehicles`).send({ name: 'Legacy', data: exampleVehicles.tur26Ember }).expect(201)).body;
    const { formatVersion: _dropped, ...legacy } = exampleVehicles.tur26Ember as Record<string, unknown>;
    await t.db.pool.query('UPDATE vehicles SET data = $1 WHERE id = $2', [JSON.stringify(legacy), v.id]);
    const raw = await t.db.pool.query('SELECT data FROM vehicles WHERE id = $1', [v.id]);
    expect(raw.rows[0].data.formatVersion).toBeUndefined();
    const r = await engineer.get(`/api/teams/${teamId}/vehicles/${v.id}`).expect(200);
    expect(r.body.data.formatVersion).toBe(1);
    expect(r.body.data.massKg).toBe(exampleVehicles.tur26Ember.massKg);
  });

  it("another team's vehicle is 404 through this team's path", async () => {
    expectError(await engineer.get(`/api/teams/${teamId}/vehicles/${otherTeamVehicleId}`), 404, 'not_found');
    expectError(await engineer.put(`/api/teams/${teamId}/vehicles/${otherTeamVehicleId}/data`).send({ data: exampleVehicles.tur26Ember, baseRevision: 1 }), 404, 'not_found');
  });
});

describe('axle designs', () => {
  async function emberId(): Promise<string> {
    const r = await designer.get(`/api/teams/${teamId}/vehicles`).expect(200);
    return r.body.find((v: { name: string }) => v.name === 'TUR-26 Ember').id;
  }

  it('lists the seeded front and rear variants', async () => {
    const r = await designer.get(`/api/teams/${teamId}/vehicles/${await emberId()}/axle-designs`).expect(200);
    expect(r.body.map((d: { axle: string; name: string }) => `${d.axle}: ${d.name}`)).toEqual([
      'front: Front baseline',
      'rear: Rear baseline',
      'rear: Rear, toe link inner +6 mm',
    ]);
    expect(r.body[0]).toMatchObject({ revision: 1, status: 'draft' });
  });

  it('creates a design with a validated corner and reads it back', async () => {
    const vehicleId = await emberId();
    const r = await designer.post(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'front', name: 'Front, lower tie rod', corner: exampleCorners.fsFrontWishbone });
    expect(r.status).toBe(201);
    const got = await designer.get(`/api/teams/${teamId}/axle-designs/${r.body.id}`).expect(200);
    expect(got.body).toMatchObject({ vehicleId, axle: 'front', name: 'Front, lower tie rod', revision: 1, status: 'draft', updatedByName: 'Dana Quist' });
    expect(got.body.corner.points.tieRodInner).toEqual(exampleCorners.fsFrontWishbone.points.tieRodInner);
  });

  it('refuses a broken corner naming the point, and a bad axle', async () => {
    const vehicleId = await emberId();
    const broken = structuredClone(exampleCorners.fsFrontWishbone) as { points: Record<string, number[]> };
    broken.points['tieRodOuter'] = [...broken.points['tieRodInner']!];
    const r = await designer.post(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'front', name: 'Broken', corner: broken });
    expectError(r, 400, 'invalid_input');
    expect(JSON.stringify(r.body.error.details.fields)).toContain('tieRodOuter');
    expectError(await designer.post(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'middle', name: 'X', corner: exampleCorners.fsFrontWishbone }), 400, 'invalid_input');
  });

  it('a hardpoint edit makes a new revision; a stale one is 409 and the newer geometry survives', async () => {
    const vehicleId = await emberId();
    const d = (await designer.post(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'rear', name: 'Rear study', corner: exampleCorners.fsRearWishbone }).expect(201)).body;
    const raised = structuredClone(exampleCorners.fsRearWishbone);
    raised.points.tieRodInner = [raised.points.tieRodInner[0], raised.points.tieRodInner[1], raised.points.tieRodInner[2] + 3];
    const ok = await designer.put(`/api/teams/${teamId}/axle-designs/${d.id}/corner`).send({ corner: raised, baseRevision: 1, message: 'raise 3 mm' });
    expect(ok.status).toBe(200);
    expect(ok.body.revision).toBe(2);
    const stale = await designer.put(`/api/teams/${teamId}/axle-designs/${d.id}/corner`).send({ corner: exampleCorners.fsRearWishbone, baseRevision: 1 });
    expectError(stale, 409, 'stale_revision');
    expect(stale.body.error.details.current.corner.points.tieRodInner[2]).toBe(raised.points.tieRodInner[2]);
    const revs = await designer.get(`/api/teams/${teamId}/axle-designs/${d.id}/revisions`).expect(200);
    expect(revs.body.map((r: { revision: number }) => r.revision)).toEqual([2, 1]);
    const first = await designer.get(`/api/teams/${teamId}/axle-designs/${d.id}/revisions/1`).expect(200);
    expect(first.body.corner.points.tieRodInner).toEqual(exampleCorners.fsRearWishbone.points.tieRodInner);
  });

  it("another team's design is 404", async () => {
    const teams = (await engineer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
    const b = teams.find((x) => x.slug === 'brackenfield')!.id;
    const bVehicle = (await engineer.get(`/api/teams/${b}/vehicles`).expect(200)).body[0].id;
    const bDesign = (await engineer.get(`/api/teams/${b}/vehicles/${bVehicle}/axle-designs`).expect(200)).body[0].id;
    expectError(await engineer.get(`/api/teams/${teamId}/axle-designs/${bDesign}`), 404, 'not_found');
    expectError(await engineer.get(`/api/teams/${teamId}/vehicles/${bVehicle}/axle-designs`), 404, 'not_found');
  });
});
