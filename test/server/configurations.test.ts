/**
 * Configurations under review: the state machine (every allowed and refused
 * transition, by role), no decision on one's own work (also after a role
 * change), the approval snapshot frozen against later edits with its
 * recompute difference, comparison of two configurations, and comment
 * threads pointing at results.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { computeBalance } from '../../shared/balance/api.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import { configurationApprovals } from '../../server/db/schema.js';
import { expectError, idOf, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let owner: Agent, engineer: Agent, designer: Agent, reviewer: Agent, viewer: Agent;
let teamId = '';
let vehicleId = '';
let frontId = '';
let rearId = '';
let rearPlus6Id = '';
let designerId = '';
let reviewerId = '';

const team = () => `/api/teams/${teamId}`;

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  owner = await signIn(t.app, 'owner@tallowmere.example');
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  designer = await signIn(t.app, 'designer@tallowmere.example');
  reviewer = await signIn(t.app, 'reviewer@tallowmere.example');
  viewer = await signIn(t.app, 'viewer@tallowmere.example');
  teamId = await idOf(owner, '/api/teams', 'tallowmere');
  vehicleId = await idOf(owner, `${team()}/vehicles`, 'TUR-26 Ember');
  const designs = (await owner.get(`${team()}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  frontId = designs.find((d) => d.name === 'Front baseline')!.id;
  rearId = designs.find((d) => d.name === 'Rear baseline')!.id;
  rearPlus6Id = designs.find((d) => d.name === 'Rear, toe link inner +6 mm')!.id;
  const members = (await owner.get(`${team()}/members`).expect(200)).body as { email: string; userId: string }[];
  designerId = members.find((m) => m.email === 'designer@tallowmere.example')!.userId;
  reviewerId = members.find((m) => m.email === 'reviewer@tallowmere.example')!.userId;
});
afterAll(async () => {
  await t?.close();
});

async function newConfiguration(by: Agent, name: string, rear = rearId): Promise<string> {
  const r = await by.post(`${team()}/configurations`).send({ name, vehicleId, frontDesignId: frontId, rearDesignId: rear, trackProfile: 'smooth-circuit' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return r.body.id as string;
}

/**
 * A review step. A sign-off carries a written reason for each Critical caution the gate names and a move
 * to validated a waiver per axle (the gates are tested in review-gates.test.ts; here they are met).
 */
function act(who: Agent, id: string, action: string, body: object = {}) {
  const url = `${team()}/configurations/${id}`;
  const run = (async () => {
    let gate = {};
    if (action === 'approve') {
      const critical = (await who.get(`${url}/gates`)).body.critical as { axle: string; code: string }[] | undefined;
      gate = { acknowledgements: (critical ?? []).map((c) => ({ axle: c.axle, code: c.code, reason: 'accepted for this test' })) };
    }
    if (action === 'validate') gate = { waivers: ['front', 'rear'].map((axle) => ({ axle, reason: 'validated on track for this test' })) };
    return who.post(`${url}/${action}`).send({ ...gate, ...body });
  })();
  return Object.assign(run, {
    expect: async (status: number) => {
      const r = await run;
      expect(r.status, JSON.stringify(r.body)).toBe(status);
      return r;
    },
  });
}

