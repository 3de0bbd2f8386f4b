import Papa from 'papaparse';
import { toCsv } from './csv.js';
import type { Corner, Vec3 } from '../schema/corner.js';
import { getPoint, hardpointRows, pointName, withPoints } from './hardpoint-points.js';
import { frameProblems, isRightHanded, mapCadPoints, type CadFrame, IDENTITY_FRAME } from './cad-frame.js';

/** Most data rows one import may hold (a corner has under 30 points; this leaves room for comments). */
export const MAX_IMPORT_ROWS = 500;

/** Header lines of every export: units and the sign convention, so a file explains itself. */
export const EXPORT_CONVENTION = [
  'Rollwise corner hardpoints: LEFT corner (the right corner is its mirror, y -> -y)',
  'Units: mm',
  'Axes: ISO 8855 vehicle axes, x forward, y left, z up; origin on the ground under the front axle centre',
];

/** Outcome of reading hardpoints from text: every point, or every problem (nothing half-applied). */
export type HardpointImport =
  | { readonly ok: true; readonly points: ReadonlyMap<string, Vec3>; readonly notes: readonly string[] }
  | { readonly ok: false; readonly errors: readonly string[] };

/**
 * A number typed or pasted by a person: decimal point or decimal comma,
 * surrounding spaces, a leading plus, a Unicode minus. Null when it is not a
 * plain finite number.
 */
