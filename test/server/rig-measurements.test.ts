/**
 * Rig measurements over the API: preview, create (all or nothing), list,
 * get with a server-side comparison, delete, the team's rig tolerance;
 * good, malformed, wrong-unit, too-big and binary files; permissions and
 * other teams.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { sweepCorner } from '../../shared/kinematics/sweep.js';
import { expectError, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let designer: Agent;
let engineer: Agent;
let owner: Agent;
let viewer: Agent;
let outsider: Agent;
let teamId = '';
let configurationId = '';
let frontDesignId = '';

const fixture = (name: string) => readFileSync(new URL(`../fixtures/rig/${name}`, import.meta.url));
const base = () => `/api/teams/${teamId}`;

const MAPPING = {
  hasHeader: true,
  travelColumn: 0,
  toeColumn: 1,
  camberColumn: 2,
  travelUnit: 'mm',
  toeUnit: 'deg',
  camberUnit: 'deg',
  travelSign: 'bump-positive',
  toeSign: 'toe-in-positive',
  camberSign: 'top-out-positive',
};

/** The front baseline's own predicted toe and camber as a rig file (the seed's front design is fsFrontWishbone). */
function engineFile(toeOffsetDeg = 0): string {
  const s = sweepCorner(exampleCorners.fsFrontWishbone, { travel: { from: -25, to: 25, step: 5 } });
  return ['travel (mm),toe (deg),camber (deg)', ...s.rows.map((r) => `${r.travelMm},${r.toeDeg + toeOffsetDeg},${r.camberDeg}`)].join('\n');
}

function create(who: Agent, file: Buffer | string, fileName: string, fields: { mapping?: unknown; target?: unknown; options?: unknown }, contentType = 'text/csv') {
  let req = who.post(`${base()}/rig-measurements`);
  if (fields.mapping !== undefined) req = req.field('mapping', JSON.stringify(fields.mapping));
  if (fields.target !== undefined) req = req.field('target', JSON.stringify(fields.target));
  if (fields.options !== undefined) req = req.field('options', JSON.stringify(fields.options));
  return req.attach('file', typeof file === 'string' ? Buffer.from(file, 'utf8') : file, { filename: fileName, contentType });
}

const configTarget = () => ({ kind: 'configuration', configurationId, axle: 'front' });

async function count(): Promise<number> {
  return ((await designer.get(`${base()}/rig-measurements`).expect(200)).body as unknown[]).length;
}

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  designer = await signIn(t.app, 'designer@tallowmere.example');
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  owner = await signIn(t.app, 'owner@tallowmere.example');
  viewer = await signIn(t.app, 'viewer@tallowmere.example');
  outsider = await signIn(t.app, 'reviewer@brackenfield.example');
  const teams = (await designer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  teamId = teams.find((x) => x.slug === 'tallowmere')!.id;
  const configs = (await designer.get(`${base()}/configurations`).expect(200)).body as { id: string; front: { designId: string; name: string } }[];
  const c = configs.find((x) => x.front.name === 'Front baseline')!;
  configurationId = c.id;
  frontDesignId = c.front.designId;
});
afterAll(async () => {
  await t?.close();
});