describe('configurations', () => {
  it('a configuration pins one vehicle revision, one front and one rear design revision and a track profile', async () => {
    const r = await designer
      .post(`${team()}/configurations`)
      .send({ name: 'Ember baseline', vehicleId, frontDesignId: frontId, rearDesignId: rearId, trackProfile: 'bumpy-circuit', message: 'first look' });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body).toMatchObject({
      name: 'Ember baseline',
      status: 'draft',
      revision: 1,
      vehicle: { id: vehicleId, name: 'TUR-26 Ember', revision: 1 },
      front: { designId: frontId, name: 'Front baseline', revision: 1 },
      rear: { designId: rearId, name: 'Rear baseline', revision: 1 },
      trackProfile: 'bumpy-circuit',
      updatedByName: 'Dana Quist',
    });
    const list = await viewer.get(`${team()}/configurations`).expect(200);
    expect(list.body.map((c: { id: string }) => c.id)).toContain(r.body.id);
    const revs = await viewer.get(`${team()}/configurations/${r.body.id}/revisions`).expect(200);
    expect(revs.body).toHaveLength(1);
    expect(revs.body[0]).toMatchObject({ revision: 1, message: 'first look', authorName: 'Dana Quist' });
  });

  it('refuses designs of the wrong axle or another vehicle, unknown revisions and unknown track profiles', async () => {
    const base = { name: 'Bad', vehicleId, frontDesignId: frontId, rearDesignId: rearId, trackProfile: 'smooth-circuit' };
    expectError(await designer.post(`${team()}/configurations`).send({ ...base, frontDesignId: rearId }), 400, 'invalid_input');
    expectError(await designer.post(`${team()}/configurations`).send({ ...base, rearDesignRevision: 99 }), 404, 'not_found');
    expectError(await designer.post(`${team()}/configurations`).send({ ...base, trackProfile: 'moon-base' }), 400, 'invalid_input');
    const cinder = await idOf(owner, `${team()}/vehicles`, 'TUR-25 Cinder');
    expectError(await designer.post(`${team()}/configurations`).send({ ...base, vehicleId: cinder }), 404, 'not_found');
    const blank = await engineer.post(`${team()}/vehicles`).send({ name: 'No data yet' }).expect(201);
    const f = await designer.post(`${team()}/vehicles/${blank.body.id}/axle-designs`).send({ axle: 'front', name: 'F', corner: exampleCorners.fsFrontWishbone }).expect(201);
    const rr = await designer.post(`${team()}/vehicles/${blank.body.id}/axle-designs`).send({ axle: 'rear', name: 'R', corner: exampleCorners.fsRearWishbone }).expect(201);
    expectError(
      await designer.post(`${team()}/configurations`).send({ ...base, vehicleId: blank.body.id, frontDesignId: f.body.id, rearDesignId: rr.body.id }),
      409,
      'incomplete_configuration',
    );
  });

  it('state machine: every transition allowed only from its state and to its role', async () => {
    const id = await newConfiguration(designer, 'State walk');
    const status = async () => (await viewer.get(`${team()}/configurations/${id}`).expect(200)).body.status as string;

    // draft: only submit, and only by engineer or designer
    expectError(await act(designer, id, 'withdraw'), 409, 'invalid_transition');
    for (const a of ['approve', 'release', 'validate']) expectError(await act(reviewer, id, a), 409, 'invalid_transition');
    expectError(await act(reviewer, id, 'request-changes', { message: 'x' }), 409, 'invalid_transition');
    for (const who of [owner, reviewer, viewer]) expectError(await act(who, id, 'submit'), 403, 'forbidden');
    expect((await act(engineer, id, 'submit').expect(200)).body.status).toBe('in_review');

    // in review: decisions by the reviewer only; withdraw by engineer/designer; submit again refused
    expectError(await act(designer, id, 'submit'), 409, 'invalid_transition');
    for (const who of [owner, engineer, designer, viewer]) expectError(await act(who, id, 'approve'), 403, 'forbidden');
    for (const who of [owner, engineer, designer, viewer]) expectError(await act(who, id, 'request-changes', { message: 'x' }), 403, 'forbidden');
    expectError(await act(reviewer, id, 'release'), 409, 'invalid_transition');
    expectError(await act(reviewer, id, 'validate'), 409, 'invalid_transition');
    expectError(await act(reviewer, id, 'withdraw'), 403, 'forbidden');
    expect((await act(designer, id, 'withdraw').expect(200)).body.status).toBe('draft');
    await act(designer, id, 'submit').expect(200);
    expectError(await act(reviewer, id, 'request-changes', {}), 400, 'invalid_input');
    expect((await act(reviewer, id, 'request-changes', { message: 'rear ε too small' }).expect(200)).body.status).toBe('changes_requested');

    // changes requested: the designer revises first (back to draft), nothing else moves it
    for (const a of ['submit', 'withdraw']) expectError(await act(designer, id, a), 409, 'invalid_transition');
    for (const a of ['approve', 'release', 'validate']) expectError(await act(reviewer, id, a), 409, 'invalid_transition');
    const revised = await designer.put(`${team()}/configurations/${id}`).send({ baseRevision: 1, rearDesignId: rearPlus6Id, message: 'toe link +6 mm' }).expect(200);
    expect(revised.body).toMatchObject({ status: 'draft', revision: 2, rear: { designId: rearPlus6Id, revision: 1 } });
    await act(designer, id, 'submit').expect(200);
    // A decision on a revision the reviewer did not look at is stale.
    expectError(await act(reviewer, id, 'approve', { revision: 1 }), 409, 'stale_revision');
    expect((await act(reviewer, id, 'approve', { revision: 2, message: 'good' }).expect(200)).body.status).toBe('approved');

    // approved → released → validated, by the reviewer
    expectError(await act(reviewer, id, 'approve'), 409, 'invalid_transition');
    expectError(await act(reviewer, id, 'validate'), 409, 'invalid_transition');
    for (const who of [owner, engineer, designer, viewer]) expectError(await act(who, id, 'release'), 403, 'forbidden');
    expect((await act(reviewer, id, 'release').expect(200)).body.status).toBe('released');
    for (const who of [owner, engineer, designer, viewer]) expectError(await act(who, id, 'validate'), 403, 'forbidden');
    expect((await act(reviewer, id, 'validate', { message: 'rig run 3 agrees' }).expect(200)).body.status).toBe('validated');
    for (const a of ['submit', 'withdraw']) expectError(await act(designer, id, a), 409, 'invalid_transition');
    for (const a of ['approve', 'release', 'validate']) expectError(await act(reviewer, id, a), 409, 'invalid_transition');
    expect(await status()).toBe('validated');

    const history = (await viewer.get(`${team()}/configurations/${id}/history`).expect(200)).body as { fromStatus: string; toStatus: string; actorName: string }[];
    expect(history.map((h) => `${h.fromStatus}>${h.toStatus}`)).toEqual([
      'draft>in_review',
      'in_review>draft',
      'draft>in_review',
      'in_review>changes_requested',
      'changes_requested>draft',
      'draft>in_review',
      'in_review>approved',
      'approved>released',
      'released>validated',
    ]);
    expect(history[6]!.actorName).toBe('Ravi Osei');

    // A new revision after approval starts a new draft; the approval stays with its revision.
    const again = await designer.put(`${team()}/configurations/${id}`).send({ baseRevision: 2, name: 'State walk, rev 3' }).expect(200);
    expect(again.body).toMatchObject({ status: 'draft', revision: 3 });
    const approvals = await viewer.get(`${team()}/configurations/${id}/approvals`).expect(200);
    expect(approvals.body).toHaveLength(1);
    expect(approvals.body[0]).toMatchObject({ revision: 2, approvedByName: 'Ravi Osei', engineVersion: ENGINE_VERSION, message: 'good' });
  });

  it('nobody decides on their own work, also after being given the reviewer role', async () => {
    const id = await newConfiguration(designer, 'Own work');
    await act(designer, id, 'submit').expect(200);
    // Dana gets the reviewer role as well: she may now decide, but not on her own configuration.
    await owner.patch(`${team()}/members/${designerId}`).send({ roles: ['designer', 'reviewer'] }).expect(200);
    try {
      expectError(await act(designer, id, 'approve'), 403, 'own_revision');
      expectError(await act(designer, id, 'request-changes', { message: 'me' }), 403, 'own_revision');
      // A configuration by someone else, but on a design revision Dana authored, is hers too.
      const d = await designer.get(`${team()}/axle-designs/${frontId}`).expect(200);
      await designer.put(`${team()}/axle-designs/${frontId}/corner`).send({ corner: exampleCorners.fsFrontWishbone, baseRevision: d.body.revision, message: 'same geometry, new revision' }).expect(200);
      const other = await newConfiguration(engineer, 'Uses Dana’s front');
      await act(engineer, other, 'submit').expect(200);
      expectError(await act(designer, other, 'approve'), 403, 'own_revision');
      // Ravi authored none of it and may decide.
      await act(reviewer, other, 'approve').expect(200);
      await act(reviewer, other, 'release').expect(200);
      expectError(await act(designer, other, 'validate'), 403, 'own_revision');
    } finally {
      await owner.patch(`${team()}/members/${designerId}`).send({ roles: ['designer'] }).expect(200);
    }
    // Ravi given the designer role edits the rear design: from then on he cannot decide on configurations using it.
    await owner.patch(`${team()}/members/${reviewerId}`).send({ roles: ['reviewer', 'designer'] }).expect(200);
    try {
      const rd = await reviewer.get(`${team()}/axle-designs/${rearId}`).expect(200);
      await reviewer.put(`${team()}/axle-designs/${rearId}/corner`).send({ corner: exampleCorners.fsRearWishbone, baseRevision: rd.body.revision }).expect(200);
      const c = await newConfiguration(engineer, 'Uses Ravi’s rear');
      await act(engineer, c, 'submit').expect(200);
      expectError(await act(reviewer, c, 'approve'), 403, 'own_revision');
    } finally {
      await owner.patch(`${team()}/members/${reviewerId}`).send({ roles: ['reviewer'] }).expect(200);
    }
  });

  it('the four-eyes rule covers every revision of the current review round, not only the latest', async () => {
    // Ravi, given the designer role for a moment, writes revision 1; Dana renames it (revision 2) and submits.
    await owner.patch(`${team()}/members/${reviewerId}`).send({ roles: ['reviewer', 'designer'] }).expect(200);
    let id = '';
    try {
      id = await newConfiguration(reviewer, 'Ravi wrote the first', rearPlus6Id); // a rear design Ravi never edited
    } finally {
      await owner.patch(`${team()}/members/${reviewerId}`).send({ roles: ['reviewer'] }).expect(200);
    }
    const c = (await designer.get(`${team()}/configurations/${id}`).expect(200)).body;
    await designer
      .put(`${team()}/configurations/${id}`)
      .send({ name: 'Renamed by Dana', vehicleId, frontDesignId: frontId, rearDesignId: rearPlus6Id, trackProfile: 'smooth-circuit', baseRevision: c.revision })
      .expect(200);
    await act(designer, id, 'submit').expect(200);
    expectError(await act(reviewer, id, 'approve'), 403, 'own_revision');
    expectError(await act(reviewer, id, 'request-changes', { message: 'mine' }), 403, 'own_revision');
    // Vera, made a reviewer, wrote nothing of it and decides: changes requested ends the round.
    const vera = (await owner.get(`${team()}/members`).expect(200)).body.find((m: { email: string }) => m.email === 'viewer@tallowmere.example').userId;
    await owner.patch(`${team()}/members/${vera}`).send({ roles: ['viewer', 'reviewer'] }).expect(200);
    try {
      const rc = await act(viewer, id, "request-changes", { message: "round one done" });
      expect(rc.status, JSON.stringify(rc.body)).toBe(200);
      // Round two: only Dana's new revision is in it, so Ravi may now decide.
      const now = (await designer.get(`${team()}/configurations/${id}`).expect(200)).body;
      await designer
        .put(`${team()}/configurations/${id}`)
        .send({ name: 'Renamed again', vehicleId, frontDesignId: frontId, rearDesignId: rearPlus6Id, trackProfile: 'smooth-circuit', baseRevision: now.revision })
        .expect(200);
      await act(designer, id, 'submit').expect(200);
      const ok = await act(reviewer, id, 'approve');
      expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    } finally {
      await owner.patch(`${team()}/members/${vera}`).send({ roles: ['viewer'] }).expect(200);
    }
  });

  it('the approval snapshot stays as approved after later edits; a recompute difference is shown beside it', async () => {
    const designNow = (await designer.get(`${team()}/axle-designs/${rearPlus6Id}`).expect(200)).body;
    const id = await newConfiguration(designer, 'Frozen', rearPlus6Id);
    await act(designer, id, 'submit').expect(200);
    await act(reviewer, id, 'approve').expect(200);
    const [approval] = (await viewer.get(`${team()}/configurations/${id}/approvals`).expect(200)).body;
    const first = await viewer.get(`${team()}/configurations/${id}/approvals/${approval.id}`).expect(200);
    // The frozen balance is what the balance engine gives for the same documents (independent call).
    const direct = computeBalance({ vehicle: exampleVehicles.tur26Ember, frontCorner: first.body.inputs.frontCorner, rearCorner: designNow.corner });
    expect(first.body.results.balance.understeerBudget.total).toBeCloseTo(direct.understeerBudget.total, 12);
    expect(first.body.inputs.rearCorner).toEqual(designNow.corner);
    expect(first.body.recompute).toEqual({ engineVersion: ENGINE_VERSION, differences: [] });

    // Later edits: the designer moves the rear toe link, the configuration is revised to it.
    const moved = structuredClone(designNow.corner);
    moved.points.tieRodInner[2] += 3;
    await designer.put(`${team()}/axle-designs/${rearPlus6Id}/corner`).send({ corner: moved, baseRevision: designNow.revision }).expect(200);
    await designer.put(`${team()}/configurations/${id}`).send({ baseRevision: 1, rearDesignRevision: designNow.revision + 1 }).expect(200);
    const later = await viewer.get(`${team()}/configurations/${id}/approvals/${approval.id}`).expect(200);
    expect(later.body.inputs).toEqual(first.body.inputs);
    expect(later.body.results).toEqual(first.body.results);
    expect(later.body.approvedAt).toBe(first.body.approvedAt);

    // A snapshot frozen by an older engine (simulated by writing its figures as an older engine would have left them).
    const frozen = structuredClone(first.body.results);
    frozen.balance.understeerBudget.total += 0.05;
    await t.db.orm.update(configurationApprovals).set({ results: frozen, engineVersion: '0.0.9' }).where(eq(configurationApprovals.id, approval.id));
    const old = await viewer.get(`${team()}/configurations/${id}/approvals/${approval.id}`).expect(200);
    expect(old.body.engineVersion).toBe('0.0.9');
    expect(old.body.results.balance.understeerBudget.total).toBe(frozen.balance.understeerBudget.total);
    expect(old.body.recompute.engineVersion).toBe(ENGINE_VERSION);
    const d = old.body.recompute.differences as { path: string; a: number; b: number; change: number }[];
    expect(d.map((x) => x.path)).toEqual(['balance.understeerBudget.total']);
    expect(d[0]!.a).toBe(frozen.balance.understeerBudget.total);
    expect(d[0]!.b).toBe(first.body.results.balance.understeerBudget.total);
    expect(d[0]!.change).toBeCloseTo(-0.05, 12);
  });

  it('compares two configurations: changed inputs and changed results side by side', async () => {
    const a = await newConfiguration(designer, 'Compare A', rearId);
    const b = await newConfiguration(designer, 'Compare B', rearPlus6Id);
    const r = await viewer.get(`${team()}/configurations/compare`).query({ a, b }).expect(200);
    const rearCornerA = (await viewer.get(`${team()}/axle-designs/${rearId}`).expect(200)).body.corner;
    const rearCornerB = (await viewer.get(`${team()}/axle-designs/${rearPlus6Id}`).expect(200)).body.corner;
    const frontCorner = (await viewer.get(`${team()}/axle-designs/${frontId}`).expect(200)).body.corner;
    const inputs = r.body.inputs as { path: string; a: unknown; b: unknown; change?: number }[];
    // The two rear designs differ only in the toe link's inner height (seeded +6 mm, moved again by an earlier test).
    expect(inputs).toEqual([
      {
        path: 'rearCorner.points.tieRodInner[2]',
        a: rearCornerA.points.tieRodInner[2],
        b: rearCornerB.points.tieRodInner[2],
        change: rearCornerB.points.tieRodInner[2] - rearCornerA.points.tieRodInner[2],
      },
    ]);
    expect(inputs[0]!.change).toBeGreaterThanOrEqual(6);
    const results = r.body.results as { path: string; a: number; b: number }[];
    const rs = results.find((x) => x.path === 'balance.understeerBudget.rollSteer');
    const ba = computeBalance({ vehicle: exampleVehicles.tur26Ember, frontCorner, rearCorner: rearCornerA });
    const bb = computeBalance({ vehicle: exampleVehicles.tur26Ember, frontCorner, rearCorner: rearCornerB });
    expect(rs).toBeDefined();
    expect(rs!.a).toBeCloseTo(ba.understeerBudget.rollSteer, 12);
    expect(rs!.b).toBeCloseTo(bb.understeerBudget.rollSteer, 12);
    expect(results.some((x) => x.path.startsWith('bumpSteer.rear.'))).toBe(true);
    expect(results.some((x) => x.path.startsWith('bumpSteer.front.'))).toBe(false);
    // Same configuration against itself: nothing changed.
    const same = await viewer.get(`${team()}/configurations/compare`).query({ a, b: a }).expect(200);
    expect(same.body.inputs).toEqual([]);
    expect(same.body.results).toEqual([]);
    expectError(await viewer.get(`${team()}/configurations/compare`).query({ a }), 400, 'invalid_input');
  });

  it('comment threads point at results and can be resolved', async () => {
    const id = await newConfiguration(designer, 'Discussed');
    const c = await reviewer.post(`${team()}/configurations/${id}/comments`).send({ body: 'Rear roll-steer term looks small', resultRef: 'budget' }).expect(201);
    expect(c.body).toMatchObject({ resultRef: 'budget', revision: 1, parentId: null });
    await designer.post(`${team()}/configurations/${id}/comments`).send({ body: 'Raising the toe link next', parentId: c.body.id }).expect(201);
    await reviewer.post(`${team()}/configurations/${id}/comments`).send({ body: 'Check the bump caution', resultRef: 'caution:bump-toe-change' }).expect(201);
    expectError(await reviewer.post(`${team()}/configurations/${id}/comments`).send({ body: 'x', resultRef: 'javascript:alert(1)' }), 400, 'invalid_input');
    expectError(await viewer.post(`${team()}/configurations/${id}/comments`).send({ body: 'viewers only read' }), 403, 'forbidden');
    const reply = (await viewer.get(`${team()}/configurations/${id}/comments`).expect(200)).body[0].replies[0];
    expectError(await designer.post(`${team()}/configurations/${id}/comments`).send({ body: 'nested', parentId: reply.id }), 400, 'invalid_input');
    expectError(await reviewer.post(`${team()}/configurations/${id}/comments/${reply.id}/resolve`).send({}), 404, 'not_found');
    await reviewer.post(`${team()}/configurations/${id}/comments/${c.body.id}/resolve`).send({}).expect(200);
    const threads = (await viewer.get(`${team()}/configurations/${id}/comments`).expect(200)).body as { body: string; resolved: boolean; replies: { body: string; authorName: string }[] }[];
    expect(threads.map((x) => [x.body, x.resolved])).toEqual([
      ['Rear roll-steer term looks small', true],
      ['Check the bump caution', false],
    ]);
    expect(threads[0]!.replies.map((x) => x.authorName)).toEqual(['Dana Quist']);
    await designer.post(`${team()}/configurations/${id}/comments/${c.body.id}/reopen`).send({}).expect(200);
    expect((await viewer.get(`${team()}/configurations/${id}/comments`).expect(200)).body[0].resolved).toBe(false);
  });

  it('another team’s configuration is not found; a stale revision is refused with the current state', async () => {
    const id = await newConfiguration(designer, 'Private');
    const kit = await signIn(t.app, 'reviewer@brackenfield.example');
    expectError(await kit.get(`${team()}/configurations/${id}`), 404, 'not_found');
    const bId = (await kit.get('/api/teams').expect(200)).body[0].id;
    expectError(await kit.get(`/api/teams/${bId}/configurations/${id}`), 404, 'not_found');
    await designer.put(`${team()}/configurations/${id}`).send({ baseRevision: 1, trackProfile: 'rough-road' }).expect(200);
    const stale = await designer.put(`${team()}/configurations/${id}`).send({ baseRevision: 1, name: 'Late' });
    expectError(stale, 409, 'stale_revision');
    expect(stale.body.error.details.current).toMatchObject({ revision: 2, trackProfile: 'rough-road' });
  });
  it('any two revisions of a vehicle or an axle design can be compared', async () => {
    const v = await engineer.post(`${team()}/vehicles`).send({ name: 'Compare car', data: exampleVehicles.tur26Ember }).expect(201);
    const heavier = { ...exampleVehicles.tur26Ember, massKg: exampleVehicles.tur26Ember.massKg + 12 };
    await engineer.put(`${team()}/vehicles/${v.body.id}/data`).send({ data: heavier, baseRevision: 1 }).expect(200);
    const vc = await viewer.get(`${team()}/vehicles/${v.body.id}/compare`).query({ from: 1, to: 2 }).expect(200);
    expect(vc.body.changes).toEqual([{ path: 'data.massKg', a: exampleVehicles.tur26Ember.massKg, b: heavier.massKg, change: 12 }]);

    const d = await designer.post(`${team()}/vehicles/${v.body.id}/axle-designs`).send({ axle: 'rear', name: 'Compare rear', corner: exampleCorners.fsRearWishbone }).expect(201);
    const moved = structuredClone(exampleCorners.fsRearWishbone);
    moved.points.tieRodOuter = [moved.points.tieRodOuter[0], moved.points.tieRodOuter[1], moved.points.tieRodOuter[2] - 2];
    await designer.put(`${team()}/axle-designs/${d.body.id}/corner`).send({ corner: moved, baseRevision: 1 }).expect(200);
    await designer.patch(`${team()}/axle-designs/${d.body.id}`).send({ name: 'Compare rear, renamed', baseRevision: 2 }).expect(200);
    const dc = await viewer.get(`${team()}/axle-designs/${d.body.id}/compare`).query({ from: 1, to: 3 }).expect(200);
    expect(dc.body.changes.map((c: { path: string }) => c.path)).toEqual(['corner.points.tieRodOuter[2]', 'name']);
    expect(dc.body.changes[0].change).toBeCloseTo(-2, 9);
    expectError(await viewer.get(`${team()}/axle-designs/${d.body.id}/compare`).query({ from: 1, to: 9 }), 404, 'not_found');
    expectError(await viewer.get(`${team()}/axle-designs/${d.body.id}/compare`).query({ from: 1 }), 400, 'invalid_input');
  });

  it('a team with approved work is not deleted', async () => {
    expectError(await owner.delete(team()), 409, 'has_approvals');
    expect((await owner.get(team()).expect(200)).body.slug).toBe('tallowmere');
  });
});
