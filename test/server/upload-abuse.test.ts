/**
 * Abuse of the hardpoint upload (POST …/axle-designs/:designId/import):
 * what hardpoint-import.test.ts does not already cover (it has the binary
 * .csv, invalid UTF-8, wrong content types, the 256 kB limit and 501 rows).
 * Here: tens of thousands of rows inside the size limit, formula-like cells,
 * malformed multipart, extra files and fields, UTF-16 text, JSON bombs, and
 * a multipart body sent to a JSON route. Each is refused or handled with a
 * message, never a 5xx, the server stays responsive, and nothing is stored:
 * the design, its revisions and the activity log are exactly as before.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { expectError, idOf, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let designer: Agent;
let teamId = '';
let designId = '';
let before = '';

const path = () => `/api/teams/${teamId}/axle-designs/${designId}/import`;
const upload = (name: string, content: string | Buffer, contentType = 'text/csv') =>
  designer.post(path()).attach('file', typeof content === 'string' ? Buffer.from(content, 'utf8') : content, { filename: name, contentType });

/** Everything an import could have touched: the design row, its revisions, the activity log. */
async function stored(): Promise<string> {
  const q = async (sql: string) => JSON.stringify((await t.db.pool.query(sql, [designId])).rows);
  return [
    await q('SELECT revision, corner, updated_at FROM axle_designs WHERE id = $1'),
    await q('SELECT revision, corner FROM axle_design_revisions WHERE design_id = $1 ORDER BY revision'),
    await q("SELECT count(*) FROM activity_log WHERE design_id = $1 OR subject_id = $1"),
  ].join('\n');
}

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  designer = await signIn(t.app, 'designer@tallowmere.example');
  teamId = await idOf(designer, '/api/teams', 'tallowmere');
  const vehicleId = await idOf(designer, `/api/teams/${teamId}/vehicles`, 'TUR-26 Ember');
  designId = (await designer.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body.find((d: { axle: string }) => d.axle === 'front').id;
  before = await stored();
});
afterAll(async () => {
  await t?.close();
});

/** A refusal in the error shape whose message says something (at least a few words). */
function refused(r: request.Response, status: number, code: string): string {
  expectError(r, status, code);
  expect(r.body.error.message.split(' ').length, r.body.error.message).toBeGreaterThan(3);
  return r.body.error.message as string;
}

