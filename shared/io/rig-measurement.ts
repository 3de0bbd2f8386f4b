/**
 * Bump-steer rig measurements: toe (and optionally camber) against wheel
 * travel, read from CSV text (docs/rig-measurements.md).
 *
 * Two steps: `previewRigCsv` shows the first rows and the columns it found
 * and proposes a mapping; `readRigCsv` applies a mapping (which column is
 * travel, toe, camber; their units and sign conventions) and returns every
 * point in Rollwise's conventions (domain.md: travel mm, + bump; toe deg,
 * toe-in positive; camber deg, top leaning outboard positive), or every
 * problem by line. Nothing is returned unless the whole file is good.
 * Same CSV reading as the hardpoint import (papaparse; comma, semicolon or
 * tab; decimal commas; a byte-order mark; `#` comment lines).
 */
import Papa from 'papaparse';
import { detectDelimiter, parseDecimal } from './hardpoints.js';
import { RAD_PER_DEG } from '../angles.js';

/** Limits of one rig file: bytes (the upload limit of the API) and data rows. */
export const RIG_LIMITS = {
  maxBytes: 256 * 1024,
  maxRows: 2000,
  /** Fewest data rows a comparison can use. */
  minRows: 3,
} as const;

/**
 * Plausibility bounds after unit conversion. A value beyond them is nearly
 * always a unit mistake (minutes of arc read as degrees, inches as mm), so
 * the line is refused with that hint. Travel: off-road cars run a few
 * hundred mm (domain.md, common practice); toe and camber: a bump-steer
 * sweep moves them by a few degrees at most (common practice).
 */
export const RIG_BOUNDS = { travelMm: 1000, toeDeg: 15, camberDeg: 15 } as const;

export const TRAVEL_UNITS = ['mm', 'in'] as const;
export const TOE_UNITS = ['deg', 'arcmin', 'mm-at-rim'] as const;
export const CAMBER_UNITS = ['deg', 'arcmin'] as const;
export const TRAVEL_SIGNS = ['bump-positive', 'rebound-positive'] as const;
export const TOE_SIGNS = ['toe-in-positive', 'toe-out-positive'] as const;
export const CAMBER_SIGNS = ['top-out-positive', 'top-in-positive'] as const;

export type TravelUnit = (typeof TRAVEL_UNITS)[number];
export type ToeUnit = (typeof TOE_UNITS)[number];
export type CamberUnit = (typeof CAMBER_UNITS)[number];

const MM_PER_IN = 25.4;
const DEG_PER_ARCMIN = 1 / 60;

/**
 * Which column holds what (0-based column indexes of the file), units and
 * signs. Checked at the API door by `rigMappingSchema`
 * (shared/io/rig-mapping-schema.ts, kept apart so the app can read files
 * without loading zod).
 */
export interface RigMapping {
  /** The first non-comment line names the columns (else every line is data). */
  hasHeader: boolean;
  travelColumn: number;
  toeColumn: number;
  /** Null or absent: the file has no camber. */
  camberColumn?: number | null | undefined;
  travelUnit: TravelUnit;
  toeUnit: ToeUnit;
  camberUnit?: CamberUnit | undefined;
  /** Reference diameter for toe given as mm at the rim (the distance between the measuring points across the wheel). */
  rimDiameterMm?: number | undefined;
  travelSign: (typeof TRAVEL_SIGNS)[number];
  toeSign: (typeof TOE_SIGNS)[number];
  camberSign?: (typeof CAMBER_SIGNS)[number] | undefined;
}

/** One measured point in Rollwise's conventions, with the file line it came from. */
export interface RigPoint {
  /** Wheel travel from design height, mm, + bump. */
  travelMm: number;
  /** Toe, deg, toe-in positive. */
  toeDeg: number;
  /** Camber, deg, top leaning outboard positive; null when the file has none. */
  camberDeg: number | null;
  /** 1-based line of the file. */
  line: number;
}

export type RigRead =
  | { readonly ok: true; readonly points: RigPoint[]; readonly hasCamber: boolean; readonly notes: string[] }
  | { readonly ok: false; readonly errors: string[] };

