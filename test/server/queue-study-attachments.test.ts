/**
 * A completed study attached to a configuration's review record (issue 16:
 * "attachable to a configuration's review record, and visible on a
 * programme board"), on the real queue with the server's own worker:
 * attaching lists the study with its P5 / P50 / P95 key figures on the
 * configuration, the programme's instructor sees the team's latest attached
 * study on the board, detaching removes it, and an unfinished study or
 * another team's configuration cannot be attached. Rules from
 * docs/permissions.md (study:run attaches; team:read lists).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { waitFor } from '../support/wait.js';
import { expectError, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';
import { studyKeyFigures } from '../../shared/study/index.js';

let t: TestApp;
let engineer: Agent;
let viewer: Agent;
let iris: Agent;
let teamId: string;
let otherTeamConfig: string | undefined;
let configurationId: string;
let designId: string;

beforeAll(async () => {
  t = await startTestApp({ seed: true, config: { studyMaxActivePerTeam: 10 } });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  viewer = await signIn(t.app, 'viewer@tallowmere.example');
  iris = await signIn(t.app, 'instructor@programme.example');
  const teams = (await engineer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  teamId = teams.find((x) => x.slug === 'tallowmere')!.id;
  const configs = (await engineer.get(`/api/teams/${teamId}/configurations`).expect(200)).body as { id: string }[] | { configurations: { id: string }[] };
  configurationId = (Array.isArray(configs) ? configs : configs.configurations)[0]!.id;
  const vehicles = (await engineer.get(`/api/teams/${teamId}/vehicles`).expect(200)).body as { id: string; name: string }[];
  const vehicleId = vehicles.find((v) => v.name === 'TUR-26 Ember')!.id;
  const designs = (await engineer.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  designId = designs.find((d) => d.name === 'Front baseline')!.id;
  const kit = await signIn(t.app, 'reviewer@brackenfield.example');
  const other = (await kit.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  const bf = other.find((x) => x.slug === 'brackenfield');
  if (bf) {
    const c = (await kit.get(`/api/teams/${bf.id}/configurations`).expect(200)).body as { id: string }[] | { configurations: { id: string }[] };
    otherTeamConfig = (Array.isArray(c) ? c : c.configurations)[0]?.id;
  }
}, 60_000);

afterAll(async () => {
  await t?.close();
});

async function study(samples: number): Promise<string> {
  const r = await engineer.post(`/api/teams/${teamId}/studies`).send({
    kind: 'tolerance',
    target: { axleDesignId: designId },
    seed: 5,
    samples,
    tolerances: [{ point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }],
  });
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  return r.body.study.id as string;
}

describe('attaching studies to a configuration and the programme board', { timeout: 180_000 }, () => {
  it('attach, list with key figures, show on the board, detach', async () => {
    const id = await study(60);
    const done = await waitFor('the study to complete', async () => {
      const s = (await engineer.get(`/api/teams/${teamId}/studies/${id}`).expect(200)).body.study;
      if (s.status === 'failed' || s.status === 'cancelled') throw new Error(`study ${s.status}`);
      return s.status === 'completed' ? s : undefined;
    });
    const path = `/api/teams/${teamId}/studies/${id}/attachments/${configurationId}`;
    await expectError(await viewer.put(path).send({}), 403, 'forbidden');
    const a = (await engineer.put(path).send({ note: 'rig week tolerances' }).expect(200)).body.attachment;
    expect(a.studyId).toBe(id);
    expect(a.note).toBe('rig week tolerances');

    const list = (await viewer.get(`/api/teams/${teamId}/studies`).query({ attachedTo: configurationId }).expect(200)).body.attachments as {
      studyId: string;
      keyFigures: { key: string; p5: number; p50: number; p95: number }[];
    }[];
    expect(list.map((x) => x.studyId)).toContain(id);
    const figs = list.find((x) => x.studyId === id)!.keyFigures;
    // The key figures are the result's own percentiles.
    const eps = done.result.outputs.find((o: { key: string }) => o.key === 'rollSteerCoefficient');
    const f = figs.find((x) => x.key === 'rollSteerCoefficient')!;
    expect([f.p5, f.p50, f.p95]).toEqual([eps.p5, eps.p50, eps.p95]);
    // PostgreSQL picks the key figures' outputs out of the stored result: the same figures as from the whole result.
    expect(figs).toEqual(studyKeyFigures(done.result));
    expect(f.p5).toBeLessThanOrEqual(f.p50);
    expect(f.p50).toBeLessThanOrEqual(f.p95);

    // Iris's programme, accepted by Tallowmere's owner.
    const programme = (await iris.post('/api/programmes').send({ name: 'Attachment check', trackProfile: 'smooth-circuit' }).expect(201)).body.id as string;
    await iris.post(`/api/programmes/${programme}/teams`).send({ teamSlug: 'tallowmere' }).expect(201);
    const owner = await signIn(t.app, 'owner@tallowmere.example');
    await owner.post(`/api/teams/${teamId}/programmes/${programme}/accept`).send({}).expect(200);
    await expectError(await engineer.get(`/api/programmes/${programme}/studies`), 404, 'not_found');
    const board = (await iris.get(`/api/programmes/${programme}/studies`).expect(200)).body;
    const row = board.teams.find((x: { teamId: string }) => x.teamId === teamId);
    expect(row.study.studyId).toBe(id);
    expect(row.study.keyFigures.length).toBeGreaterThan(0);
    expect(row.study.keyFigures).toEqual(studyKeyFigures(done.result));

    await engineer.delete(path).expect(204);
    const after = (await viewer.get(`/api/teams/${teamId}/studies`).query({ attachedTo: configurationId }).expect(200)).body.attachments as { studyId: string }[];
    expect(after.map((x) => x.studyId)).not.toContain(id);
    await expectError(await engineer.delete(path), 404, 'not_found');
  });

  it('refuses an unfinished study, another team’s configuration and a bad query', async () => {
    const id = await study(20_000);
    await expectError(await engineer.put(`/api/teams/${teamId}/studies/${id}/attachments/${configurationId}`).send({}), 409, 'study_not_completed');
    await engineer.delete(`/api/teams/${teamId}/studies/${id}`).expect(200);
    if (otherTeamConfig) {
      // A completed study of ours cannot point at another team's configuration.
      const mine = (await engineer.get(`/api/teams/${teamId}/studies`).expect(200)).body.studies.find((s: { status: string }) => s.status === 'completed');
      if (mine) await expectError(await engineer.put(`/api/teams/${teamId}/studies/${mine.id}/attachments/${otherTeamConfig}`).send({}), 404, 'not_found');
    }
    await expectError(await engineer.get(`/api/teams/${teamId}/studies`).query({ attachedTo: 'not-an-id' }), 400, 'invalid_input');
  });
});
