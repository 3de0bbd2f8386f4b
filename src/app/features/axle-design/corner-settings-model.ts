import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { cornerSemanticIssues } from '../../../../shared/schema/corner-rules';
import { ATTACHMENT_WORDS, STEERING_KIND_WORDS, complianceMounts, cornerAttachments, type Steering, type SteeringKind } from '../../../../shared/io/corner-inputs';
import { CORNER_RANGES, type InputRange } from '../../../../shared/schema/ranges';
import { wordNumber } from '../../../../shared/schema/issue-words';
import type { DisplayUnits } from '../../core/api-types';
import { fromDisplayUnits, inDisplayUnits, type QuantityKind } from '../../core/format/quantities';
import { parseDecimal } from './hardpoint-io';
import { pointName } from './hardpoint-model';

/**
 * What a setting measures: a length (mm stored, the user's unit shown), an angle (deg), a direction component (no
 * unit), a compliance rate (N/mm stored, the user's unit shown; absent is rigid) or a choice (words).
 */
export type SettingKind = 'length' | 'angle' | 'direction' | 'rate' | 'choice';

/**
 * What a setting is set to: a number, a choice (an attachment), a flag (steered), a bushing's two rates, a whole
 * steering (a rack or an arm); undefined takes a rate's key out of the corner (the mount is rigid again).
 */
export type SettingValue = number | string | boolean | Readonly<Record<string, number>> | Steering | undefined;

/**
 * One number of a corner that is not a hardpoint position (the hardpoint
 * table has those): the wheel's loaded radius, the steering's stroke and axis,
 * the rocker's and the anti-roll bar's axes. `index` is the component of a
 * tuple (stroke ends, x/y/z of an axis), null for a plain number.
 */
export interface SettingField {
  readonly path: string;
  readonly index: number | null;
  readonly label: string;
  readonly kind: SettingKind;
  readonly range: InputRange;
  readonly value: number;
}

export interface SettingGroup {
  readonly id: string;
  readonly title: string;
  /** What the group's numbers mean, in a sentence. */
  readonly note: string;
  readonly fields: readonly SettingField[];
}

const AXES = ['x', 'y', 'z'] as const;

function axisFields(path: string, what: string, v: readonly number[]): SettingField[] {
  return AXES.map((a, i) => ({ path, index: i, label: `${what} ${a}`, kind: 'direction', range: CORNER_RANGES.directionComponent, value: v[i] ?? 0 }));
}

/** Where a setting sits and what it measures, before it has a value (a steering being chosen has none yet). */
export type SettingSlot = Omit<SettingField, 'value'>;

const STEERING_NOTES: Readonly<Record<SteeringKind, string>> = {
  rack: 'Stroke: the rack travel from one end to the other through straight ahead (0); + is toward the left (+y). Axis: the direction the rack moves in; only its direction counts.',
  arm: 'Stroke: the arm rotation from one end to the other through straight ahead (0). Axis: the direction of the arm\'s pivot axis; only its direction counts.',
};

/** The numbers of a steering of `kind`, in the order they are shown: the stroke ends, then the axis (an arm: its pivot point, then its direction). */
export function steeringSlots(kind: SteeringKind): SettingSlot[] {
  const axis = (path: string, what: string) => axisFields(path, what, [0, 0, 0]).map(({ value: _, ...slot }) => slot);
  if (kind === 'rack') {
    return [
      { path: 'steering.rackStroke', index: 0, label: 'Stroke toward the right (−y)', kind: 'length', range: CORNER_RANGES.rackStrokeMm },
      { path: 'steering.rackStroke', index: 1, label: 'Stroke toward the left (+y)', kind: 'length', range: CORNER_RANGES.rackStrokeMm },
      ...axis('steering.rackAxis', 'Rack axis'),
    ];
  }
  return [
    { path: 'steering.angularStrokeDeg', index: 0, label: 'Stroke, one end', kind: 'angle', range: CORNER_RANGES.armStrokeDeg },
    { path: 'steering.angularStrokeDeg', index: 1, label: 'Stroke, other end', kind: 'angle', range: CORNER_RANGES.armStrokeDeg },
    ...AXES.map((a, i): SettingSlot => ({ path: 'steering.armAxisPoint', index: i, label: `Arm pivot point ${a}`, kind: 'length', range: CORNER_RANGES.coordinateMm })),
    ...axis('steering.armAxisDirection', 'Arm axis'),
  ];
}

