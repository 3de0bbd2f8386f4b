import type { Permission } from '../../core/api-types';
import { apiProblem } from '../../core/http/api-error';
import type { ConfigurationResults, ConfigurationStatus, ReviewAction } from './configurations-api';
import { type QuantityKind, unitLabel } from '../../core/format/quantities';
import { formatNum } from '../../core/format/num';
import type { DisplayUnits } from '../../core/api-types';
import { resultWords, type ResultWords } from '../../../../shared/io/result-words';
import type { Difference } from './configurations-api';

/** Each status in words with an icon, so no state is told by colour alone. */
export const STATUS_WORDS: Readonly<Record<ConfigurationStatus, { label: string; icon: string }>> = {
  draft: { label: 'Draft', icon: 'edit_note' },
  in_review: { label: 'In review', icon: 'rate_review' },
  changes_requested: { label: 'Returned for rework', icon: 'construction' },
  approved: { label: 'Signed off', icon: 'signature' },
  released: { label: 'Released to build', icon: 'precision_manufacturing' },
  validated: { label: 'Validated', icon: 'verified' },
};

export interface ActionSpec {
  readonly action: ReviewAction;
  readonly label: string;
  readonly permission: Permission;
  readonly from: readonly ConfigurationStatus[];
  /** A decision: never on one's own work (the server answers 403 own_revision). */
  readonly decision: boolean;
  /** The message is required (return for rework: say what). */
  readonly needsMessage: boolean;
}

/** The state machine of server/services/configurations.ts (TRANSITIONS), as the screens offer it. */
export const ACTIONS: readonly ActionSpec[] = [
  { action: 'submit', label: 'Submit for review', permission: 'review:submit', from: ['draft'], decision: false, needsMessage: false },
  { action: 'withdraw', label: 'Withdraw from review', permission: 'review:submit', from: ['in_review'], decision: false, needsMessage: false },
  { action: 'approve', label: 'Sign off', permission: 'review:decide', from: ['in_review'], decision: true, needsMessage: false },
  { action: 'request-changes', label: 'Return for rework', permission: 'review:decide', from: ['in_review'], decision: true, needsMessage: true },
  { action: 'release', label: 'Release to build', permission: 'review:decide', from: ['approved'], decision: true, needsMessage: false },
  { action: 'validate', label: 'Mark validated', permission: 'review:decide', from: ['released'], decision: true, needsMessage: false },
];

/** The steps a caller with these permissions may take from this status. */
export function actionsFor(status: ConfigurationStatus, can: (p: Permission) => boolean): ActionSpec[] {
  return ACTIONS.filter((a) => a.from.includes(status) && can(a.permission));
}

/** Charts a comment can point at (`chart:<name>`). */
export const CHART_REFS: Readonly<Record<string, string>> = {
  'yaw-gain': 'Chart: yaw-rate gain against speed',
};

/** A labelled result or input, for a table with its unit column. */
export interface KeyFigure {
  /** The result path (`figure:<path>` in a comment). */
  readonly path: string;
  readonly label: string;
  /** What it measures: its unit and rounding in the user's system. */
  readonly kind: QuantityKind;
  /** Decimals shown in the stored unit (displayDecimals gives them in the user's system). */
  readonly digits: number;
  readonly value: number | null;
}

/** The key figures of a configuration, in order, with the decimals they are shown to (their words come from the one table). */
const FIGURES: readonly { path: string; digits: number }[] = [
  { path: 'balance.kinematicsLink.front.used.rollSteerCoefficient', digits: 4 },
  { path: 'balance.kinematicsLink.rear.used.rollSteerCoefficient', digits: 4 },
  { path: 'balance.understeerBudget.rollSteer', digits: 3 },
  { path: 'balance.understeerBudget.total', digits: 3 },
  { path: 'balance.rollGradientDegPerG', digits: 3 },
  { path: 'balance.characteristicSpeedKph', digits: 1 },
  { path: 'bumpSteer.front.bumpSteerDegPerM', digits: 3 },
  { path: 'bumpSteer.rear.bumpSteerDegPerM', digits: 3 },
  { path: 'bumpSteer.front.camberGainDegPerM', digits: 2 },
  { path: 'bumpSteer.rear.camberGainDegPerM', digits: 2 },
];