describe('rig measurement upload', () => {
  it('previews a file: columns, first rows and a proposed mapping, nothing stored', async () => {
    const before = await count();
    const r = await designer.post(`${base()}/rig-measurements/preview`).attach('file', fixture('good-comma.csv'), { filename: 'good-comma.csv', contentType: 'text/csv' });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.columns).toEqual(['Wheel travel (mm)', 'Toe (deg)', 'Camber (deg)']);
    expect(r.body.rowCount).toBe(11);
    expect(r.body.proposed).toMatchObject({ travelColumn: 0, toeColumn: 1, camberColumn: 2 });
    expect(r.body.fileName).toBe('good-comma.csv');
    expect(await count()).toBe(before);
  });

  it('stores a good file against a configuration with its points, and answers the comparison (engine file: RMS ~0, an identity)', async () => {
    const r = await create(designer, engineFile(), 'engine.csv', { mapping: MAPPING, target: configTarget(), options: { basis: 'absolute', name: 'Rig day 1' } });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body).toMatchObject({ name: 'Rig day 1', fileName: 'engine.csv', attachedTo: 'configuration', configurationId, axle: 'front', designId: frontDesignId, pointCount: 11, hasCamber: true, basis: 'absolute', authorName: 'Dana Quist' });
    expect(r.body.comparison.toe.rmsDeg).toBeLessThan(1e-9);
    expect(r.body.comparison.cautions).toEqual([]);
    const got = await viewer.get(`${base()}/rig-measurements/${r.body.id}`).expect(200);
    expect(got.body.points).toHaveLength(11);
    expect(got.body.points[0]).toMatchObject({ travelMm: -25, line: 2 });
    expect(got.body.mapping).toEqual(MAPPING);
    expect(got.body.comparison.toe.rmsDeg).toBeLessThan(1e-9);
    expect(typeof got.body.engineVersion).toBe('string');
    const listed = (await viewer.get(`${base()}/rig-measurements?configurationId=${configurationId}`).expect(200)).body as { id: string }[];
    expect(listed.map((x) => x.id)).toContain(r.body.id);
    const activity = (await owner.get(`${base()}/activity`).expect(200)).body as { action: string; summary: string }[];
    expect(activity.find((a) => a.action === 'rig.create')?.summary).toContain('Rig day 1');
  });

  it('stores a semicolon / decimal-comma file as a baseline of the current design, with a known offset reported as the RMS (identity)', async () => {
    const text = engineFile(0.05).replace(/,/g, ';').replace(/(\d)\.(\d)/g, '$1,$2');
    const r = await create(engineer, '\uFEFF' + text, 'excel.csv', { mapping: MAPPING, target: { kind: 'baseline', designId: frontDesignId }, options: { basis: 'absolute' } }, 'application/vnd.ms-excel');
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body.attachedTo).toBe('baseline');
    expect(r.body.configurationId).toBeNull();
    expect(r.body.comparison.toe.rmsDeg).toBeCloseTo(0.05, 6);
    expect(r.body.comparison.toe.largestDeg).toBeCloseTo(0.05, 6);
    expect(r.body.comparison.cautions).toEqual([]);
  });

  it('refuses a malformed file naming the line, and stores nothing', async () => {
    const before = await count();
    const r = await create(designer, fixture('malformed.csv'), 'malformed.csv', { mapping: { ...MAPPING, camberColumn: null }, target: configTarget() });
    expectError(r, 400, 'rig_rows');
    expect(r.body.error.details.errors).toEqual(['Line 5: toe "oops" is not a number.']);
    expect(await count()).toBe(before);
  });

  it('refuses a wrong-unit file (radians) naming the header line, and stores nothing', async () => {
    const before = await count();
    const r = await create(designer, fixture('wrong-unit.csv'), 'wrong-unit.csv', { mapping: { ...MAPPING, camberColumn: null }, target: configTarget() });
    expectError(r, 400, 'rig_rows');
    expect(r.body.error.message).toContain('Line 1: the toe column "toe (rad)"');
    expect(await count()).toBe(before);
  });

  it('refuses a file the design cannot reach with a typed 422 naming the line, and stores nothing', async () => {
    const before = await count();
    const r = await create(designer, 'travel (mm),toe (deg)\n-20,0\n0,0\n20,0\n700,0\n', 'far.csv', { mapping: { ...MAPPING, camberColumn: null }, target: configTarget() });
    expectError(r, 422, 'unreachable_pose');
    expect(r.body.error.message).toContain('700 mm (line 5)');
    expect(await count()).toBe(before);
  });

  it('refuses a too-big file (413), a binary file named .csv (415), a non-CSV name (415) and bad fields (400)', async () => {
    const before = await count();
    const big = Buffer.from('travel,toe\n' + '0,0\n'.repeat(70_000));
    expectError(await create(designer, big, 'big.csv', { mapping: MAPPING, target: configTarget() }), 413, 'payload_too_large');
    const binary = Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x00, 0x00, 0x08, 0x00, 0xff, 0xfe]);
    expectError(await create(designer, binary, 'rig.csv', { mapping: MAPPING, target: configTarget() }), 415, 'not_text');
    expectError(await create(designer, engineFile(), 'rig.xlsx', { mapping: MAPPING, target: configTarget() }, 'application/octet-stream'), 415, 'unsupported_media_type');
    const noMapping = await create(designer, engineFile(), 'rig.csv', { target: configTarget() });
    expectError(noMapping, 400, 'invalid_input');
    expect(noMapping.body.error.message).toContain('mapping');
    const sameColumn = await create(designer, engineFile(), 'rig.csv', { mapping: { ...MAPPING, toeColumn: 0 }, target: configTarget() });
    expectError(sameColumn, 400, 'invalid_input');
    const tooMany = 'travel,toe\n' + Array.from({ length: 2001 }, (_, i) => `${(i / 100).toFixed(2)},0`).join('\n');
    const rows = await create(designer, tooMany, 'rows.csv', { mapping: { ...MAPPING, camberColumn: null }, target: configTarget() });
    expectError(rows, 400, 'rig_rows');
    expect(rows.body.error.message).toContain('at most 2000');
    expect(await count()).toBe(before);
  });

  it('refuses a rack outside the stroke (400) and a design revision that does not exist (404), storing nothing', async () => {
    const before = await count();
    expectError(await create(designer, engineFile(), 'rack.csv', { mapping: MAPPING, target: configTarget(), options: { rackMm: 500 } }), 400, 'invalid_input');
    expectError(await create(designer, engineFile(), 'rev.csv', { mapping: MAPPING, target: { kind: 'baseline', designId: frontDesignId, designRevision: 999 } }), 404, 'not_found');
    expect(await count()).toBe(before);
  });
});

