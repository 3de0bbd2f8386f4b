import { describe, expect, it } from 'vitest';
import type { Corner } from '../../../shared/schema/corner.js';
import { exampleCorners } from '../../../shared/kinematics/examples.js';
import {
  hardpointCsv,
  hardpointJson,
  isJsonFile,
  MAX_IMPORT_ROWS,
  parseDecimal,
  prepareHardpointImport,
  readHardpointCsv,
  readHardpointJson,
  readPastedBlock,
} from '../../../shared/io/hardpoints.js';
import { getPoint } from '../../../shared/io/hardpoint-points.js';
import { IDENTITY_FRAME } from '../../../shared/io/cad-frame.js';
import { cadFrameSchema } from '../../../shared/io/cad-frame-schema.js';

const corner: Corner = exampleCorners.fsFrontWishbone;

describe('hardpoint import and export', () => {
  it('reads decimal points, decimal commas, plus signs and Unicode minus', () => {
    expect(parseDecimal('12.5')).toBe(12.5);
    expect(parseDecimal(' 12,5 ')).toBe(12.5);
    expect(parseDecimal('+3')).toBe(3);
    expect(parseDecimal('\u221255')).toBe(-55);
    expect(parseDecimal('1e2')).toBe(100);
    expect(parseDecimal('12.5.1')).toBeNull();
    expect(parseDecimal('abc')).toBeNull();
    expect(parseDecimal('')).toBeNull();
  });

  it('round-trips its own CSV export', () => {
    const csv = hardpointCsv(corner, 'FS front');
    expect(csv).toContain('# Units: mm');
    expect(csv).toContain('x forward, y left, z up');
    const r = readHardpointCsv(csv, corner);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.points.get('points.tieRodInner')).toEqual(corner.points.tieRodInner);
    expect(r.points.size).toBeGreaterThanOrEqual(10);
  });

  it('reads a semicolon file with decimal commas and a byte-order mark', () => {
    const text = '\uFEFFpoint;x (mm);y (mm);z (mm)\r\ntieRodInner;-55,5;210;162,25\r\nLower ball joint;2;570;130\r\n';
    const r = readHardpointCsv(text, corner);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.points.get('points.tieRodInner')).toEqual([-55.5, 210, 162.25]);
    expect(r.points.get('points.lowerOuter')).toEqual([2, 570, 130]);
    expect(r.notes[0]).toContain('stay as they are');
  });

  it('names every bad row and returns no points when any row is bad', () => {
    const text = 'point,x,y,z\ntieRodInner,-55,210,abc\nsteeringWheel,1,2,3\nlowerOuter,2,570,130\nlowerOuter,2,570,130\n';
    const r = readHardpointCsv(text, corner);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toEqual([
      'Line 2 (tieRodInner): z "abc" is not a number.',
      'Line 3 (steeringWheel): not a point of this double-wishbone corner.',
      'Line 5 (lowerOuter): points.lowerOuter is listed twice.',
    ]);
  });

  it('asks for a header and refuses coordinates in another unit', () => {
    const noHeader = readHardpointCsv('tieRodInner,1,2,3\n', corner);
    expect(noHeader.ok).toBe(false);
    const inches = readHardpointCsv('point,x (in),y (in),z (in)\ntieRodInner,1,2,3\n', corner);
    expect(inches.ok).toBe(false);
    if (!inches.ok) expect(inches.errors[0]).toContain('must be in mm');
  });

  it('reads its own JSON export and refuses a corner of another type', () => {
    const r = readHardpointJson(hardpointJson(corner, 'FS front'), corner);
    expect(r.ok).toBe(true);
    const strut = readHardpointJson(JSON.stringify(exampleCorners.roadFrontStrut), corner);
    expect(strut.ok).toBe(false);
    if (!strut.ok) expect(strut.errors[0]).toContain('strut');
    const broken = readHardpointJson('{"type":"double-wishbone","points":{"tieRodInner":[1,2]}}', corner);
    expect(broken.ok).toBe(false);
    if (!broken.ok) expect(broken.errors[0]).toContain('points.tieRodInner');
  });

  it('splits a pasted spreadsheet block into rows of numbers', () => {
    expect(readPastedBlock('1\t2\t3\n4,5\t5\t6\n').rows).toEqual([{ values: [1, 2, 3] }, { values: [4.5, 5, 6] }]);
    expect(readPastedBlock('tieRodInner\t1\t2\t3').rows).toEqual([{ label: 'tieRodInner', values: [1, 2, 3] }]);
  });

  it('refuses a file with more rows than an import takes', () => {
    const r = readHardpointCsv('point,x,y,z\n' + 'tieRodInner,1,2,3\n'.repeat(MAX_IMPORT_ROWS + 1), corner);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors).toEqual([`The file has ${MAX_IMPORT_ROWS + 1} rows; an import takes at most ${MAX_IMPORT_ROWS}.`]);
  });

  it('tells JSON from CSV by the name or a leading brace', () => {
    expect(isJsonFile('a.json', 'x')).toBe(true);
    expect(isJsonFile('a.txt', '\uFEFF  {"corner":1}')).toBe(true);
    expect(isJsonFile('a.csv', 'point,x,y,z')).toBe(false);
  });
});

