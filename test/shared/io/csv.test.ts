/**
 * The one CSV writer (issue 12 §6): every CSV the browser writes (hardpoint
 * export, chart data, compare) and the server's exports escape spreadsheet
 * formulas and line breaks alike. The formula rule is the OWASP "CSV
 * injection" advice (common practice): a text cell starting with = + - @,
 * tab or CR gets a leading apostrophe. Read back with papaparse, an
 * independent RFC 4180 reader.
 */
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { csvCell, toCsv } from '../../../shared/io/csv.js';
import { hardpointCsv, readHardpointCsv } from '../../../shared/io/hardpoints.js';
import { exampleCorners } from '../../../shared/kinematics/examples.js';
import { toCsv as chartCsv } from '../../../src/app/charts/csv.js';

const evil = '=HYPERLINK("http://attacker.example","click")';
const read = (csv: string) => Papa.parse<string[]>(csv, { skipEmptyLines: true, comments: '#' }).data;

describe('toCsv', () => {
  it('prefixes formula-like text with an apostrophe and never changes a number', () => {
    const rows = read(toCsv(['value', 'note'], [[-5, evil], [-0.25, '-3 mm'], [1e-7, '+1'], [42, '@SUM(A1:A2)'], [0, '\tcmd'], [1, 'plain text']]));
    expect(rows.slice(1).map((r) => r[0])).toEqual(['-5', '-0.25', '1e-7', '42', '0', '1']);
    expect(rows.slice(1).map((r) => r[1])).toEqual([`'${evil}`, "'-3 mm", "'+1", "'@SUM(A1:A2)", "'\tcmd", 'plain text']);
  });

  it('keeps formatted numbers as numbers (the chart tables hold text such as "-1.25")', () => {
    expect(['-1.25', '-0.08', '3e-4', '-.5', '12'].map(csvCell)).toEqual(['-1.25', '-0.08', '3e-4', '-.5', '12']);
    expect(['-1-1', '-1.2.3', '- 1', '-1,5'].map(csvCell)).toEqual(["\"'-1-1\"", "\"'-1.2.3\"", "\"'- 1\"", "\"'-1,5\""]);
  });

  it('keeps a line break inside its quoted cell, and puts a comment line on one line', () => {
    const csv = toCsv(['name'], [['two\r\nlines'], ['a "quote", and a comma']], ['Title\r\n=cmd|calc']);
    expect(csv.split('\r\n')[0]).toBe('# Title =cmd|calc');
    expect(read(csv)).toEqual([['name'], ['two\r\nlines'], ['a "quote", and a comma']]);
  });

  it('escapes the header and empties non-finite numbers and missing cells', () => {
    expect(toCsv(['=x', 'y'], [[NaN, null]])).toBe(`"'=x",y\r\n,\r\n`);
  });
});

describe('the browser writes through it', () => {
  it('chart data: a series named like a formula is escaped', () => {
    const rows = read(chartCsv(['Wheel travel (mm)', `${evil}: Toe (deg)`], [['-20', '-0.08']], ['Toe against wheel travel']));
    expect(rows[0]![1]).toBe(`'${evil}: Toe (deg)`);
    expect(rows[1]).toEqual(['-20', '-0.08']);
  });

  it('hardpoint export: a corner named like a formula, with a line break, exports safely and reads back', () => {
    const corner = exampleCorners.fsFrontWishbone;
    const csv = hardpointCsv(corner, `${evil}\n@evil`);
    expect(csv.split('\r\n')[0]).toBe(`# ${evil} @evil`);
    const r = readHardpointCsv(csv, corner);
    expect(r.ok).toBe(true);
  });
});
