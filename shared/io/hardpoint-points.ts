import type { Corner, Vec3 } from '../schema/corner.js';

/**
 * The editable hardpoints of a corner document: each point's key (its
 * dotted path inside the corner, e.g. `points.tieRodInner`), its name in
 * plain words and the group it belongs to. Directions (rack axis, rocker
 * axis, bar axis) are not positions and are not listed.
 */
export interface HardpointRow {
  readonly key: string;
  readonly name: string;
  readonly group: string;
  readonly value: Vec3;
}

export interface LinkRow {
  readonly name: string;
  readonly from: string;
  readonly to: string;
  readonly lengthMm: number;
}

const POINT_NAMES: Readonly<Record<string, string>> = {
  wheelCentre: 'Wheel centre',
  spindle: 'Spin axis point, inboard of the wheel centre',
  tieRodInner: 'Tie rod, inner end (rack)',
  tieRodOuter: 'Tie rod, outer end (steering arm)',
  lowerFront: 'Lower arm, front pivot',
  lowerRear: 'Lower arm, rear pivot',
  lowerOuter: 'Lower ball joint',
  upperFront: 'Upper arm, front pivot',
  upperRear: 'Upper arm, rear pivot',
  upperOuter: 'Upper ball joint',
  strutTop: 'Strut top mount',
  strutLower: 'Strut axis point on the upright',
};

const SPRING_NAMES: Readonly<Record<string, string>> = {
  springBody: 'Spring, body end',
  springOuter: 'Spring, suspension end',
  rockerPivot: 'Rocker pivot',
  rodOuter: 'Push/pull rod, outer end',
  rodRocker: 'Push/pull rod, rocker end',
  springRocker: 'Spring, rocker end',
};

const BAR_NAMES: Readonly<Record<string, string>> = {
  dropLinkOuter: 'Anti-roll bar drop link, suspension end',
  dropLinkInner: 'Anti-roll bar drop link, lever end',
  barAxisPoint: 'Anti-roll bar, point on its axis',
};

function linkPointName(key: string, corner: Corner): string | null {
  const m = /^link([1-5])(Inner|Outer)$/.exec(key);
  if (!m) return null;
  const isToe = corner.type === 'five-link' && corner.toeLink === Number(m[1]);
  return `Link ${m[1]}${isToe ? ' (toe link)' : ''}, ${m[2] === 'Inner' ? 'body end' : 'upright end'}`;
}

/** Plain name of a point key such as `points.tieRodInner`. */
export function pointName(key: string, corner: Corner): string {
  const [section, name] = key.split('.') as [string, string];
  if (section === 'points') {
    if (!corner.steered && (name === 'tieRodInner' || name === 'tieRodOuter')) {
      return name === 'tieRodInner' ? 'Toe link, inner end (body)' : 'Toe link, outer end (upright)';
    }
    if (name === 'tieRodInner' && corner.steering?.kind === 'arm') return 'Tie rod, inner end (steering-box arm)';
    return POINT_NAMES[name] ?? linkPointName(name, corner) ?? name;
  }
  if (section === 'spring') return SPRING_NAMES[name] ?? name;
  if (section === 'antiRollBar') return BAR_NAMES[name] ?? name;
  return key;
}

/** Display order of the linkage points (stored documents may hold their keys in any order). */
const POINT_ORDER = [
  'wheelCentre',
  'spindle',
  'lowerFront',
  'lowerRear',
  'lowerOuter',
  'upperFront',
  'upperRear',
  'upperOuter',
  'strutTop',
  'strutLower',
  'tieRodInner',
  'tieRodOuter',
  ...[1, 2, 3, 4, 5].flatMap((k) => [`link${k}Inner`, `link${k}Outer`]),
];

function orderOf(list: readonly string[], name: string): number {
  const i = list.indexOf(name);
  return i < 0 ? list.length : i;
}

function isVec3(v: unknown): v is Vec3 {
  return Array.isArray(v) && v.length === 3 && v.every((n) => typeof n === 'number');
}