/** A steering of `kind` from its numbers (stored units) by `path[index]`, as `steeringSlots` lists them. */
export function steeringFrom(kind: SteeringKind, value: (path: string, index: number) => number): Steering {
  const tuple = (path: string) => [0, 1, 2].map((i) => value(path, i)) as Vec3;
  const pair = (path: string): [number, number] => [value(path, 0), value(path, 1)];
  return kind === 'rack'
    ? { kind: 'rack', rackAxis: tuple('steering.rackAxis'), rackStroke: pair('steering.rackStroke') }
    : { kind: 'arm', armAxisPoint: tuple('steering.armAxisPoint'), armAxisDirection: tuple('steering.armAxisDirection'), angularStrokeDeg: pair('steering.angularStrokeDeg') };
}

/** The corner's settings, grouped as the corner has them (a rack, an arm, a rocker, a bar). */
export function cornerSettings(corner: Corner): SettingGroup[] {
  const groups: SettingGroup[] = [
    {
      id: 'wheel',
      title: 'Wheel',
      note: 'Loaded radius: wheel centre to the ground under load; it places the contact patch.',
      fields: [{ path: 'wheel.radius', index: null, label: 'Loaded radius', kind: 'length', range: CORNER_RANGES.wheelRadiusMm, value: corner.wheel.radius }],
    },
  ];
  const st = corner.steered ? corner.steering : undefined;
  if (st) {
    groups.push({
      id: st.kind,
      title: st.kind === 'rack' ? 'Steering rack' : 'Steering arm',
      note: STEERING_NOTES[st.kind],
      fields: steeringSlots(st.kind).map((slot) => ({ ...slot, value: (read(corner, slot.path) as readonly number[])[slot.index ?? 0] ?? 0 })),
    });
  }
  if (corner.spring?.kind === 'rocker') {
    groups.push({ id: 'rocker', title: 'Rocker', note: 'The direction of the rocker\'s pivot axis through its pivot point; only its direction counts.', fields: axisFields('spring.rockerAxis', 'Rocker axis', corner.spring.rockerAxis) });
  }
  if (corner.antiRollBar) {
    groups.push({ id: 'bar', title: 'Anti-roll bar', note: 'The direction of the bar\'s axis through its axis point; only its direction counts.', fields: axisFields('antiRollBar.barAxisDirection', 'Bar axis', corner.antiRollBar.barAxisDirection) });
  }
  return groups;
}

function read(corner: Corner, path: string): unknown {
  let v: unknown = corner;
  for (const k of path.split('.')) v = v !== null && typeof v === 'object' ? (v as Record<string, unknown>)[k] : undefined;
  return v;
}

/** Containers of rates that the corner may lack (every mount rigid): created by the first rate, dropped with the last. */
const RATE_CONTAINERS = new Set(['bushings', 'linkAxialNPerMm']);

/**
 * A copy of the corner with the setting at `path` (a value, or one component of a tuple) replaced; undefined takes the
 * key out (a rate back to rigid). A whole steering (`steering`, a rack or an arm) makes the corner steered as well.
 * The input is not changed.
 */
export function withSetting(corner: Corner, path: string, index: number | null, value: SettingValue): Corner {
  const copy = structuredClone(corner) as unknown as Record<string, unknown>;
  const keys = path.split('.');
  const last = keys.pop()!;
  const chain: Record<string, unknown>[] = [copy];
  for (const k of keys) {
    const parent = chain[chain.length - 1]!;
    if (parent[k] === undefined && RATE_CONTAINERS.has(k) && value !== undefined) parent[k] = {};
    const next = parent[k];
    if (next === null || typeof next !== 'object') {
      if (value === undefined) return corner;
      throw new Error(`This corner has no ${path}`);
    }
    chain.push(next as Record<string, unknown>);
  }
  const parent = chain[chain.length - 1]!;
  if (index === null) {
    if (value === undefined) delete parent[last];
    else parent[last] = structuredClone(value);
    // A steering put in is chosen to steer with: ticking Steered and giving its rack or arm is one change.
    if (path === 'steering' && value !== undefined) copy['steered'] = true;
  } else {
    const tuple = parent[last];
    if (!Array.isArray(tuple)) throw new Error(`This corner has no ${path}`);
    parent[last] = tuple.map((x: number, i) => (i === index ? value : x));
  }
  // The last rate of a container gone: the container goes too (the document says "rigid" by leaving it out).
  for (let i = keys.length - 1; i >= 0; i--) {
    const holder = chain[i]!;
    const k = keys[i]!;
    if (RATE_CONTAINERS.has(k) && Object.keys(holder[k] as object).length === 0) delete holder[k];
  }
  return copy as unknown as Corner;
}