/** What a file looks like before mapping: its columns, first rows and a proposed mapping. */
export interface RigPreview {
  delimiter: ',' | ';' | '\t';
  hasHeader: boolean;
  /** Column names (from the header, else "Column 1", "Column 2", …). */
  columns: string[];
  /** First data rows as text cells, with their lines. */
  rows: { line: number; cells: string[] }[];
  /** Data rows in the whole file. */
  rowCount: number;
  /** A mapping guessed from the column names; null when no travel and toe columns could be told. */
  proposed: RigMapping | null;
  /** Why a column or unit was or was not proposed. */
  notes: string[];
}

/** At most this many line errors are listed; the rest are counted. */
const MAX_LISTED_ERRORS = 20;
const PREVIEW_ROWS = 8;

function stripBom(text: string): string {
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

interface Row {
  line: number;
  cells: string[];
}

function tableRows(text: string): { delimiter: ',' | ';' | '\t'; rows: Row[] } {
  const clean = stripBom(text);
  const delimiter = detectDelimiter(clean);
  const parsed = Papa.parse<string[]>(clean, { delimiter, skipEmptyLines: false });
  const rows = parsed.data
    .map((cells, i) => ({ line: i + 1, cells: cells.map((c) => c.trim()) }))
    .filter((r) => r.cells.some((c) => c !== '') && !r.cells[0]!.startsWith('#'));
  return { delimiter, rows };
}

/** A line is a header when one of its cells is not a number. */
function looksLikeHeader(cells: string[]): boolean {
  return cells.some((c) => c !== '' && parseDecimal(c) === null);
}

/** The unit written in a column name, e.g. "Toe (arcmin)" or "travel [in]"; null when none is given. */
export function headerUnit(name: string): string | null {
  const m = /[([]\s*([^)\]]+?)\s*[)\]]\s*$/.exec(name);
  return m ? m[1]!.toLowerCase() : null;
}

const UNIT_WORDS: Record<'travel' | 'toe' | 'camber', Record<string, string>> = {
  travel: { mm: 'mm', in: 'in', inch: 'in', inches: 'in', '"': 'in' },
  toe: { deg: 'deg', '°': 'deg', degree: 'deg', degrees: 'deg', arcmin: 'arcmin', min: 'arcmin', "'": 'arcmin', 'mm at rim': 'mm-at-rim', mm: 'mm-at-rim', 'mm-at-rim': 'mm-at-rim' },
  camber: { deg: 'deg', '°': 'deg', degree: 'deg', degrees: 'deg', arcmin: 'arcmin', min: 'arcmin', "'": 'arcmin' },
};

/** The accepted unit a column name states for a quantity, `undefined` when it states none, null when it states one we do not accept. */
function statedUnit(name: string, quantity: 'travel' | 'toe' | 'camber'): string | null | undefined {
  const u = headerUnit(name);
  if (u === null) return undefined;
  return UNIT_WORDS[quantity][u] ?? null;
}

/**
 * First look at a file: the delimiter, the columns, the first rows and a
 * mapping proposed from the column names (travel / wheel / bump / z;
 * toe; camber; units in brackets). The mapping is a proposal for a person
 * to confirm, never applied silently.
 */