/** Every position in the corner, in document order: linkage points, then spring and bar. */
export function hardpointRows(corner: Corner): HardpointRow[] {
  const rows: HardpointRow[] = [];
  const collect = (section: string, group: string, obj: Record<string, unknown> | undefined, names?: Readonly<Record<string, string>>) => {
    if (!obj) return;
    const order = names ? Object.keys(names) : POINT_ORDER;
    const entries = Object.entries(obj).sort(([a], [b]) => orderOf(order, a) - orderOf(order, b));
    for (const [name, value] of entries) {
      if (!isVec3(value)) continue;
      if (names && !(name in names)) continue;
      const key = `${section}.${name}`;
      rows.push({ key, name: pointName(key, corner), group, value });
    }
  };
  collect('points', 'Linkage', corner.points);
  collect('spring', 'Spring', corner.spring, SPRING_NAMES);
  collect('antiRollBar', 'Anti-roll bar', corner.antiRollBar, BAR_NAMES);
  return rows;
}

/** The point at `key`, or undefined when the corner has no such point. */
export function getPoint(corner: Corner, key: string): Vec3 | undefined {
  const [section, name] = key.split('.') as [string, string];
  const obj = (corner as unknown as Record<string, Record<string, unknown> | undefined>)[section];
  const v = obj?.[name];
  return isVec3(v) ? v : undefined;
}

/** A copy of the corner with the point at `key` replaced (the input is not changed). */
export function withPoint(corner: Corner, key: string, value: Vec3): Corner {
  return withPoints(corner, new Map([[key, value]]));
}

/** A copy of the corner with several points replaced at once. */
export function withPoints(corner: Corner, values: ReadonlyMap<string, Vec3>): Corner {
  const copy = structuredClone(corner) as unknown as Record<string, Record<string, unknown>>;
  for (const [key, value] of values) {
    const [section, name] = key.split('.') as [string, string];
    if (!copy[section] || !isVec3(copy[section][name])) throw new Error(`This corner has no point ${key}`);
    copy[section][name] = [value[0], value[1], value[2]];
  }
  return copy as unknown as Corner;
}

function pairsFor(corner: Corner): [string, string, string][] {
  const tie = corner.steered ? 'Tie rod' : 'Toe link';
  switch (corner.type) {
    case 'double-wishbone':
      return [
        ['Lower arm, front leg', 'points.lowerFront', 'points.lowerOuter'],
        ['Lower arm, rear leg', 'points.lowerRear', 'points.lowerOuter'],
        ['Upper arm, front leg', 'points.upperFront', 'points.upperOuter'],
        ['Upper arm, rear leg', 'points.upperRear', 'points.upperOuter'],
        [tie, 'points.tieRodInner', 'points.tieRodOuter'],
        ['Kingpin (ball joint to ball joint)', 'points.lowerOuter', 'points.upperOuter'],
      ];
    case 'strut':
      return [
        ['Lower arm, front leg', 'points.lowerFront', 'points.lowerOuter'],
        ['Lower arm, rear leg', 'points.lowerRear', 'points.lowerOuter'],
        [tie, 'points.tieRodInner', 'points.tieRodOuter'],
        ['Strut, top mount to upright point', 'points.strutTop', 'points.strutLower'],
      ];
    case 'five-link':
      return [1, 2, 3, 4, 5].map((k) => [
        `Link ${k}${corner.toeLink === k ? ' (toe link)' : ''}`,
        `points.link${k}Inner`,
        `points.link${k}Outer`,
      ]);
  }
}

/** Design lengths of the corner's links, mm (the distances the solver holds fixed). */
export function linkRows(corner: Corner): LinkRow[] {
  const rows: LinkRow[] = [];
  for (const [name, from, to] of pairsFor(corner)) {
    const a = getPoint(corner, from);
    const b = getPoint(corner, to);
    if (!a || !b) continue;
    rows.push({ name, from, to, lengthMm: Math.hypot(b[0] - a[0], b[1] - a[1], b[2] - a[2]) });
  }
  return rows;
}

/** Keys whose value differs between two corners of the same type. */
export function changedPoints(a: Corner, b: Corner): string[] {
  const bRows = new Map(hardpointRows(b).map((r) => [r.key, r.value]));
  return hardpointRows(a)
    .filter((r) => {
      const other = bRows.get(r.key);
      return !other || other.some((v, i) => v !== r.value[i]);
    })
    .map((r) => r.key);
}