/** Every setting path of a corner that is not a point: the numbers above, then the choices and the compliance rates. */
function settingPaths(corner: Corner): string[] {
  return [
    ...cornerSettings(corner).flatMap((g) => g.fields.map((f) => f.path)),
    'steered',
    ...(corner.steering ? ['steering.kind'] : []),
    ...(corner.type === 'five-link' ? ['toeLink'] : []),
    ...cornerAttachments(corner).map((f) => f.path),
    ...complianceMounts(corner).map((m) => m.path),
  ].filter((p, i, all) => all.indexOf(p) === i);
}

/** The setting paths (`wheel.radius`, `steering.rackAxis`, `steered`, `bushings.lowerFront`, …) whose value differs between two corners. */
export function changedSettings(a: Corner, b: Corner): string[] {
  // Both corners' paths: a rack stroke changed before the corner stopped being steered still differs.
  return [...new Set([...settingPaths(a), ...settingPaths(b)])].filter((p) => JSON.stringify(read(a, p)) !== JSON.stringify(read(b, p)));
}

/**
 * What is wrong with a tuple setting's numbers (`path`, stored units) beyond each one's possible range: a stroke that
 * does not run through straight ahead, an axis with no direction. Null when they may be used.
 */
export function tupleRule(path: string, kind: SettingKind, values: readonly number[]): string | null {
  if (path === 'steering.rackStroke' || path === 'steering.angularStrokeDeg') {
    const [lo = NaN, hi = NaN] = values;
    if (!(lo <= 0 && hi >= 0 && lo < hi)) return 'the stroke must run from one end to the other through straight ahead: the first end at or below 0, the second at or above 0';
  }
  if (kind === 'direction' && values.every((x) => x === 0)) return 'an axis needs a direction: x, y and z cannot all be 0';
  return null;
}

/** What is wrong with a setting once `value` (stored unit) is put in, beyond its possible range (`tupleRule`). Null when it may be used. */
export function settingRule(corner: Corner, field: SettingField, value: number): string | null {
  if (field.index === null) return null;
  return tupleRule(field.path, field.kind, read(withSetting(corner, field.path, field.index, value), field.path) as number[]);
}

/**
 * A number typed into a setting's field (`label`), in the user's units when it has a quantity `kind` (shown with
 * `unit`): the stored value, or what is wrong with it in words (not a number, outside its possible range).
 */
export function typedSetting(text: string, label: string, range: InputRange, kind: QuantityKind | null, unit: string, units: DisplayUnits): { value: number } | { problem: string } {
  const typed = parseDecimal(text);
  if (typed === null) return { problem: `${label}: "${text}" is not a number${unit ? ` of ${unit}` : ''}.` };
  const value = kind ? fromDisplayUnits(typed, kind, units) : typed;
  const below = range.minExclusive ? value <= range.min : value < range.min;
  if (!below && value <= range.max) return { value };
  const [lo, hi] = [range.min, range.max].map((v) => wordNumber(kind ? inDisplayUnits(v, kind, units) : v));
  const withUnit = unit ? ` ${unit}` : '';
  return {
    problem: range.minExclusive ? `${label}: ${text} is outside the possible range, more than ${lo} and at most ${hi}${withUnit}.` : `${label}: ${text} is outside ${lo} to ${hi}${withUnit}.`,
  };
}

/** How a tuple setting reads as one row of a list of differences. */
const TUPLE_WORDS: Readonly<Record<string, string>> = {
  'steering.rackStroke': 'stroke (right, left)',
  'steering.rackAxis': 'axis (x, y, z)',
  'steering.angularStrokeDeg': 'stroke (both ends)',
  'steering.armAxisPoint': 'pivot point (x, y, z)',
  'steering.armAxisDirection': 'axis (x, y, z)',
  'spring.rockerAxis': 'axis (x, y, z)',
  'antiRollBar.barAxisDirection': 'axis (x, y, z)',
};