export function previewRigCsv(text: string): { ok: true; preview: RigPreview } | { ok: false; errors: string[] } {
  const size = sizeProblem(text);
  if (size) return { ok: false, errors: [size] };
  const { delimiter, rows } = tableRows(text);
  if (rows.length === 0) return { ok: false, errors: ['The file has no rows.'] };
  const hasHeader = looksLikeHeader(rows[0]!.cells);
  const width = Math.max(...rows.slice(0, 50).map((r) => r.cells.length));
  const columns = hasHeader ? rows[0]!.cells.map((c, i) => c || `Column ${i + 1}`) : Array.from({ length: width }, (_, i) => `Column ${i + 1}`);
  const data = hasHeader ? rows.slice(1) : rows;
  const notes: string[] = [];
  const lower = columns.map((c) => c.toLowerCase());
  const find = (test: RegExp) => lower.findIndex((c) => test.test(c));
  const travel = find(/travel|jounce|wheel\s*z|^z\b|heave|stroke|^bump(?!\s*steer)/);
  const toe = find(/toe|bump\s*steer/);
  const camberCol = find(/camber/);
  let proposed: RigMapping | null = null;
  if (travel >= 0 && toe >= 0 && travel !== toe) {
    const tu = statedUnit(columns[travel]!, 'travel');
    const ou = statedUnit(columns[toe]!, 'toe');
    const cu = camberCol >= 0 ? statedUnit(columns[camberCol]!, 'camber') : undefined;
    if (tu === undefined) notes.push(`"${columns[travel]}" states no unit; mm is proposed.`);
    if (ou === undefined) notes.push(`"${columns[toe]}" states no unit; degrees are proposed.`);
    for (const [col, u] of [
      [travel, tu],
      [toe, ou],
      [camberCol, cu],
    ] as const) {
      if (u === null) notes.push(`"${columns[col]}" states a unit Rollwise does not read; choose the unit by hand (docs/rig-measurements.md lists them).`);
    }
    proposed = {
      hasHeader,
      travelColumn: travel,
      toeColumn: toe,
      camberColumn: camberCol >= 0 && camberCol !== travel && camberCol !== toe ? camberCol : null,
      travelUnit: (tu ?? 'mm') as TravelUnit,
      toeUnit: ou === 'mm-at-rim' || ou === null || ou === undefined ? 'deg' : (ou as ToeUnit),
      ...(camberCol >= 0 ? { camberUnit: (cu ?? 'deg') as CamberUnit, camberSign: 'top-out-positive' as const } : {}),
      travelSign: 'bump-positive',
      toeSign: 'toe-in-positive',
    };
    if (ou === 'mm-at-rim') notes.push(`"${columns[toe]}" is in mm: choose "mm at the rim" and give the reference diameter.`);
    notes.push('Signs are proposed as Rollwise uses them (bump positive, toe-in positive, camber top-out positive); check them against the rig.');
  } else {
    notes.push('Travel and toe columns could not be told from the column names; choose them by hand.');
  }
  return {
    ok: true,
    preview: { delimiter, hasHeader, columns, rows: data.slice(0, PREVIEW_ROWS), rowCount: data.length, proposed, notes },
  };
}

function sizeProblem(text: string): string | null {
  const bytes = new TextEncoder().encode(text).length;
  return bytes > RIG_LIMITS.maxBytes ? `The file is ${Math.ceil(bytes / 1024)} kB; a rig file may be at most ${RIG_LIMITS.maxBytes / 1024} kB.` : null;
}

/** Toe in degrees (toe-in positive) from a value in the file's unit and sign. */
function toeToDeg(v: number, m: RigMapping): number {
  const deg = m.toeUnit === 'deg' ? v : m.toeUnit === 'arcmin' ? v * DEG_PER_ARCMIN : Math.asin(Math.max(-1, Math.min(1, v / m.rimDiameterMm!))) / RAD_PER_DEG;
  return m.toeSign === 'toe-in-positive' ? deg : -deg;
}

/**
 * Reads every data row with a mapping. Each bad row is named by its line
 * (not a number, a unit the header contradicts, a value beyond the
 * plausibility bounds); the file is refused when it has fewer than
 * `RIG_LIMITS.minRows` or more than `RIG_LIMITS.maxRows` rows, or fewer
 * than two distinct travels.
 */