describe('permissions, other teams and the tolerance', () => {
  let measurementId = '';
  beforeAll(async () => {
    const r = await create(designer, engineFile(0.12), 'offset.csv', { mapping: MAPPING, target: configTarget(), options: { basis: 'absolute' } });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    measurementId = r.body.id;
  });

  it('a viewer reads but cannot upload or delete; a non-member gets 404', async () => {
    expectError(await create(viewer, engineFile(), 'v.csv', { mapping: MAPPING, target: configTarget() }), 403, 'forbidden');
    expectError(await viewer.delete(`${base()}/rig-measurements/${measurementId}`), 403, 'forbidden');
    expectError(await outsider.get(`${base()}/rig-measurements/${measurementId}`), 404, 'not_found');
    expectError(await outsider.get(`${base()}/rig-measurements`), 404, 'not_found');
  });

  it('another team cannot reach this team’s measurement or attach to its configuration or design through its own path', async () => {
    const bo = await signIn(t.app, 'owner@brackenfield.example');
    const teams = (await bo.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
    const other = teams.find((x) => x.slug === 'brackenfield')!.id;
    expectError(await bo.get(`/api/teams/${other}/rig-measurements/${measurementId}`), 404, 'not_found');
    expectError(await bo.delete(`/api/teams/${other}/rig-measurements/${measurementId}`), 404, 'not_found');
    const attach = bo
      .post(`/api/teams/${other}/rig-measurements`)
      .field('mapping', JSON.stringify(MAPPING))
      .field('target', JSON.stringify({ kind: 'baseline', designId: frontDesignId }))
      .attach('file', Buffer.from(engineFile()), { filename: 'x.csv', contentType: 'text/csv' });
    expectError(await attach, 404, 'not_found');
    const attachConfig = bo
      .post(`/api/teams/${other}/rig-measurements`)
      .field('mapping', JSON.stringify(MAPPING))
      .field('target', JSON.stringify(configTarget()))
      .attach('file', Buffer.from(engineFile()), { filename: 'x.csv', contentType: 'text/csv' });
    expectError(await attachConfig, 404, 'not_found');
  });

  it('the tolerance: defaults, only the owner sets it, and the comparison is recomputed with it on read', async () => {
    const d = await viewer.get(`${base()}/rig-tolerance`).expect(200);
    expect(d.body).toMatchObject({ toeDeg: 0.1, camberDeg: 0.25, isDefault: true });
    // 0.12° offset ≥ the default 0.1° toe tolerance: a caution.
    const first = await viewer.get(`${base()}/rig-measurements/${measurementId}`).expect(200);
    expect(first.body.comparison.cautions.map((c: { code: string }) => c.code)).toEqual(['rig-toe-disagreement']);
    expect(first.body.comparison.cautions[0]).toMatchObject({ level: 'warning', threshold: 0.1, unit: 'deg' });
    // The caution's travel figure follows the reader's unit choice (issue 15 §2): 1 in = 25.4 mm exactly (NIST SP 811, Appendix B);
    // 0.1 mm in SI is written to 0.01 in.
    const atMm = first.body.comparison.toe.atTravelMm as number;
    expect(first.body.comparison.cautions[0].message).toContain(`(at ${atMm.toFixed(1)} mm travel`);
    await viewer.patch('/api/auth/me').send({ displayUnits: 'imperial' }).expect(200);
    try {
      const inches = await viewer.get(`${base()}/rig-measurements/${measurementId}`).expect(200);
      expect(inches.body.comparison.cautions[0].message).toContain(`(at ${(atMm / 25.4).toFixed(2)} in travel`);
      expect(inches.body.comparison.toe.atTravelMm).toBe(atMm);
    } finally {
      await viewer.patch('/api/auth/me').send({ displayUnits: 'si' }).expect(200);
    }
    expectError(await engineer.put(`${base()}/rig-tolerance`).send({ toeDeg: 0.2, camberDeg: 0.5 }), 403, 'forbidden');
    expectError(await owner.put(`${base()}/rig-tolerance`).send({ toeDeg: -1, camberDeg: 0.5 }), 400, 'invalid_input');
    expectError(await owner.put(`${base()}/rig-tolerance`).send({ toeDeg: 0.2 }), 400, 'invalid_input');
    const set = await owner.put(`${base()}/rig-tolerance`).send({ toeDeg: 0.2, camberDeg: 0.5 });
    expect(set.status, JSON.stringify(set.body)).toBe(200);
    expect(set.body).toMatchObject({ toeDeg: 0.2, camberDeg: 0.5, isDefault: false, updatedByName: 'Ana Ferreira' });
    const after = await viewer.get(`${base()}/rig-measurements/${measurementId}`).expect(200);
    expect(after.body.comparison.cautions).toEqual([]);
    expect(after.body.comparison.tolerance).toEqual({ toeDeg: 0.2, camberDeg: 0.5 });
  });

  it('deletes (engineer), logs it, and the measurement is gone', async () => {
    await engineer.delete(`${base()}/rig-measurements/${measurementId}`).expect(204);
    expectError(await viewer.get(`${base()}/rig-measurements/${measurementId}`), 404, 'not_found');
    const activity = (await owner.get(`${base()}/activity`).expect(200)).body as { action: string }[];
    expect(activity.some((a) => a.action === 'rig.delete')).toBe(true);
    expectError(await viewer.get(`${base()}/rig-measurements/not-an-id`), 404, 'not_found');
  });
});

describe('POST /api/compute/rig-compare', () => {
  it('compares points sent directly (engine points: RMS ~0, an identity) and refuses a bad body with the field named', async () => {
    const s = sweepCorner(exampleCorners.fsFrontWishbone, { travel: { from: -20, to: 20, step: 10 } });
    const points = s.rows.map((r) => ({ travelMm: r.travelMm, toeDeg: r.toeDeg, camberDeg: r.camberDeg }));
    const ok = await viewer.post('/api/compute/rig-compare').send({ corner: exampleCorners.fsFrontWishbone, points, basis: 'absolute' });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.result.toe.rmsDeg).toBeLessThan(1e-9);
    expect(ok.body.result.points[0].line).toBe(1);
    const bad = await viewer.post('/api/compute/rig-compare').send({ corner: exampleCorners.fsFrontWishbone, points: points.slice(0, 2) });
    expectError(bad, 400, 'invalid_input');
    expect(bad.body.error.details.fields[0].path).toBe('points');
  });
});
