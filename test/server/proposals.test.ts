/** Proposals: applying a solution never overwrites; a designer accepts it as a new revision. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { addMember, expectError, idOf, registerUser, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let engineer: Agent;
let designer: Agent;
let base = '';

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  designer = await signIn(t.app, 'designer@tallowmere.example');
  const teamId = await idOf(engineer, '/api/teams', 'tallowmere');
  const vehicleId = await idOf(engineer, `/api/teams/${teamId}/vehicles`, 'TUR-26 Ember');
  const d = await designer.post(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'rear', name: 'Proposal study', corner: exampleCorners.fsRearWishbone }).expect(201);
  base = `/api/teams/${teamId}/axle-designs/${d.body.id}`;
});
afterAll(async () => {
  await t?.close();
});

function raised(dz: number) {
  const c = structuredClone(exampleCorners.fsRearWishbone);
  c.points.tieRodInner = [c.points.tieRodInner[0], c.points.tieRodInner[1], c.points.tieRodInner[2] + dz];
  return c;
}

describe('proposals', () => {
  it('a proposal leaves the design untouched until a designer accepts it', async () => {
    const origin = { intent: { target: { rollSteerCoefficient: -0.02 } }, feasible: true };
    const p = await engineer.post(`${base}/proposals`).send({ corner: raised(4), baseRevision: 1, message: 'solve for −0.02', origin });
    expect(p.status).toBe(201);
    expect(p.body).toMatchObject({ status: 'open', baseRevision: 1, authorName: 'Eli Marsh', message: 'solve for −0.02', origin });
    const before = await designer.get(base).expect(200);
    expect(before.body.revision).toBe(1);
    expect(before.body.corner.points.tieRodInner[2]).toBe(exampleCorners.fsRearWishbone.points.tieRodInner[2]);

    const list = await designer.get(`${base}/proposals`).expect(200);
    expect(list.body.map((x: { id: string }) => x.id)).toContain(p.body.id);
    const full = await designer.get(`${base}/proposals/${p.body.id}`).expect(200);
    expect(full.body.corner.points.tieRodInner[2]).toBe(raised(4).points.tieRodInner[2]);

    const a = await designer.post(`${base}/proposals/${p.body.id}/accept`).send({ message: 'looks right' }).expect(200);
    expect(a.body.proposal).toMatchObject({ status: 'accepted', acceptedRevision: 2, decidedByName: 'Dana Quist', decisionMessage: 'looks right' });
    // The design names the revision's author, as its revision list does (issue 15 §1); who accepted stays on the proposal.
    expect(a.body.design).toMatchObject({ revision: 2, status: 'accepted', updatedByName: 'Eli Marsh' });
    expect(a.body.design.corner.points.tieRodInner[2]).toBe(raised(4).points.tieRodInner[2]);
    const revs = await designer.get(`${base}/revisions`).expect(200);
    expect(revs.body[0]).toMatchObject({ revision: 2, authorName: 'Eli Marsh', status: 'accepted' });
    // The history shows the author's own note, not one written over it.
    expect(revs.body[0].message).toBe('solve for −0.02');
    expect((await designer.get(base).expect(200)).body.updatedByName).toBe(revs.body[0].authorName);
    expectError(await designer.post(`${base}/proposals/${p.body.id}/accept`).send({}), 409, 'proposal_closed');
  });

  it('a proposal made on an older revision is refused, and cannot be accepted once the design moved on', async () => {
    const cur = (await designer.get(base).expect(200)).body.revision as number;
    expectError(await engineer.post(`${base}/proposals`).send({ corner: raised(6), baseRevision: cur - 1 }), 409, 'proposal_outdated');
    const p = await engineer.post(`${base}/proposals`).send({ corner: raised(6), baseRevision: cur }).expect(201);
    // The designer edits the hardpoints meanwhile.
    await designer.put(`${base}/corner`).send({ corner: raised(1), baseRevision: cur, message: 'packaging' }).expect(200);
    const r = await designer.post(`${base}/proposals/${p.body.id}/accept`).send({});
    expectError(r, 409, 'proposal_outdated');
    expect(r.body.error.details.current.corner.points.tieRodInner[2]).toBe(raised(1).points.tieRodInner[2]);
    const still = await designer.get(`${base}/proposals/${p.body.id}`).expect(200);
    expect(still.body.status).toBe('open');
  });

  it('reject and withdraw close a proposal; closed ones cannot be reopened', async () => {
    const cur = (await designer.get(base).expect(200)).body.revision as number;
    const p1 = await engineer.post(`${base}/proposals`).send({ corner: raised(2), baseRevision: cur }).expect(201);
    const rej = await designer.post(`${base}/proposals/${p1.body.id}/reject`).send({ message: 'bump steer too high' }).expect(200);
    expect(rej.body).toMatchObject({ status: 'rejected', decisionMessage: 'bump steer too high' });
    expectError(await engineer.delete(`${base}/proposals/${p1.body.id}`), 409, 'proposal_closed');
    const p2 = await engineer.post(`${base}/proposals`).send({ corner: raised(3), baseRevision: cur }).expect(201);
    const w = await engineer.delete(`${base}/proposals/${p2.body.id}`).expect(200);
    expect(w.body.status).toBe('withdrawn');
    expect((await designer.get(base).expect(200)).body.revision).toBe(cur);
  });

  it('only the author withdraws; a bad corner is 400; unknown ids are 404', async () => {
    const bo = await signIn(t.app, 'owner@brackenfield.example');
    expectError(await bo.get(`${base}/proposals`), 404, 'not_found');
    const cur = (await designer.get(base).expect(200)).body.revision as number;
    const broken = structuredClone(exampleCorners.fsRearWishbone) as { points: Record<string, number[]> };
    broken.points['upperRear'] = [...broken.points['upperFront']!];
    expectError(await engineer.post(`${base}/proposals`).send({ corner: broken, baseRevision: cur }), 400, 'invalid_input');
    expectError(await engineer.get(`${base}/proposals/00000000-0000-4000-8000-000000000000`), 404, 'not_found');

    // A second engineer of the team may propose but not withdraw Eli's proposal.
    const owner = await signIn(t.app, 'owner@tallowmere.example');
    const second = await registerUser(t.app, 'Second Engineer');
    const teamPath = base.split('/axle-designs/')[0]!;
    await addMember(t, owner, teamPath.split('/').pop()!, second, ['engineer']);
    const p = await engineer.post(`${base}/proposals`).send({ corner: raised(5), baseRevision: cur }).expect(201);
    expectError(await second.agent.delete(`${base}/proposals/${p.body.id}`), 403, 'forbidden');
    await engineer.delete(`${base}/proposals/${p.body.id}`).expect(200);
  });
});
