/**
 * The study CSV follows the reader's unit choice (issue 15 §2: "the user's
 * unit choice (SI or inch-pound) applies on every … export"): `?units=`
 * chooses, else the caller's account setting; a bad choice is refused naming
 * the parameter. The API's JSON stays SI. Conversion check: 1 in = 25.4 mm
 * exactly (NIST SP 811, Appendix B).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { waitFor } from '../support/wait.js';
import { expectError, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

/** NIST SP 811, Appendix B: the inch is 25.4 mm exactly. */
const MM_PER_IN = 25.4;

let t: TestApp;
let engineer: Agent;
let viewer: Agent;
let teamId: string;
let studyId: string;
let nominalRollCentreMm: number;

beforeAll(async () => {
  t = await startTestApp({ seed: true, config: { studyMaxActivePerTeam: 10 } });
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  viewer = await signIn(t.app, 'viewer@tallowmere.example');
  const teams = (await engineer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  teamId = teams.find((x) => x.slug === 'tallowmere')!.id;
  const vehicles = (await engineer.get(`/api/teams/${teamId}/vehicles`).expect(200)).body as { id: string; name: string }[];
  const vehicleId = vehicles.find((v) => v.name === 'TUR-26 Ember')!.id;
  const designs = (await engineer.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  const designId = designs.find((d) => d.name === 'Front baseline')!.id;
  const r = await engineer.post(`/api/teams/${teamId}/studies`).send({
    kind: 'tolerance',
    target: { axleDesignId: designId },
    seed: 11,
    samples: 40,
    tolerances: [{ point: 'upperOuter', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }],
  });
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  studyId = r.body.study.id as string;
  const done = await waitFor('the study to complete', async () => {
    const s = (await engineer.get(`/api/teams/${teamId}/studies/${studyId}`).expect(200)).body.study;
    if (s.status === 'failed' || s.status === 'cancelled') throw new Error(`study ${s.status}`);
    return s.status === 'completed' ? s : undefined;
  });
  nominalRollCentreMm = (done.result.outputs as { key: string; nominal: number }[]).find((o) => o.key === 'rollCentreHeightMm')!.nominal;
}, 180_000);

afterAll(async () => {
  await t?.close();
});

const csvPath = () => `/api/teams/${teamId}/studies/${studyId}/csv`;

/** The outputs table's row for `key`, by column name. */
function outputRow(csv: string, key: string): Record<string, string> {
  const lines = csv.split('\r\n');
  const headerAt = lines.findIndex((l) => l.startsWith('output,label,unit,'));
  const header = lines[headerAt]!.split(',');
  const line = lines.slice(headerAt + 1).find((l) => l.startsWith(`${key},`))!;
  // The rows this reads have no quoted cells (their labels hold no comma).
  const cells = line.split(',');
  return Object.fromEntries(header.map((h, i) => [h, cells[i] ?? '']));
}

describe('study CSV in the reader\'s units', { timeout: 60_000 }, () => {
  it('?units=imperial writes inches, ?units=si millimetres; the JSON stays SI', async () => {
    const us = (await viewer.get(csvPath()).query({ units: 'imperial' }).expect(200)).text;
    const si = (await viewer.get(csvPath()).query({ units: 'si' }).expect(200)).text;
    const rcUs = outputRow(us, 'rollCentreHeightMm');
    const rcSi = outputRow(si, 'rollCentreHeightMm');
    expect(rcUs['unit']).toBe('in');
    expect(rcSi['unit']).toBe('mm');
    // Four significant figures (the length quantity's): half a unit in the 4th figure is at most 5e-4 of the value.
    expect(Math.abs(Number(rcUs['nominal']) - nominalRollCentreMm / MM_PER_IN)).toBeLessThanOrEqual(5e-4 * Math.abs(nominalRollCentreMm / MM_PER_IN));
    expect(Math.abs(Number(rcSi['nominal']) - nominalRollCentreMm)).toBeLessThanOrEqual(5e-4 * Math.abs(nominalRollCentreMm));
    expect(us).toContain('output,unit,bin from,bin to,count (samples)');
    // The tornado names the point as the hardpoint table does, never its key.
    expect(us).toMatch(/Upper ball joint, z \(left\)/);
    const json = (await viewer.get(`/api/teams/${teamId}/studies/${studyId}`).expect(200)).body.study.result;
    expect(json.outputs.find((o: { key: string }) => o.key === 'rollCentreHeightMm').unit).toBe('mm');
    expect(json.factors[0].label).toBe('Upper ball joint, z (left)');
  });

  it('without ?units, follows the account setting', async () => {
    await viewer.patch('/api/auth/me').send({ displayUnits: 'imperial' }).expect(200);
    try {
      expect(outputRow((await viewer.get(csvPath()).expect(200)).text, 'rollCentreHeightMm')['unit']).toBe('in');
    } finally {
      await viewer.patch('/api/auth/me').send({ displayUnits: 'si' }).expect(200);
    }
    expect(outputRow((await viewer.get(csvPath()).expect(200)).text, 'rollCentreHeightMm')['unit']).toBe('mm');
  });

  it('refuses another unit system, naming the parameter', async () => {
    const r = await viewer.get(csvPath()).query({ units: 'furlongs' });
    expectError(r, 400, 'invalid_input');
    expect(JSON.stringify(r.body)).toContain('units');
  });
});
