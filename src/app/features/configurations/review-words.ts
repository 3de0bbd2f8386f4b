import type { Permission } from '../../core/api-types';
import { apiProblem } from '../../core/http/api-error';
import type { ConfigurationResults, ConfigurationStatus, ReviewAction } from './configurations-api';
import type { QuantityKind } from '../../core/format/quantities';

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

export interface KeyFigure {
  /** The result path (`figure:<path>` in a comment). */
  readonly path: string;
  readonly label: string;
  /** Unit of the stored (SI-based) value. */
  readonly unit: string;
  /** What it measures: its unit and rounding in the user's system. */
  readonly kind: QuantityKind;
  /** Decimals shown in the stored unit (displayDecimals gives them in the user's system). */
  readonly digits: number;
  readonly value: number | null;
}

const FIGURES: readonly { path: string; label: string; unit: string; kind: QuantityKind; digits: number }[] = [
  { path: 'balance.kinematicsLink.front.used.rollSteerCoefficient', label: 'Roll steer ε, front', unit: 'deg/deg', kind: 'rollSteer', digits: 4 },
  { path: 'balance.kinematicsLink.rear.used.rollSteerCoefficient', label: 'Roll steer ε, rear', unit: 'deg/deg', kind: 'rollSteer', digits: 4 },
  { path: 'balance.understeerBudget.rollSteer', label: 'Understeer-gradient change from roll steer', unit: 'deg/g', kind: 'understeerGradient', digits: 3 },
  { path: 'balance.understeerBudget.total', label: 'Understeer gradient K', unit: 'deg/g', kind: 'understeerGradient', digits: 3 },
  { path: 'balance.rollGradientDegPerG', label: 'Roll gradient', unit: 'deg/g', kind: 'understeerGradient', digits: 3 },
  { path: 'balance.characteristicSpeedKph', label: 'Characteristic speed', unit: 'km/h', kind: 'speed', digits: 1 },
  { path: 'bumpSteer.front.bumpSteerDegPerM', label: 'Bump steer, front', unit: 'deg/m', kind: 'bumpSteer', digits: 3 },
  { path: 'bumpSteer.rear.bumpSteerDegPerM', label: 'Bump steer, rear', unit: 'deg/m', kind: 'bumpSteer', digits: 3 },
  { path: 'bumpSteer.front.camberGainDegPerM', label: 'Camber gain, front', unit: 'deg/m', kind: 'camberGain', digits: 2 },
  { path: 'bumpSteer.rear.camberGainDegPerM', label: 'Camber gain, rear', unit: 'deg/m', kind: 'camberGain', digits: 2 },
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
    const v = valueAt(results, f.path);
    return { ...f, value: typeof v === 'number' && Number.isFinite(v) ? v : null };
  });
}

/** A label for a result path: the key figure's name where it is one, else the path itself. */
export function pathLabel(path: string): string {
  return FIGURES.find((f) => f.path === path)?.label ?? path;
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

/** A difference value: numbers to significant digits, other values as text. */
export function diffValue(v: unknown): string {
  if (typeof v === 'number') return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : '–';
  if (v === undefined) return '(none)';
  if (v === null) return 'null';
  return typeof v === 'string' ? v : JSON.stringify(v);
}

/** The API's refusal in words, with the fields it names (400 invalid_input `details.fields`). */
export function problemText(error: unknown): string {
  const p = apiProblem(error);
  const fields = (p.details as { fields?: { path: string; message: string }[] } | undefined)?.fields;
  return fields?.length ? `${p.message} (${fields.map((f) => `${f.path}: ${f.message}`).join('; ')})` : p.message;
}
