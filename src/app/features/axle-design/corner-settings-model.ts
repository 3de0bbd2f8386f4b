import type { Corner } from '../../../../shared/schema/corner';
import { CORNER_RANGES, type InputRange } from '../../../../shared/schema/ranges';

/** What a setting measures: a length (mm stored, the user's unit shown), an angle (deg) or a direction component (no unit). */
export type SettingKind = 'length' | 'angle' | 'direction';

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
  if (st?.kind === 'rack') {
    groups.push({
      id: 'rack',
      title: 'Steering rack',
      note: 'Stroke: the rack travel from one end to the other through straight ahead (0); + is toward the left (+y). Axis: the direction the rack moves in; only its direction counts.',
      fields: [
        { path: 'steering.rackStroke', index: 0, label: 'Stroke toward the right (−y)', kind: 'length', range: CORNER_RANGES.rackStrokeMm, value: st.rackStroke[0] },
        { path: 'steering.rackStroke', index: 1, label: 'Stroke toward the left (+y)', kind: 'length', range: CORNER_RANGES.rackStrokeMm, value: st.rackStroke[1] },
        ...axisFields('steering.rackAxis', 'Rack axis', st.rackAxis),
      ],
    });
  } else if (st?.kind === 'arm') {
    groups.push({
      id: 'arm',
      title: 'Steering arm',
      note: 'Stroke: the arm rotation from one end to the other through straight ahead (0). Axis: the direction of the arm\'s pivot axis; only its direction counts.',
      fields: [
        { path: 'steering.angularStrokeDeg', index: 0, label: 'Stroke, one end', kind: 'angle', range: CORNER_RANGES.armStrokeDeg, value: st.angularStrokeDeg[0] },
        { path: 'steering.angularStrokeDeg', index: 1, label: 'Stroke, other end', kind: 'angle', range: CORNER_RANGES.armStrokeDeg, value: st.angularStrokeDeg[1] },
        ...AXES.map((a, i): SettingField => ({ path: 'steering.armAxisPoint', index: i, label: `Arm pivot point ${a}`, kind: 'length', range: CORNER_RANGES.coordinateMm, value: st.armAxisPoint[i] ?? 0 })),
        ...axisFields('steering.armAxisDirection', 'Arm axis', st.armAxisDirection),
      ],
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

/** A copy of the corner with the setting at `path` (a number, or one component of a tuple) replaced; the input is not changed. */
export function withSetting(corner: Corner, path: string, index: number | null, value: number): Corner {
  const copy = structuredClone(corner);
  const keys = path.split('.');
  const parent = read(copy, keys.slice(0, -1).join('.')) as Record<string, unknown> | undefined;
  const last = keys[keys.length - 1]!;
  if (!parent || typeof parent !== 'object') throw new Error(`This corner has no ${path}`);
  if (index === null) parent[last] = value;
  else {
    const tuple = parent[last];
    if (!Array.isArray(tuple)) throw new Error(`This corner has no ${path}`);
    parent[last] = tuple.map((x: number, i) => (i === index ? value : x));
  }
  return copy;
}

/** The setting paths (`wheel.radius`, `steering.rackAxis`, …) whose value differs between two corners. */
export function changedSettings(a: Corner, b: Corner): string[] {
  const paths = [...new Set(cornerSettings(a).flatMap((g) => g.fields.map((f) => f.path)))];
  return paths.filter((p) => JSON.stringify(read(a, p)) !== JSON.stringify(read(b, p)));
}

/**
 * What is wrong with a setting once `value` (stored unit) is put in, beyond its possible range: a stroke that
 * does not run through straight ahead, an axis with no direction. Null when it may be used.
 */
export function settingRule(corner: Corner, field: SettingField, value: number): string | null {
  if (field.index === null) return null;
  const next = (read(withSetting(corner, field.path, field.index, value), field.path) as number[]).slice();
  if (field.path === 'steering.rackStroke' || field.path === 'steering.angularStrokeDeg') {
    const [lo, hi] = next as [number, number];
    if (!(lo <= 0 && hi >= 0 && lo < hi)) return 'the stroke must run from one end to the other through straight ahead: the first end at or below 0, the second at or above 0';
  }
  if (field.kind === 'direction' && next.every((x) => x === 0)) return 'an axis needs a direction: x, y and z cannot all be 0';
  return null;
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

/** A setting of `corner` as one row of a list of differences: its name in words, its kind and its numbers (undefined when the corner lacks it). */
export function settingRow(corner: Corner, path: string): { name: string; kind: SettingKind; value: readonly number[] | undefined } {
  const group = cornerSettings(corner).find((g) => g.fields.some((f) => f.path === path));
  const field = group?.fields.find((f) => f.path === path);
  const v = read(corner, path);
  const value = typeof v === 'number' ? [v] : Array.isArray(v) ? (v as number[]) : undefined;
  if (!group || !field) return { name: path, kind: 'direction', value };
  const words = field.index === null ? field.label.toLowerCase() : (TUPLE_WORDS[path] ?? path);
  return { name: `${group.title}, ${words}`, kind: field.kind, value };
}

/** A copy of `corner` with every setting that differs taken from `source` (the saved revision): the points stay as they are. */
export function withSettingsFrom(corner: Corner, source: Corner): Corner {
  const copy = structuredClone(corner);
  for (const path of changedSettings(corner, source)) {
    const keys = path.split('.');
    const parent = read(copy, keys.slice(0, -1).join('.')) as Record<string, unknown> | undefined;
    const value = read(source, path);
    if (parent && typeof parent === 'object' && value !== undefined) parent[keys[keys.length - 1]!] = structuredClone(value);
  }
  return copy;
}
