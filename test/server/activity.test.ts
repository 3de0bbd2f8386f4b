/** Activity log per team and per design (UTC), and its CSV export with formula-injection protection that never alters numbers. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { toCsv } from '../../shared/io/csv.js';
import { addMember, agent, expectError, idOf, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let owner: Agent, engineer: Agent, designer: Agent, viewer: Agent;
let teamId = '';
let vehicleId = '';
let frontId = '';
const evil = '=HYPERLINK("http://attacker.example","click")';

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  owner = await signIn(t.app, 'owner@tallowmere.example');
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  designer = await signIn(t.app, 'designer@tallowmere.example');
  viewer = await signIn(t.app, 'viewer@tallowmere.example');
  teamId = await idOf(owner, '/api/teams', 'tallowmere');
  vehicleId = await idOf(owner, `/api/teams/${teamId}/vehicles`, 'TUR-26 Ember');
  frontId = await idOf(owner, `/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`, 'Front baseline');

  // A little history: vehicle data, a hardpoint edit with a hostile message, a configuration, a member change.
  await engineer.put(`/api/teams/${teamId}/vehicles/${vehicleId}/data`).send({ data: exampleVehicles.tur26Ember, baseRevision: 1, message: 'spring rates' }).expect(200);
  await designer.put(`/api/teams/${teamId}/axle-designs/${frontId}/corner`).send({ corner: exampleCorners.fsFrontWishbone, baseRevision: 1, message: evil }).expect(200);
  const rearId = await idOf(owner, `/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`, 'Rear baseline');
  const c = await designer
    .post(`/api/teams/${teamId}/configurations`)
    .send({ name: '-5 mm toe link', vehicleId, frontDesignId: frontId, rearDesignId: rearId, trackProfile: 'smooth-circuit' })
    .expect(201);
  await designer.post(`/api/teams/${teamId}/configurations/${c.body.id}/submit`).send({}).expect(200);
});
afterAll(async () => {
  await t?.close();
});

describe('activity log', () => {
  it('lists who changed what, newest first, with UTC times', async () => {
    const r = await viewer.get(`/api/teams/${teamId}/activity`).expect(200);
    const rows = r.body as { at: string; actorName: string; action: string; summary: string }[];
    expect(rows.slice(0, 4).map((x) => [x.actorName, x.action])).toEqual([
      ['Dana Quist', 'configuration.submit'],
      ['Dana Quist', 'configuration.create'],
      ['Dana Quist', 'design.corner'],
      ['Eli Marsh', 'vehicle.data'],
    ]);
    expect(rows[3]!.summary).toBe('Vehicle "TUR-26 Ember" revision 2: data changed (spring rates)');
    for (const x of rows) expect(x.at).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
    const type = await t.db.pool.query(`SELECT data_type FROM information_schema.columns WHERE table_name = 'activity_log' AND column_name = 'at'`);
    expect(type.rows[0].data_type).toBe('timestamp with time zone');
    // Paging: older than the newest entry.
    const older = await viewer.get(`/api/teams/${teamId}/activity`).query({ before: rows[0]!.at, limit: 2 }).expect(200);
    expect(older.body.map((x: { action: string }) => x.action)).toEqual(['configuration.create', 'design.corner']);
  });

  it('per design lists only that design’s history', async () => {
    const r = await viewer.get(`/api/teams/${teamId}/axle-designs/${frontId}/activity`).expect(200);
    expect(r.body.map((x: { action: string }) => x.action)).toEqual(['design.corner']);
    expect(r.body[0].summary).toContain('corner changed');
  });

  it('exports CSV: text that a spreadsheet would run is neutralised, numbers are untouched, local time on request', async () => {
    // Someone whose display name is a formula joins and leaves: their name is the actor cell.
    const sneaky = agent(t.app);
    await sneaky.post('/api/auth/register').send({ email: 'sneaky@test.example', password: 'long-enough-pass', displayName: '=2+5' }).expect(201);
    await addMember(t, owner, teamId, { agent: sneaky, email: 'sneaky@test.example' }, ['viewer']);
    await sneaky.delete(`/api/teams/${teamId}/membership`).expect(204);
    const r = await viewer.get(`/api/teams/${teamId}/activity`).query({ format: 'csv', timeZone: 'Asia/Tokyo' }).expect(200);
    expect(r.headers['content-type']).toMatch(/^text\/csv/);
    expect(r.headers['content-disposition']).toContain('activity.csv');
    const parsed = Papa.parse<string[]>(r.text.trim(), { skipEmptyLines: true });
    const [header, ...rows] = parsed.data;
    expect(header).toEqual(['at_utc', 'at_local (Asia/Tokyo)', 'actor', 'action', 'subject_type', 'subject_id', 'summary']);
    const corner = rows.find((x) => x[3] === 'design.corner')!;
    expect(corner[6]).toBe(`Axle design "Front baseline" revision 2: corner changed (${evil})`); // starts with "Axle": not a formula
    const left = rows.find((x) => x[3] === 'member.remove')!;
    expect(left[2]).toBe("'=2+5");
    expect(left[6]).toBe("'=2+5 left the team");
    const created = rows.find((x) => x[3] === 'configuration.create')!;
    expect(created[6]).toBe('Created configuration "-5 mm toe link"');
    // Tokyo is UTC+9 all year (no daylight saving; common knowledge).
    const utc = new Date(corner[0]!);
    const tokyo = new Date(utc.getTime() + 9 * 3_600_000).toISOString().replace('T', ' ').slice(0, 19);
    expect(corner[1]).toBe(tokyo);
    expectError(await viewer.get(`/api/teams/${teamId}/activity`).query({ format: 'csv', timeZone: 'Mars/Olympus' }), 400, 'invalid_input');
  });

  it('toCsv prefixes formula-like text with an apostrophe and never changes a number', () => {
    const csv = toCsv(['value', 'note'], [
      [-5, evil],
      [-0.25, '-3 mm'],
      [1e-7, '+1'],
      [42, '@SUM(A1:A2)'],
      [0, 'plain text'],
    ]);
    const rows = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data.slice(1);
    expect(rows.map((r) => r[0])).toEqual(['-5', '-0.25', '1e-7', '42', '0']);
    expect(rows.map((r) => r[1])).toEqual([`'${evil}`, "'-3 mm", "'+1", "'@SUM(A1:A2)", 'plain text']);
  });

  it('is the team’s only', async () => {
    const kit = await signIn(t.app, 'reviewer@brackenfield.example');
    expectError(await kit.get(`/api/teams/${teamId}/activity`), 404, 'not_found');
    const bId = (await kit.get('/api/teams').expect(200)).body[0].id;
    expectError(await kit.get(`/api/teams/${bId}/axle-designs/${frontId}/activity`), 404, 'not_found');
  });
});