describe('prepareHardpointImport', () => {
  const [x, y, z] = corner.points.tieRodInner;

  it('merges the file into a copy of the corner and lists only what moves', () => {
    const r = prepareHardpointImport(corner, 'p.csv', `point,x,y,z\ntieRodInner,${x},${y},${z + 3}\nlowerOuter,${corner.points.lowerOuter.join(',')}\n`);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(getPoint(r.corner, 'points.tieRodInner')).toEqual([x, y, z + 3]);
    expect(corner.points.tieRodInner).toEqual([x, y, z]);
    expect(r.changedPoints).toEqual([{ key: 'points.tieRodInner', name: 'Tie rod, inner end (rack)', current: [x, y, z], imported: [x, y, z + 3], movedMm: 3 }]);
  });

  it('maps from a CAD frame (y right, z down, metres) before merging', () => {
    const frame = { ...IDENTITY_FRAME, axes: ['+x', '-y', '-z'] as const, unit: 'm' as const };
    const r = prepareHardpointImport(corner, 'cad.csv', `point,x,y,z\ntieRodInner,${x / 1000},${-y / 1000},${-(z + 2) / 1000}\n`, frame);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    getPoint(r.corner, 'points.tieRodInner')!.forEach((v, i) => expect(v).toBeCloseTo([x, y, z + 2][i]!, 9));
    expect(r.warnings.some((w) => w.includes('left-handed'))).toBe(false);
  });

  it('warns about a left-handed frame and a file that moves nothing; refuses a frame with a repeated axis', () => {
    const left = prepareHardpointImport(corner, 'p.csv', `point,x,y,z\ntieRodInner,${x},${-y},${z}\n`, { ...IDENTITY_FRAME, axes: ['+x', '-y', '+z'] });
    expect(left.ok && left.warnings.some((w) => w.includes('left-handed'))).toBe(true);
    expect(left.ok && left.warnings.some((w) => w.includes('moves no point'))).toBe(true);
    const repeated = prepareHardpointImport(corner, 'p.csv', 'point,x,y,z\n', { ...IDENTITY_FRAME, axes: ['+x', '+x', '+z'] });
    expect(repeated.ok).toBe(false);
  });

  it('validates a frame sent over the wire', () => {
    expect(cadFrameSchema.safeParse(IDENTITY_FRAME).success).toBe(true);
    expect(cadFrameSchema.safeParse({ ...IDENTITY_FRAME, unit: 'furlong' }).success).toBe(false);
    expect(cadFrameSchema.safeParse({ ...IDENTITY_FRAME, originMm: [0, 0, Infinity] }).success).toBe(false);
  });
});
