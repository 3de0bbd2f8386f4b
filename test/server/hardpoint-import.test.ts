/** Hardpoint import by upload: read with the shared parser, checked against the corner schema, never saved. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { expectError, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let designer: Agent;
let designId = '';
let teamId = '';
let stored: { revision: number; corner: typeof exampleCorners.fsFrontWishbone };

const path = () => `/api/teams/${teamId}/axle-designs/${designId}/import`;
const upload = (name: string, content: string | Buffer, contentType = 'text/csv') =>
  designer.post(path()).attach('file', typeof content === 'string' ? Buffer.from(content, 'utf8') : content, { filename: name, contentType });

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  designer = await signIn(t.app, 'designer@tallowmere.example');
  const teams = (await designer.get('/api/teams').expect(200)).body as { id: string; slug: string }[];
  teamId = teams.find((x) => x.slug === 'tallowmere')!.id;
  const vehicles = (await designer.get(`/api/teams/${teamId}/vehicles`).expect(200)).body as { id: string; name: string }[];
  const vehicleId = vehicles.find((v) => v.name === 'TUR-26 Ember')!.id;
  const designs = (await designer.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; axle: string }[];
  designId = designs.find((d) => d.axle === 'front')!.id;
  stored = (await designer.get(`/api/teams/${teamId}/axle-designs/${designId}`).expect(200)).body;
});
afterAll(async () => {
  await t?.close();
});

/** The design as stored must be exactly what it was: an import never saves. */
async function expectUnchanged(): Promise<void> {
  const now = (await designer.get(`/api/teams/${teamId}/axle-designs/${designId}`).expect(200)).body;
  expect(now.revision).toBe(stored.revision);
  expect(now.corner).toEqual(stored.corner);
}