export function parseDecimal(text: string): number | null {
  let t = text.trim().replace(/\u2212/g, '-').replace(/^\+/, '');
  if (t === '') return null;
  if (/^-?\d+,\d+$/.test(t)) t = t.replace(',', '.');
  if (!/^-?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

/** Delimiter of a table by its first data line: semicolon and tab files may use decimal commas. */
export function detectDelimiter(text: string): ',' | ';' | '\t' {
  const line = text.split(/\r?\n/).find((l) => l.trim() !== '' && !l.trimStart().startsWith('#')) ?? '';
  if (line.includes('\t')) return '\t';
  if (line.includes(';')) return ';';
  return ',';
}

function stripBom(text: string): string {
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** Rows of cells with their 1-based line numbers; comment (#) and blank lines dropped. */
function tableRows(text: string): { line: number; cells: string[] }[] {
  // Comment lines are blanked before parsing (keeping the line count for messages): a title with quotes in it
  // would otherwise open a quoted field that swallows the header.
  const clean = stripBom(text).replace(/^[ \t]*#.*$/gm, '');
  const parsed = Papa.parse<string[]>(clean, { delimiter: detectDelimiter(clean), skipEmptyLines: false });
  return parsed.data
    .map((cells, i) => ({ line: i + 1, cells: cells.map((c) => c.trim()) }))
    .filter((r) => r.cells.some((c) => c !== '') && !r.cells[0]!.startsWith('#'));
}

/** Resolves what a file calls a point: `points.tieRodInner`, `tieRodInner` or its plain name. */
function pointResolver(corner: Corner): (label: string) => string | undefined {
  const byLabel = new Map<string, string>();
  for (const row of hardpointRows(corner)) {
    byLabel.set(row.key.toLowerCase(), row.key);
    byLabel.set(row.name.toLowerCase(), row.key);
    const bare = row.key.split('.')[1]!.toLowerCase();
    if (!byLabel.has(bare)) byLabel.set(bare, row.key);
  }
  return (label) => byLabel.get(label.trim().toLowerCase());
}

/**
 * Reads hardpoints from CSV text (comma, semicolon or tab; decimal commas
 * with semicolons or tabs; a byte-order mark). Needs a header row naming a
 * point column (`point`, `key` or `name`) and x, y, z columns. Every bad row
 * is named by its line; nothing is returned unless the whole file is good.
 */
export function readHardpointCsv(text: string, corner: Corner): HardpointImport {
  const rows = tableRows(text);
  if (rows.length === 0) return { ok: false, errors: ['The file has no rows.'] };
  if (rows.length - 1 > MAX_IMPORT_ROWS) {
    return { ok: false, errors: [`The file has ${rows.length - 1} rows; an import takes at most ${MAX_IMPORT_ROWS}.`] };
  }
  const header = rows[0]!.cells.map((h) => h.toLowerCase());
  const col = (test: (h: string) => boolean) => header.findIndex(test);
  const pointCol = col((h) => h === 'point' || h === 'key' || h === 'name' || h === 'hardpoint');
  const xyz = ['x', 'y', 'z'].map((a) => col((h) => h === a || h.startsWith(`${a} `) || h.startsWith(`${a}(`) || h.startsWith(`${a}_`)));
  if (pointCol < 0 || xyz.some((c) => c < 0)) {
    return {
      ok: false,
      errors: [
        `Line ${rows[0]!.line}: the header must name a point column ("point") and x, y and z columns; found "${rows[0]!.cells.join(', ')}".`,
      ],
    };
  }
  const unitNote = header.filter((h, i) => xyz.includes(i) && /\((?!mm\))/.test(h));
  const errors: string[] = [];
  if (unitNote.length > 0) {
    errors.push(`Line ${rows[0]!.line}: coordinates must be in mm here (found "${unitNote.join('", "')}"); use "From another CAD frame" to convert units.`);
  }
  const resolve = pointResolver(corner);
  const points = new Map<string, Vec3>();
  for (const row of rows.slice(1)) {
    const label = row.cells[pointCol] ?? '';
    const key = resolve(label);
    const where = `Line ${row.line}${label ? ` (${label})` : ''}`;
    if (!key) {
      errors.push(`${where}: not a point of this ${corner.type} corner.`);
      continue;
    }
    if (points.has(key)) {
      errors.push(`${where}: ${key} is listed twice.`);
      continue;
    }
    const values = xyz.map((c) => parseDecimal(row.cells[c] ?? ''));
    const bad = values.map((v, i) => (v === null ? `${'xyz'[i]} "${row.cells[xyz[i]!] ?? ''}"` : null)).filter(Boolean);
    if (bad.length > 0) {
      errors.push(`${where}: ${bad.join(', ')} ${bad.length === 1 ? 'is' : 'are'} not a number.`);
      continue;
    }
    points.set(key, values as Vec3);
  }
  if (errors.length > 0) return { ok: false, errors };
  if (points.size === 0) return { ok: false, errors: ['The file lists no points.'] };
  const missing = hardpointRows(corner).filter((r) => !points.has(r.key)).length;
  return {
    ok: true,
    points,
    notes: missing > 0 ? [`${missing} point(s) of the design are not in the file and stay as they are.`] : [],
  };
}

/**
 * Reads hardpoints from JSON: a Rollwise export (`{ corner }`) or a bare
 * corner document of the same type. Only the hardpoints are taken.
 */
export function readHardpointJson(text: string, corner: Corner): HardpointImport {
  let doc: unknown;
  try {
    doc = JSON.parse(stripBom(text));
  } catch (e) {
    return { ok: false, errors: [`Not valid JSON: ${e instanceof Error ? e.message : String(e)}`] };
  }
  const inner = doc && typeof doc === 'object' && 'corner' in doc ? doc.corner : doc;
  if (!inner || typeof inner !== 'object') return { ok: false, errors: ['The JSON holds no corner document.'] };
  const c = inner as Partial<Corner>;
  if (c.type !== corner.type) {
    return { ok: false, errors: [`The file holds a ${String(c.type ?? 'corner of unknown type')}; this design is a ${corner.type}.`] };
  }
  const errors: string[] = [];
  const points = new Map<string, Vec3>();
  for (const row of hardpointRows(corner)) {
    const [section, name] = row.key.split('.') as [string, string];
    const value = (c as unknown as Record<string, Record<string, unknown> | undefined>)[section]?.[name];
    if (value === undefined) continue;
    if (!Array.isArray(value) || value.length !== 3 || !value.every((v) => typeof v === 'number' && Number.isFinite(v))) {
      errors.push(`${row.key} (${row.name}): must be three numbers [x, y, z] in mm.`);
      continue;
    }
    points.set(row.key, value as Vec3);
  }
  if (errors.length > 0) return { ok: false, errors };
  if (points.size === 0) return { ok: false, errors: ['The file lists no points of this corner.'] };
  return { ok: true, points, notes: [] };
}

/** True when a file is read as JSON: by its name, or by a leading brace. */
export function isJsonFile(name: string, text: string): boolean {
  return /\.json$/i.test(name) || /^\uFEFF?\s*\{/.test(text);
}

/** Reads an import file as JSON or CSV (see `isJsonFile`). */
export function readHardpointFile(name: string, text: string, corner: Corner): HardpointImport {
  return isJsonFile(name, text) ? readHardpointJson(text, corner) : readHardpointCsv(text, corner);
}

/** CSV export: convention lines, then one row per point with its plain name. */
export function hardpointCsv(corner: Corner, title: string): string {
  return toCsv(
    ['point', 'name', 'x (mm)', 'y (mm)', 'z (mm)'],
    hardpointRows(corner).map((r) => [r.key, r.name, ...r.value]),
    [title, ...EXPORT_CONVENTION],
  );
}

/** JSON export: the corner document with its units and sign convention stated beside it. */
export function hardpointJson(corner: Corner, title: string): string {
  return (
    JSON.stringify(
      {
        title,
        units: { length: 'mm', angle: 'deg' },
        convention: EXPORT_CONVENTION.join('. '),
        corner,
      },
      null,
      2,
    ) + '\n'
  );
}

/**
 * A block pasted from a spreadsheet: rows of three numbers (x y z), or of a
 * point label and three numbers. Tab, semicolon or comma separated.
 */
export function readPastedBlock(text: string): { rows: { label?: string; values: (number | null)[] }[] } {
  const delimiter = detectDelimiter(text);
  const parsed = Papa.parse<string[]>(stripBom(text).replace(/\r?\n$/, ''), { delimiter, skipEmptyLines: true });
  return {
    rows: parsed.data.map((cells) => {
      const trimmed = cells.map((c) => c.trim());
      const first = trimmed[0] ?? '';
      if (trimmed.length >= 4 && parseDecimal(first) === null) {
        return { label: first, values: trimmed.slice(1, 4).map(parseDecimal) };
      }
      return { values: trimmed.map(parseDecimal) };
    }),
  };
}

/** One point an import moves: where it is now and where the file puts it (mm, Rollwise frame, left corner). */
export interface ChangedPoint {
  readonly key: string;
  readonly name: string;
  readonly current: Vec3;
  readonly imported: Vec3;
  readonly movedMm: number;
}

/** What an import would do, before the corner rules are checked: the merged corner, what moves, and warnings. */
export type PreparedImport =
  | { readonly ok: true; readonly corner: Corner; readonly changedPoints: ChangedPoint[]; readonly warnings: string[] }
  | { readonly ok: false; readonly errors: readonly string[] };

/**
 * Reads a file, maps its points from the CAD frame into Rollwise's and merges
 * them into `corner` (a copy). Nothing is merged unless every row is good.
 * The caller still checks the merged corner against the corner schema.
 */
export function prepareHardpointImport(corner: Corner, fileName: string, text: string, frame: CadFrame = IDENTITY_FRAME): PreparedImport {
  const problems = frameProblems(frame);
  if (problems.length > 0) return { ok: false, errors: problems };
  const read = readHardpointFile(fileName, text, corner);
  if (!read.ok) return read;
  const mapped = mapCadPoints(read.points, frame);
  const warnings = [...read.notes];
  if (!isRightHanded(frame)) {
    warnings.push('These axis directions form a left-handed frame; CAD frames are right-handed. Check the choices (or the side) before applying.');
  }
  const changedPoints: ChangedPoint[] = [];
  for (const [key, imported] of mapped) {
    const current = getPoint(corner, key)!;
    const movedMm = Math.hypot(imported[0] - current[0], imported[1] - current[1], imported[2] - current[2]);
    if (movedMm > 0) changedPoints.push({ key, name: pointName(key, corner), current, imported, movedMm });
  }
  if (changedPoints.length === 0) warnings.push('The file moves no point: every point it lists is already where it says.');
  return { ok: true, corner: withPoints(corner, mapped), changedPoints, warnings };
}
