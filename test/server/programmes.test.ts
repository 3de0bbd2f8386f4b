/**
 * Programmes: visibility across teams before and after a team accepts, the
 * instructor reads and never writes, the board with key figures (checked
 * against direct engine calls), snapshots and their CSV export.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { analyseConfiguration } from '../../shared/configuration/analyse.js';
import { expectError, idOf, registerUser, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let ana: Agent, bo: Agent, eli: Agent, dana: Agent, ravi: Agent, kit: Agent;
let tallowmere = '';
let brackenfield = '';

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  [ana, bo, eli, dana, ravi, kit] = await Promise.all(
    [
      'owner@tallowmere.example',
      'owner@brackenfield.example',
      'engineer@tallowmere.example',
      'designer@tallowmere.example',
      'reviewer@tallowmere.example',
      'reviewer@brackenfield.example',
    ].map((e) => signIn(t.app, e)),
  ) as [Agent, Agent, Agent, Agent, Agent, Agent];
  tallowmere = await idOf(eli, '/api/teams', 'tallowmere');
  brackenfield = await idOf(eli, '/api/teams', 'brackenfield');
});
afterAll(async () => {
  await t?.close();
});

/**
 * An instructor of this test's own (a registered person made an instructor, as the demo's is by its seed):
 * each test has its own, so what one test's teams accepted is never what another's instructor sees.
 */
async function newInstructor(): Promise<Agent> {
  const { agent, id } = await registerUser(t.app, 'Iris Calder');
  await t.db.pool.query('UPDATE users SET instructor = true WHERE id = $1', [id]);
  return agent;
}

/** A programme of `instructor` on `trackProfile` with the teams invited (by slug); returns its id. */
async function programmeOf(instructor: Agent, name: string, slugs: string[], trackProfile = 'bumpy-circuit'): Promise<string> {
  const id = (await instructor.post('/api/programmes').send({ name, trackProfile }).expect(201)).body.id as string;
  for (const teamSlug of slugs) await instructor.post(`/api/programmes/${id}/teams`).send({ teamSlug }).expect(201);
  return id;
}