/** The value at a dotted path (`a.b[2].c`), or undefined. */
export function valueAt(doc: unknown, path: string): unknown {
  let cur: unknown = doc;
  for (const part of path.replace(/\[(\d+)\]/g, '.$1').split('.')) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string, unknown>)[part];
  }
  return cur;
}

/** The key figures of a configuration's results (computed now, or frozen in an approval). */
export function keyFigures(results: ConfigurationResults): KeyFigure[] {
  return FIGURES.map((f) => {
    const w = resultWords(f.path);
    const v = valueAt(results, f.path);
    return { path: f.path, label: w.label, kind: w.kind ?? 'understeerGradient', digits: f.digits, value: typeof v === 'number' && Number.isFinite(v) ? v : null };
  });
}

/** A label for a result path, from the one table. */
export function pathLabel(path: string): string {
  return resultWords(path).label;
}

/** One changed value, written for a person: in the user's units, rounded as its quantity is, grouped by kind. */
export interface DifferenceRow {
  readonly path: string;
  readonly label: string;
  readonly a: string;
  readonly b: string;
  /** b − a with its sign, or empty when either side is not a number. */
  readonly change: string;
  readonly unit: string;
}

export interface DifferenceGroup {
  readonly group: string;
  readonly rows: readonly DifferenceRow[];
}

/** A changed value as text: a number through the one formatter (true minus sign), yes / no, words, or a dash. */
function shown(v: unknown, w: ResultWords, units: DisplayUnits, signed = false): string {
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) return '–';
    const text = formatNum(Math.abs(v), w.kind ? { kind: w.kind } : { sig: w.sig ?? 4 }, units);
    return (v < 0 && Number(text) !== 0 ? '−' : signed && v > 0 ? '+' : '') + text;
  }
  if (v === undefined || v === null) return '(none)';
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  return typeof v === 'string' ? v : JSON.stringify(v);
}

/**
 * Differences of results (`words = resultWords`) or of inputs (`inputWords`),
 * labelled and grouped in the order the groups first appear.
 */
export function differenceGroups(list: readonly Difference[], words: (path: string) => ResultWords, units: DisplayUnits): DifferenceGroup[] {
  const groups = new Map<string, DifferenceRow[]>();
  for (const d of list) {
    const w = words(d.path);
    const row: DifferenceRow = {
      path: d.path,
      label: w.label,
      a: shown(d.a, w, units),
      b: shown(d.b, w, units),
      change: typeof d.change === 'number' ? shown(d.change, w, units, true) : '',
      unit: w.kind ? unitLabel(w.kind, units) : (w.unit ?? ''),
    };
    groups.set(w.group, [...(groups.get(w.group) ?? []), row]);
  }
  return [...groups].map(([group, rows]) => ({ group, rows }));
}

/** What a comment's `resultRef` points at, in words. */
export function refLabel(ref: string): string {
  if (ref === 'budget') return 'Understeer budget';
  const [kind, rest] = [ref.slice(0, ref.indexOf(':')), ref.slice(ref.indexOf(':') + 1)];
  if (kind === 'chart') return CHART_REFS[rest] ?? `Chart ${rest}`;
  if (kind === 'caution') return `Caution ${rest}`;
  if (kind === 'figure') return `Figure: ${pathLabel(rest)}`;
  return ref;
}

/** Whether a reference is one the server accepts (routes/configurations.ts `resultRef`). */
export function validRef(ref: string): boolean {
  return /^(budget|chart:[a-z0-9-]{1,60}|caution:[a-z0-9-]{1,60}|figure:[A-Za-z0-9_.[\]-]{1,120})$/.test(ref);
}

/** The API's refusal in words, with the fields it names (400 invalid_input `details.fields`). */
export function problemText(error: unknown): string {
  const p = apiProblem(error);
  const fields = (p.details as { fields?: { path: string; message: string }[] } | undefined)?.fields;
  return fields?.length ? `${p.message} (${fields.map((f) => `${f.path}: ${f.message}`).join('; ')})` : p.message;
}