/** A setting of `corner` as one row of a list of differences: its name in words, its kind and its numbers or words (undefined when the corner lacks it: a rate then is rigid). */
export function settingRow(corner: Corner, path: string): { name: string; kind: SettingKind; value: readonly number[] | string | undefined } {
  const v = read(corner, path);
  // A steering setting of a version of the corner that is not steered is named as on the steered one.
  const named: Corner = { ...corner, steered: true };
  const holds = (p: { readonly path: string }) => p.path === path;
  if (path === 'steered') return { name: 'Steering', kind: 'choice', value: corner.steered ? 'steered' : 'fixed toe link' };
  if (path === 'steering.kind') return { name: 'Steering, kind', kind: 'choice', value: corner.steering ? STEERING_KIND_WORDS[corner.steering.kind].toLowerCase() : undefined };
  if (path === 'toeLink') return { name: 'Toe link', kind: 'choice', value: typeof v === 'number' ? `link ${v}` : undefined };
  const attachment = cornerAttachments(corner).find((f) => f.path === path);
  if (attachment) return { name: attachment.label, kind: 'choice', value: ATTACHMENT_WORDS[attachment.value].toLowerCase() };
  const mount = complianceMounts(corner).find(holds) ?? complianceMounts(named).find(holds);
  if (mount) {
    const rates = mount.rates.map((r) => r.value);
    return { name: `${mount.group}, ${mount.label}${mount.rates.length > 1 ? ` (${mount.rates.map((r) => r.label.toLowerCase()).join(', ')})` : ''}`, kind: 'rate', value: rates.every((r) => r === undefined) ? undefined : rates.map((r) => r ?? NaN) };
  }
  const inGroup = (g: SettingGroup) => g.fields.some(holds);
  const group = cornerSettings(corner).find(inGroup) ?? cornerSettings(named).find(inGroup);
  const field = group?.fields.find((f) => f.path === path);
  const value = typeof v === 'number' ? [v] : Array.isArray(v) ? (v as number[]) : undefined;
  if (!group || !field) return { name: path, kind: 'direction', value };
  const words = field.index === null ? field.label.toLowerCase() : (TUPLE_WORDS[path] ?? path);
  return { name: `${group.title}, ${words}`, kind: field.kind, value };
}

/** A copy of `corner` with every setting that differs taken from `source` (the saved revision): the points stay as they are. */
export function withSettingsFrom(corner: Corner, source: Corner): Corner {
  // A steering of the other kind, or one the saved revision lacks, comes back whole: one kind's numbers do not fit the other.
  let copy = source.steering?.kind === corner.steering?.kind ? corner : withSetting(corner, 'steering', null, source.steering);
  for (const path of changedSettings(copy, source)) {
    const value = read(source, path);
    // A rate the saved revision lacks is rigid there; any other setting it lacks is left as it is.
    if (value === undefined && !complianceMounts(corner).some((m) => m.path === path)) continue;
    // A part this corner does not have (a spring, a bar) is not brought back by a setting of it.
    const holder = path.split('.').slice(0, -1).join('.');
    if (holder && !RATE_CONTAINERS.has(holder) && typeof read(copy, holder) !== 'object') continue;
    copy = withSetting(copy, path, null, value as SettingValue);
  }
  return copy;
}

// ---------- the corner's rules on an edit ----------

/**
 * What the corner's rules (shared/schema/corner-rules.ts, the ones the corner schema runs) say against an edit: the
 * issues the edited corner has that the corner before it did not, as the rules word them. Empty when it may be used.
 */
export function editIssues(corner: Corner, path: string, index: number | null, value: SettingValue): { path: string; message: string }[] {
  const before = new Set(cornerSemanticIssues(corner).map((i) => `${i.path}\n${i.message}`));
  return cornerSemanticIssues(withSetting(corner, path, index, value)).filter((i) => !before.has(`${i.path}\n${i.message}`));
}

/** Document keys a rule's message may name, in the screen's words (for `issueWords`). */
export function ruleLabels(corner: Corner): Record<string, string> {
  const labels: Record<string, string> = {
    'steering is required when steered is true (a rack or a steering-box arm)': 'a steered corner needs its steering rack or steering-box arm, which this corner does not define',
    steeringStiffnessNPerMm: 'The steering rate',
    'give its rate as linkAxialNPerMm or a bushing': 'set the steering rate back to rigid first, and give the toe link its rate as a link rate or a bushing',
    'steering.armAxisPoint': 'the arm pivot point',
    'steering.armAxisDirection': 'the arm axis',
    'steering.angularStrokeDeg': 'the arm stroke',
    'steering.rackStroke': 'the rack stroke',
    'steering.rackAxis': 'the rack axis',
    lowerArm: 'the lower arm',
    upperArm: 'the upper arm',
  };
  for (const f of cornerAttachments(corner)) labels[f.path] = f.label.replace(/ rides on$/, '');
  for (const name of Object.keys(corner.points)) labels[`points.${name}`] = pointName(`points.${name}`, corner);
  return labels;
}