async function configurationOf(by: Agent, teamId: string, vehicleName: string, name: string): Promise<string> {
  const v = await idOf(by, `/api/teams/${teamId}/vehicles`, vehicleName);
  const ds = (await by.get(`/api/teams/${teamId}/vehicles/${v}/axle-designs`).expect(200)).body as { id: string; axle: string }[];
  const r = await by
    .post(`/api/teams/${teamId}/configurations`)
    .send({ name, vehicleId: v, frontDesignId: ds.find((d) => d.axle === 'front')!.id, rearDesignId: ds.find((d) => d.axle === 'rear')!.id, trackProfile: 'smooth-circuit' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return r.body.id;
}

/**
 * A programme both demo teams have accepted, with a configuration of each made for it (named with `tag`, so a
 * test counts only its own among the teams' others): Tallowmere's submitted and signed off, Brackenfield's a draft.
 */
async function boardWithTwoEntries(tag: string): Promise<{ instructor: Agent; programmeId: string; names: Set<string>; emberId: string }> {
  const instructor = await newInstructor();
  const programmeId = await programmeOf(instructor, `Roll-steer study ${tag}`, ['tallowmere', 'brackenfield']);
  await ana.post(`/api/teams/${tallowmere}/programmes/${programmeId}/accept`).send({}).expect(200);
  await bo.post(`/api/teams/${brackenfield}/programmes/${programmeId}/accept`).send({}).expect(200);
  const ember = `Ember for the study ${tag}`;
  const b3 = `B3 for the study ${tag}`;
  const emberId = await configurationOf(dana, tallowmere, 'TUR-26 Ember', ember);
  await dana.post(`/api/teams/${tallowmere}/configurations/${emberId}/submit`).send({}).expect(200);
  // The sign-off carries a written reason for each Critical caution the gate names (the gate itself: review-gates.test.ts).
  const critical = (await ravi.get(`/api/teams/${tallowmere}/configurations/${emberId}/gates`).expect(200)).body.critical as { axle: string; code: string }[];
  const acknowledgements = critical.map((c) => ({ axle: c.axle, code: c.code, reason: 'accepted for the board test' }));
  await ravi.post(`/api/teams/${tallowmere}/configurations/${emberId}/approve`).send({ acknowledgements }).expect(200);
  await configurationOf(bo, brackenfield, 'Brackenfield B3 hatchback', b3);
  return { instructor, programmeId, names: new Set([ember, b3]), emberId };
}

describe('programmes', () => {
  it('only instructors create programmes and invite teams', async () => {
    const iris = await newInstructor();
    expectError(await ana.post('/api/programmes').send({ name: 'Not mine', trackProfile: 'smooth-circuit' }), 403, 'forbidden');
    const p = await iris.post('/api/programmes').send({ name: 'Autumn roll-steer study', trackProfile: 'bumpy-circuit' }).expect(201);
    const programmeId = p.body.id as string;
    await iris.post(`/api/programmes/${programmeId}/teams`).send({ teamSlug: 'tallowmere' }).expect(201);
    await iris.post(`/api/programmes/${programmeId}/teams`).send({ teamSlug: 'brackenfield' }).expect(201);
    expectError(await iris.post(`/api/programmes/${programmeId}/teams`).send({ teamSlug: 'tallowmere' }), 409, 'already_invited');
    expectError(await iris.post(`/api/programmes/${programmeId}/teams`).send({ teamSlug: 'no-such-team' }), 404, 'not_found');
    expectError(await ana.get(`/api/programmes/${programmeId}`), 404, 'not_found');
    const detail = await iris.get(`/api/programmes/${programmeId}`).expect(200);
    expect(detail.body.teams.map((x: { teamSlug: string; status: string }) => [x.teamSlug, x.status])).toEqual([
      ['brackenfield', 'invited'],
      ['tallowmere', 'invited'],
    ]);
  });

  it('the instructor sees a team only after its owner accepts, and then only reads', async () => {
    const iris = await newInstructor();
    const programmeId = await programmeOf(iris, 'Visibility study', ['tallowmere', 'brackenfield']);
    expectError(await iris.get(`/api/teams/${tallowmere}/vehicles`), 404, 'not_found');
    expect((await iris.get(`/api/programmes/${programmeId}/board`).expect(200)).body.rows).toEqual([]);
    const inv = (await ana.get(`/api/teams/${tallowmere}/programmes`).expect(200)).body as { programmeId: string }[];
    expect(inv.find((x) => x.programmeId === programmeId)).toMatchObject({ programmeId, name: 'Visibility study', instructorName: 'Iris Calder', status: 'invited' });
    expectError(await eli.post(`/api/teams/${tallowmere}/programmes/${programmeId}/accept`).send({}), 403, 'forbidden');
    await ana.post(`/api/teams/${tallowmere}/programmes/${programmeId}/accept`).send({}).expect(200);

    const vehicles = await iris.get(`/api/teams/${tallowmere}/vehicles`).expect(200);
    expect(vehicles.body.map((v: { name: string }) => v.name)).toContain('TUR-26 Ember');
    await iris.get(`/api/teams/${tallowmere}/configurations`).expect(200);
    // Writes are refused and nothing is created.
    const before = vehicles.body.length;
    expect((await iris.post(`/api/teams/${tallowmere}/vehicles`).send({ name: 'Instructor car' })).status).toBe(404);
    expect((await ana.get(`/api/teams/${tallowmere}/vehicles`).expect(200)).body).toHaveLength(before);
    // Brackenfield has not accepted: still invisible to her; and team members never see other teams.
    expectError(await iris.get(`/api/teams/${brackenfield}/vehicles`), 404, 'not_found');
    expectError(await kit.get(`/api/teams/${tallowmere}/vehicles`), 404, 'not_found');
    expectError(await kit.get(`/api/programmes/${programmeId}/board`), 404, 'not_found');
  });

  it('the board lists both teams’ configurations with key figures, latest and approved', async () => {
    const { instructor: iris, programmeId, names, emberId: tc } = await boardWithTwoEntries('(board)');

    const board = await iris.get(`/api/programmes/${programmeId}/board`).expect(200);
    expect(board.body.trackProfile).toBe('bumpy-circuit');
    // The demo seed's own configurations are on the board too; these checks are about the two made here.
    const rows = (board.body.rows as { teamName: string; configurationName: string; status: string; latest: { figures: Record<string, number> }; approved: { figures: Record<string, number>; trackProfile: string } | null }[]).filter((r) =>
      names.has(r.configurationName),
    );
    expect(rows.map((r) => [r.teamName, r.configurationName, r.status])).toEqual([
      ['Brackenfield Road Programme', 'B3 for the study (board)', 'draft'],
      ['Tallowmere University Racing', 'Ember for the study (board)', 'approved'],
    ]);
    expect(rows[0]!.approved).toBeNull();

    // The figures are the engines' own, for the same documents (direct calls).
    const inputs = (await iris.get(`/api/teams/${tallowmere}/configurations/${tc}/approvals`).expect(200)).body[0];
    const frozen = (await iris.get(`/api/teams/${tallowmere}/configurations/${tc}/approvals/${inputs.id}`).expect(200)).body.inputs;
    // The board's latest figures are on the programme's profile; the approved column on the configuration's own.
    const onBoard = analyseConfiguration({ vehicle: frozen.vehicle, frontCorner: frozen.frontCorner, rearCorner: frozen.rearCorner, trackProfile: 'bumpy-circuit' });
    const direct = onBoard.balance;
    const ember = rows[1]!;
    expect(ember.latest.figures.rollSteerRear).toBeCloseTo(direct.kinematicsLink.rear.used.rollSteerCoefficient, 12);
    expect(ember.latest.figures.rollSteerUndersteerDegPerG).toBeCloseTo(direct.understeerBudget.rollSteer, 12);
    expect(ember.latest.figures.bumpSteerFrontDegPerM).toBeCloseTo(onBoard.bumpSteer.front.bumpSteerDegPerM, 12);
    // The approved column is the frozen snapshot, on the configuration's own profile.
    expect(ember.approved!.trackProfile).toBe('smooth-circuit');
    expect(ember.approved!.figures.understeerGradientDegPerG).toBeCloseTo(direct.understeerBudget.total, 12);
  });

  it('a snapshot keeps the board as it was and exports as CSV', async () => {
    const { instructor: iris, programmeId, names } = await boardWithTwoEntries('(snapshot)');
    const madeHere = (rows: { configurationName: string }[]) => rows.filter((r) => names.has(r.configurationName));
    const snap = await iris.post(`/api/programmes/${programmeId}/snapshots`).send({ label: 'Deadline week 6' }).expect(201);
    // Later work does not change the snapshot.
    const late = 'B5 late entry (snapshot)';
    await configurationOf(bo, brackenfield, 'Brackenfield B5 estate', late);
    names.add(late);
    const again = await iris.get(`/api/programmes/${programmeId}/snapshots/${snap.body.id}`).expect(200);
    expect(madeHere(again.body.board.rows)).toHaveLength(2);
    expect(madeHere((await iris.get(`/api/programmes/${programmeId}/board`).expect(200)).body.rows)).toHaveLength(3);
    expect((await iris.get(`/api/programmes/${programmeId}/snapshots`).expect(200)).body.map((s: { label: string }) => s.label)).toEqual(['Deadline week 6']);

    const csv = await iris.get(`/api/programmes/${programmeId}/snapshots/${snap.body.id}`).query({ format: 'csv' }).expect(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    const [header, ...lines] = Papa.parse<string[]>(csv.text, { skipEmptyLines: true }).data;
    expect(header!.slice(0, 5)).toEqual(['team', 'configuration', 'status', 'latest_revision', 'latest_rollSteerFront']);
    expect(lines).toHaveLength(again.body.board.rows.length);
    expect(lines.filter((l) => names.has(l[1]!) && l[1] !== late)).toHaveLength(2);
    const ember = lines.find((l) => l[1] === 'Ember for the study (snapshot)')!;
    const row = again.body.board.rows.find((r: { configurationName: string }) => r.configurationName === 'Ember for the study (snapshot)');
    expect(Number(ember[header!.indexOf('latest_rollSteerRear')])).toBe(row.latest.figures.rollSteerRear);
    expect(ember[header!.indexOf('approved_revision')]).toBe('1');
    // In the reader's units: bump steer per inch for inch-pound (1 in = 0.0254 m exactly, NIST SP 811), the column named so.
    const inch = await iris.get(`/api/programmes/${programmeId}/snapshots/${snap.body.id}`).query({ format: 'csv', units: 'imperial' }).expect(200);
    const [inchHeader, ...inchLines] = Papa.parse<string[]>(inch.text, { skipEmptyLines: true }).data;
    expect(inchHeader).toContain('latest_bumpSteerFrontDegPerIn');
    expect(inchHeader).not.toContain('latest_bumpSteerFrontDegPerM');
    const inchEmber = inchLines.find((l) => l[1] === 'Ember for the study (snapshot)')!;
    expect(row.latest.figures.bumpSteerFrontDegPerM).toEqual(expect.any(Number));
    expect(row.latest.figures.bumpSteerFrontDegPerM).not.toBe(0);
    expect(Number(inchEmber[inchHeader!.indexOf('latest_bumpSteerFrontDegPerIn')])).toBeCloseTo(row.latest.figures.bumpSteerFrontDegPerM * 0.0254, 12);
    expect(Number(inchEmber[inchHeader!.indexOf('latest_rollSteerRear')])).toBe(row.latest.figures.rollSteerRear);
    expectError(await iris.get(`/api/programmes/${programmeId}/snapshots/${snap.body.id}`).query({ format: 'csv', units: 'cubits' }), 400, 'invalid_input');
    expectError(await kit.get(`/api/programmes/${programmeId}/snapshots/${snap.body.id}`), 404, 'not_found');
  });
});