export function readRigCsv(text: string, mapping: RigMapping): RigRead {
  const size = sizeProblem(text);
  if (size) return { ok: false, errors: [size] };
  const { rows } = tableRows(text);
  if (rows.length === 0) return { ok: false, errors: ['The file has no rows.'] };
  const m = mapping;
  const errors: string[] = [];
  let data = rows;
  if (m.hasHeader) {
    const header = rows[0]!;
    data = rows.slice(1);
    const check = (col: number | null | undefined, quantity: 'travel' | 'toe' | 'camber', chosen: string | undefined) => {
      if (col === null || col === undefined) return;
      const name = header.cells[col];
      if (name === undefined) {
        errors.push(`Line ${header.line}: the header has ${header.cells.length} columns; there is no column ${col + 1} for ${quantity}.`);
        return;
      }
      const stated = statedUnit(name, quantity);
      if (stated === null) errors.push(`Line ${header.line}: the ${quantity} column "${name}" is in a unit Rollwise does not read (${quantity === 'travel' ? 'mm or in' : quantity === 'toe' ? 'deg, arcmin or mm at the rim' : 'deg or arcmin'}).`);
      else if (stated !== undefined && stated !== chosen) errors.push(`Line ${header.line}: the ${quantity} column "${name}" says ${stated}, but the mapping reads it as ${chosen}.`);
    };
    check(m.travelColumn, 'travel', m.travelUnit);
    check(m.toeColumn, 'toe', m.toeUnit);
    check(m.camberColumn, 'camber', m.camberUnit ?? 'deg');
  } else if (looksLikeHeader(rows[0]!.cells)) {
    errors.push(`Line ${rows[0]!.line}: this line is not numbers; tick "the first line names the columns" if it is a header.`);
  }
  if (errors.length > 0) return { ok: false, errors };
  if (data.length > RIG_LIMITS.maxRows) return { ok: false, errors: [`The file has ${data.length} data rows; a rig file may have at most ${RIG_LIMITS.maxRows}.`] };
  if (data.length < RIG_LIMITS.minRows) return { ok: false, errors: [`The file has ${data.length} data row(s); a comparison needs at least ${RIG_LIMITS.minRows}.`] };

  const hasCamber = m.camberColumn !== null && m.camberColumn !== undefined;
  const points: RigPoint[] = [];
  let extra = 0;
  const fail = (msg: string) => {
    if (errors.length < MAX_LISTED_ERRORS) errors.push(msg);
    else extra++;
  };
  for (const row of data) {
    const cell = (col: number) => row.cells[col] ?? '';
    const travelRaw = parseDecimal(cell(m.travelColumn));
    const toeRaw = parseDecimal(cell(m.toeColumn));
    const camberRaw = hasCamber ? parseDecimal(cell(m.camberColumn!)) : null;
    const bad: string[] = [];
    if (travelRaw === null) bad.push(`travel "${cell(m.travelColumn)}"`);
    if (toeRaw === null) bad.push(`toe "${cell(m.toeColumn)}"`);
    if (hasCamber && camberRaw === null) bad.push(`camber "${cell(m.camberColumn!)}"`);
    if (bad.length > 0) {
      fail(`Line ${row.line}: ${bad.join(', ')} ${bad.length === 1 ? 'is' : 'are'} not a number.`);
      continue;
    }
    const travelMm = (m.travelUnit === 'in' ? travelRaw! * MM_PER_IN : travelRaw!) * (m.travelSign === 'bump-positive' ? 1 : -1);
    if (m.toeUnit === 'mm-at-rim' && Math.abs(toeRaw!) >= m.rimDiameterMm!) {
      fail(`Line ${row.line}: toe ${toeRaw} mm is not smaller than the reference diameter ${m.rimDiameterMm} mm.`);
      continue;
    }
    const toeDeg = toeToDeg(toeRaw!, m);
    const camberDeg = hasCamber ? (m.camberUnit === 'arcmin' ? camberRaw! * DEG_PER_ARCMIN : camberRaw!) * (m.camberSign === 'top-in-positive' ? -1 : 1) : null;
    const beyond: string[] = [];
    if (Math.abs(travelMm) > RIG_BOUNDS.travelMm) beyond.push(`travel ${round(travelMm)} mm is beyond ±${RIG_BOUNDS.travelMm} mm`);
    if (Math.abs(toeDeg) > RIG_BOUNDS.toeDeg) beyond.push(`toe ${round(toeDeg)}° is beyond ±${RIG_BOUNDS.toeDeg}°`);
    if (camberDeg !== null && Math.abs(camberDeg) > RIG_BOUNDS.camberDeg) beyond.push(`camber ${round(camberDeg)}° is beyond ±${RIG_BOUNDS.camberDeg}°`);
    if (beyond.length > 0) {
      fail(`Line ${row.line}: ${beyond.join('; ')}: check the unit chosen for that column.`);
      continue;
    }
    points.push({ travelMm, toeDeg, camberDeg, line: row.line });
  }
  if (extra > 0) errors.push(`…and ${extra} more line(s) with problems.`);
  if (errors.length > 0) return { ok: false, errors };
  const distinct = new Set(points.map((p) => p.travelMm)).size;
  if (distinct < 2) return { ok: false, errors: ['Every row has the same travel; a bump-steer comparison needs the wheel moved through a range.'] };
  const notes: string[] = [];
  if (!points.some((p) => p.travelMm <= 0) || !points.some((p) => p.travelMm >= 0)) {
    notes.push('The travels do not span design height (0 mm): the comparison can only use absolute values.');
  }
  return { ok: true, points, hasCamber, notes };
}

const round = (x: number) => Number(x.toPrecision(4));