describe('POST …/axle-designs/:designId/import', () => {
  it('previews a good CSV: the merged corner and the moved point, nothing saved', async () => {
    const [x, y, z] = stored.corner.points.tieRodInner;
    const r = await upload('good.csv', `point,x (mm),y (mm),z (mm)\ntieRodInner,${x},${y},${z + 4}\n`);
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.corner.points.tieRodInner).toEqual([x, y, z + 4]);
    expect(r.body.corner.points.lowerOuter).toEqual(stored.corner.points.lowerOuter);
    expect(r.body.changedPoints).toEqual([
      { key: 'points.tieRodInner', name: 'Tie rod, inner end (rack)', current: [x, y, z], imported: [x, y, z + 4], movedMm: 4 },
    ]);
    expect(r.body.baseRevision).toBe(stored.revision);
    expect(r.body.warnings.join(' ')).toContain('stay as they are');
    await expectUnchanged();
  });

  it('reads semicolons, decimal commas and a byte-order mark', async () => {
    const text = '\uFEFFpoint;x (mm);y (mm);z (mm)\r\nTie rod, inner end (rack);-55,5;210;162,25\r\nlowerOuter;2;570;130\r\n';
    const r = await upload('excel.csv', text, 'application/vnd.ms-excel');
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.corner.points.tieRodInner).toEqual([-55.5, 210, 162.25]);
    expect(r.body.corner.points.lowerOuter).toEqual([2, 570, 130]);
    await expectUnchanged();
  });

  it('names the bad row and changes nothing', async () => {
    const r = await upload('bad.csv', 'point,x,y,z\ntieRodInner,-55,210,160\nlowerOuter,2,five,130\n');
    expectError(r, 400, 'import_rows');
    expect(r.body.error.message).toContain('Line 3 (lowerOuter)');
    expect(r.body.error.details.errors).toEqual(['Line 3 (lowerOuter): y "five" is not a number.']);
    await expectUnchanged();
  });

  it('refuses points that break the corner, naming the point', async () => {
    const [x, y, z] = stored.corner.points.tieRodInner;
    const r = await upload('zero.csv', `point,x,y,z\ntieRodOuter,${x},${y},${z}\n`);
    expectError(r, 400, 'import_geometry');
    expect(r.body.error.message).toContain('points.tieRodOuter');
    await expectUnchanged();
  });

  it('maps points from another CAD frame sent beside the file', async () => {
    const [x, y, z] = stored.corner.points.tieRodInner;
    const frame = { axes: ['+x', '-y', '-z'], unit: 'm', originMm: [0, 0, 0], side: 'left' };
    const r = await designer
      .post(path())
      .field('frame', JSON.stringify(frame))
      .attach('file', Buffer.from(`point,x,y,z\ntieRodInner,${x / 1000},${-y / 1000},${-(z + 2) / 1000}\n`), { filename: 'cad.csv', contentType: 'text/csv' });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    r.body.corner.points.tieRodInner.forEach((v: number, i: number) => expect(v).toBeCloseTo([x, y, z + 2][i]!, 6));
    const bad = await designer.post(path()).field('frame', '{"axes":["+x","+x","+z"],"unit":"mm","originMm":[0,0,0],"side":"left"}').attach('file', Buffer.from('point,x,y,z\n'), 'a.csv');
    expectError(bad, 400, 'import_rows');
    expect(bad.body.error.message).toContain('different Rollwise axis');
  });

  it('merges into the editor\'s working corner when it is sent (unsaved edits included)', async () => {
    const working = structuredClone(stored.corner);
    const [x, y, z] = working.points.tieRodInner;
    working.points.tieRodInner = [x, y, z + 10];
    const r = await designer
      .post(path())
      .field('corner', JSON.stringify(working))
      .attach('file', Buffer.from(`point,x,y,z\ntieRodInner,${x},${y},${z + 11}\n`), { filename: 'w.csv', contentType: 'text/csv' });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.changedPoints[0]).toMatchObject({ current: [x, y, z + 10], imported: [x, y, z + 11], movedMm: 1 });
    const strut = await designer.post(path()).field('corner', JSON.stringify(exampleCorners.roadFrontStrut)).attach('file', Buffer.from('point,x,y,z\n'), 'w.csv');
    expectError(strut, 400, 'invalid_input');
    const broken = await designer.post(path()).field('corner', '{"type":').attach('file', Buffer.from('point,x,y,z\n'), 'w.csv');
    expectError(broken, 400, 'invalid_input');
    await expectUnchanged();
  });

  it('reads a JSON export', async () => {
    const corner = structuredClone(stored.corner);
    corner.points.upperOuter = [corner.points.upperOuter[0], corner.points.upperOuter[1], corner.points.upperOuter[2] + 3];
    const r = await upload('front.json', JSON.stringify({ title: 'front', units: { length: 'mm' }, corner }), 'application/json');
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.changedPoints.map((p: { key: string }) => p.key)).toEqual(['points.upperOuter']);
    expect(r.body.corner.points.upperOuter).toEqual(corner.points.upperOuter);
    const strut = await upload('strut.json', JSON.stringify(exampleCorners.roadFrontStrut), 'application/json');
    expectError(strut, 400, 'import_rows');
    expect(strut.body.error.message).toContain('strut');
    await expectUnchanged();
  });

  it('refuses a binary file named .csv, invalid UTF-8 and other content types', async () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0x00, 0x00, 0x0d]);
    expectError(await upload('photo.csv', png), 415, 'not_text');
    expectError(await upload('latin1.csv', Buffer.from([0x70, 0x6f, 0x69, 0x6e, 0x74, 0xe9, 0x0a])), 415, 'not_text');
    expectError(await upload('photo.png', 'point,x,y,z\n', 'image/png'), 415, 'unsupported_media_type');
    expectError(await upload('points.exe', 'point,x,y,z\n', 'application/octet-stream'), 415, 'unsupported_media_type');
    expectError(await designer.post(path()).send({ file: 'point,x,y,z' }), 415, 'unsupported_media_type');
    expectError(await designer.post(path()).field('frame', '').type('multipart/form-data'), 400, 'invalid_upload');
    await expectUnchanged();
  });

  it('refuses an oversize file and too many rows', async () => {
    const big = 'point,x,y,z\n' + '# padding line to make the file large\n'.repeat(8000);
    expect(Buffer.byteLength(big)).toBeGreaterThan(256 * 1024);
    expectError(await upload('big.csv', big), 413, 'payload_too_large');
    const many = 'point,x,y,z\n' + 'tieRodInner,1,2,3\n'.repeat(501);
    const r = await upload('many.csv', many);
    expectError(r, 400, 'import_rows');
    expect(r.body.error.message).toContain('at most 500');
    await expectUnchanged();
  });
});
