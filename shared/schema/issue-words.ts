/**
 * A zod issue in the user's words, for screens: the value and what is wrong
 * with it ("5 is outside −1 to 1"), never a document key or zod's own
 * wording. The one mapping from schema issues to words: forms that validate
 * through a shared schema (the intent panel, the vehicle form) show these
 * beside the field the issue's path names.
 *
 * Pure functions over the issue's data; no zod import (the type is
 * structural), so a browser bundle pays nothing for it.
 */
import { formatRangeValue, type InputRange } from './ranges.js';

/** The parts of a zod (v4) issue this reads. */
export interface SchemaIssue {
  readonly code: string;
  readonly path: ReadonlyArray<PropertyKey>;
  readonly message: string;
  readonly expected?: unknown;
  readonly minimum?: unknown;
  readonly maximum?: unknown;
  readonly inclusive?: boolean;
  readonly values?: ReadonlyArray<unknown>;
  readonly params?: unknown;
  readonly errors?: ReadonlyArray<ReadonlyArray<SchemaIssue>>;
  readonly keys?: ReadonlyArray<string>;
}

/** What `inRange` (schema/ranged.ts) attaches to its issue, so the words can name the range. */
export interface RangeIssueParams {
  readonly range: InputRange;
  readonly value: number;
}

/** A number as a person writes it in a message: up to 4 significant digits, a true minus sign. */
export function wordNumber(v: number): string {
  return formatRangeValue(v).replace(/^-/, '−').replace(/e-/, 'e−');
}

/**
 * Writes a figure stored in `unit` in the user's unit system: the number (as `wordNumber` writes it) and the
 * unit it is now in. Screens pass theirs (a length in mm becomes inches for an inch/pound user); without one,
 * figures stay in their stored unit.
 */
export type FigureWords = (value: number, unit: string) => { value: string; unit: string };

const storedUnit: FigureWords = (v, unit) => ({ value: wordNumber(v), unit });

/** A number with a unit, then the unit, in a message ("25.4 mm", "−100 to 100 mm"), for the units named. */
const messageFigure = (units: readonly string[]) =>
  new RegExp(`([−-]?\\d+(?:\\.\\d+)?(?:e[−-]?\\d+)?)(?:(\\s+to\\s+)([−-]?\\d+(?:\\.\\d+)?(?:e[−-]?\\d+)?))?\\s+(${units.map((u) => u.replace(/[/.]/g, '\\$&')).join('|')})(?![\\w/])`, 'g');
const LENGTHS = messageFigure(['mm']);

/**
 * A message's figures in `units` ("the lowest, 25 mm, …", "−100 to 100 mm"; by default lengths in mm)
 * rewritten with `figure`: form messages here, and labels that carry a figure (a study output's "over a
 * 10 mm bump … at 100 km/h") wherever they are shown in the reader's units.
 */
export function figuresIn(message: string, figure: FigureWords, units: readonly string[] = ['mm']): string {
  if (figure === storedUnit) return message;
  const num = (t: string) => Number(t.replace(/−/g, '-'));
  const pattern = units.length === 1 && units[0] === 'mm' ? LENGTHS : messageFigure(units);
  return message.replace(pattern, (_all, a: string, to: string | undefined, b: string | undefined, unit: string) => {
    const fa = figure(num(a), unit);
    if (to === undefined || b === undefined) return `${fa.value} ${fa.unit}`;
    const fb = figure(num(b), unit);
    return `${fa.value}${to}${fb.value} ${fb.unit}`;
  });
}

function valueAt(input: unknown, path: ReadonlyArray<PropertyKey>): unknown {
  let v: unknown = input;
  for (const p of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[p];
  }
  return v;
}

function rangeParams(params: unknown): RangeIssueParams | null {
  const p = params as Partial<RangeIssueParams> | undefined;
  return p && typeof p === 'object' && p.range && typeof p.value === 'number' ? (p as RangeIssueParams) : null;
}

/**
 * The issue in words. `input` is the document that was checked (the value
 * at the issue's path is read from it); `labels` replaces document keys a
 * custom message may still carry (`{ 'tieRodInner.z': 'the inner end's height' }`);
 * `figure` writes its figures in the user's units (ranges, and lengths in mm
 * within a message).
 */
export function issueWords(issue: SchemaIssue, input: unknown, labels: Readonly<Record<string, string>> = {}, figure: FigureWords = storedUnit): string {
  const value = valueAt(input, issue.path);
  const withUnit = (v: number, unit: string) => {
    if (!unit) return wordNumber(v);
    const f = figure(v, unit);
    return `${f.value} ${f.unit}`;
  };
  switch (issue.code) {
    case 'invalid_type':
      if (issue.expected === 'number') return 'enter a number';
      if (value === undefined) return 'required';
      return `expected ${String(issue.expected)}`;
    case 'too_small':
    case 'too_big': {
      const bound = Number(issue.code === 'too_small' ? issue.minimum : issue.maximum);
      const shown = typeof value === 'number' ? wordNumber(value) : 'This';
      if (!Number.isFinite(bound)) return issue.message;
      if (typeof value !== 'number') return issue.code === 'too_small' ? `at least ${wordNumber(bound)} needed` : `at most ${wordNumber(bound)} allowed`;
      if (issue.code === 'too_small') return issue.inclusive === false ? `${shown} must be above ${wordNumber(bound)}` : `${shown} is below the least allowed, ${wordNumber(bound)}`;
      return issue.inclusive === false ? `${shown} must be below ${wordNumber(bound)}` : `${shown} is above the most allowed, ${wordNumber(bound)}`;
    }
    case 'invalid_value':
      return `choose one of ${(issue.values ?? []).map(String).join(', ')}`;
    case 'unrecognized_keys':
      return `not expected here: ${(issue.keys ?? []).join(', ')}`;
    case 'invalid_union': {
      // The branch the input was meant for is the one without unknown keys: its issues are the ones to read.
      const meant = (issue.errors ?? []).find((branch) => branch.length > 0 && branch.every((i) => i.code !== 'unrecognized_keys'));
      const first = meant?.[0];
      return first ? issueWords({ ...first, path: [...issue.path, ...first.path] }, input, labels, figure) : figuresIn(replaceKeys(issue.message, labels), figure);
    }
    case 'custom': {
      const r = rangeParams(issue.params);
      if (r) {
        const low = r.range.minExclusive ? `above ${withUnit(r.range.min, r.range.unit)}` : null;
        return low
          ? `${withUnit(r.value, r.range.unit)} is outside the possible ${r.range.label}: give a value ${low} and at most ${withUnit(r.range.max, r.range.unit)}`
          : `${r.range.unit ? figure(r.value, r.range.unit).value : wordNumber(r.value)} is outside ${r.range.unit ? figure(r.range.min, r.range.unit).value : wordNumber(r.range.min)} to ${withUnit(r.range.max, r.range.unit)}`;
      }
      return figuresIn(replaceKeys(issue.message, labels), figure);
    }
    default:
      return figuresIn(replaceKeys(issue.message, labels), figure);
  }
}

/** Longest keys first, so `tieRodInner.z` is replaced before `tieRodInner`. */
function replaceKeys(message: string, labels: Readonly<Record<string, string>>): string {
  let out = message;
  for (const key of Object.keys(labels).sort((a, b) => b.length - a.length)) out = out.split(key).join(labels[key]);
  return out;
}