describe('hardpoint upload abuse', () => {
  it('tens of thousands of rows inside the size limit: refused by count, quickly, and the server stays responsive', async () => {
    const rows = 'p,1,2,3\n'.repeat(30_000);
    const csv = `point,x,y,z\n${rows}`;
    expect(Buffer.byteLength(csv)).toBeLessThan(256 * 1024);
    const s = performance.now();
    const r = await upload('many.csv', csv);
    const ms = performance.now() - s;
    expect(refused(r, 400, 'import_rows')).toContain('at most 500');
    expect(ms).toBeLessThan(5000);
    // The same as one long line with nothing but separators.
    const wide = `point,x,y,z\n${','.repeat(200_000)}\n`;
    expect([400, 413]).toContain((await upload('wide.csv', wide)).status);
    await designer.get(`/api/teams/${teamId}/axle-designs/${designId}`).expect(200);
    expect(await stored()).toBe(before);
  });

  it('formula-like cells are data, never numbers: each bad row named, nothing taken', async () => {
    const [x, y, z] = [1, 2, 3];
    // [what, file, the line refused, the cell as text in the message]
    const cases: [string, string, number, string][] = [
      ['=1+2 as a coordinate', `point,x,y,z\ntieRodInner,=1+2,${y},${z}\n`, 2, '"=1+2"'],
      ['+ and - formulas', `point,x,y,z\ntieRodInner,+A1,${y},${z}\nlowerOuter,${x},-A1+1,${z}\n`, 3, '"-A1+1"'],
      ['@ function', `point,x,y,z\ntieRodInner,${x},${y},@SUM(1;2)\n`, 2, '"@SUM(1;2)"'],
      ['a formula as the point name', `point,x,y,z\n=HYPERLINK("http://127.0.0.1/steal"),${x},${y},${z}\n`, 2, 'HYPERLINK'],
      ['a tab-led cell', `point,x,y,z\ntieRodInner,\t=1,${y},${z}\n`, 2, '"=1"'],
    ];
    for (const [what, csv, line, cell] of cases) {
      const r = await upload('formulas.csv', csv);
      refused(r, 400, 'import_rows');
      const errors = r.body.error.details.errors as string[];
      // Refused as text where it stands: the line named, the cell quoted as written, nothing evaluated.
      expect(errors.some((e) => e.startsWith(`Line ${line} `) && e.includes(cell)), `${what}: ${errors.join(' | ')}`).toBe(true);
    }
    // A JSON export whose coordinate is a formula string.
    const corner = structuredClone(exampleCorners.fsFrontWishbone) as unknown as { points: Record<string, unknown> };
    corner.points['tieRodInner'] = ['=1+2', 2, 3];
    const j = await upload('points.json', JSON.stringify(corner), 'application/json');
    expect(j.status, JSON.stringify(j.body)).toBe(400);
    expect(JSON.stringify(j.body.error)).toContain('tieRodInner');
    expect(await stored()).toBe(before);
  });

  it('malformed multipart, a second file, too many fields or an oversize field: 400 with the reason', async () => {
    const broken = await designer
      .post(path())
      .set('Content-Type', 'multipart/form-data; boundary=XYZ')
      .send('--XYZ\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\nContent-Type: text/csv\r\n\r\npoint,x,y,z\r\n'); // never closed
    expect(refused(broken, 400, 'invalid_upload')).toContain('could not be read');

    const noBoundary = await designer.post(path()).set('Content-Type', 'multipart/form-data').send('point,x,y,z\n');
    expect(noBoundary.status).toBeGreaterThanOrEqual(400);
    expect(noBoundary.status).toBeLessThan(500);

    const two = await designer
      .post(path())
      .attach('file', Buffer.from('point,x,y,z\n'), { filename: 'a.csv', contentType: 'text/csv' })
      .attach('file', Buffer.from('point,x,y,z\n'), { filename: 'b.csv', contentType: 'text/csv' });
    expect(refused(two, 400, 'invalid_upload')).toMatch(/file/i);

    const fields = designer.post(path()).attach('file', Buffer.from('point,x,y,z\n'), { filename: 'a.csv', contentType: 'text/csv' });
    for (let i = 0; i < 6; i++) fields.field(`extra${i}`, 'x');
    refused(await fields, 400, 'invalid_upload');

    const huge = await designer.post(path()).field('corner', 'x'.repeat(70 * 1024)).attach('file', Buffer.from('point,x,y,z\n'), { filename: 'a.csv', contentType: 'text/csv' });
    expect(huge.status, JSON.stringify(huge.body)).toBe(400);

    const unknownField = await designer.post(path()).field('evil', '1').attach('file', Buffer.from('point,x,y,z\n'), { filename: 'a.csv', contentType: 'text/csv' });
    expect(refused(unknownField, 400, 'invalid_input')).toContain('evil');

    const wrongField = await designer.post(path()).attach('upload', Buffer.from('point,x,y,z\n'), { filename: 'a.csv', contentType: 'text/csv' });
    expect(wrongField.status).toBe(400);
    expect(await stored()).toBe(before);
  });

  it('UTF-16 text (a spreadsheet\u2019s "Unicode text"), a path in the file name and a JSON bomb are refused with a message', async () => {
    const utf16 = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('point,x,y,z\r\ntieRodInner,1,2,3\r\n', 'utf16le')]);
    expect(refused(await upload('unicode.csv', utf16, 'text/plain'), 415, 'not_text')).toMatch(/UTF-8|binary/);

    // The name is only echoed in messages, never used as a path.
    const traversal = await upload('../../../../etc/passwd.csv', 'point,x,y,z\n=1,2,3,4\n');
    expect(traversal.status).toBe(400);

    const deep = '['.repeat(100_000) + ']'.repeat(100_000);
    const bomb = await upload('deep.json', deep, 'application/json');
    expect(bomb.status, JSON.stringify(bomb.body).slice(0, 300)).toBeGreaterThanOrEqual(400);
    expect(bomb.status).toBeLessThan(500);
    expect(typeof bomb.body.error.message).toBe('string');
    await designer.get('/api/auth/me').expect(200);
    expect(await stored()).toBe(before);
  });

  it('a multipart body to a JSON route is refused before any route reads it (415)', async () => {
    const r = await designer.put(`/api/teams/${teamId}/axle-designs/${designId}/corner`).attach('file', Buffer.from('{}'), { filename: 'corner.json', contentType: 'application/json' });
    refused(r, 415, 'unsupported_media_type');
    expect(await stored()).toBe(before);
  });
});
