/**
 * Movable coordinates of an intent: reading their current values from a
 * corner and writing new values into a copy. Only the named coordinates ever
 * change; the input corner is never mutated.
 */
import type { Corner, Vec3 } from '../schema/corner.js';
import { innerName, MOVABLE_COORDINATE_PATTERN } from '../schema/steering-link.js';

const AXIS = { x: 0, y: 1, z: 2 } as const;

interface Target {
  point: string;
  axis: 0 | 1 | 2;
}

function parse(corner: Corner, name: string): Target {
  if (name === 'rack.z') return { point: innerName(corner), axis: 2 };
  const m = MOVABLE_COORDINATE_PATTERN.exec(name);
  if (!m) throw new Error(`not a movable coordinate: ${name}`);
  return { point: m[1]!, axis: AXIS[m[2] as 'x' | 'y' | 'z'] };
}

/**
 * Current value of each coordinate, mm: the point's coordinate, or 0 for
 * `rack.z` (its bounds are an offset from the current rack height).
 */
export function readCoordinates(corner: Corner, names: string[]): number[] {
  const pts = corner.points as Record<string, Vec3>;
  return names.map((n) => (n === 'rack.z' ? 0 : pts[parse(corner, n).point]![parse(corner, n).axis]));
}

/**
 * The moved points (and a steering-box arm's axis point) that set the
 * coordinates to `values` (mm): every other coordinate of a moved point is
 * kept. What the engine's trusted path (`moveCornerPoints`) takes.
 */
export function coordinateMoves(corner: Corner, names: string[], values: number[]): { points: Record<string, Vec3>; armAxisPoint?: Vec3 } {
  const base = corner.points as Record<string, Vec3>;
  const points: Record<string, Vec3> = {};
  let armAxisPoint: Vec3 | undefined;
  names.forEach((n, i) => {
    const t = parse(corner, n);
    const p: Vec3 = [...(points[t.point] ?? base[t.point]!)];
    if (n === 'rack.z') {
      const dz = values[i]!;
      p[2] += dz;
      // A steering-box arm rises with the rack's height.
      const st = corner.steering;
      if (st?.kind === 'arm') {
        const a = armAxisPoint ?? st.armAxisPoint;
        armAxisPoint = [a[0], a[1], a[2] + dz];
      }
    } else p[t.axis] = values[i]!;
    points[t.point] = p;
  });
  return armAxisPoint ? { points, armAxisPoint } : { points };
}

/** A copy of `corner` with the coordinates set to `values` (mm); everything else shared, untouched. */
export function applyCoordinates(corner: Corner, names: string[], values: number[]): Corner {
  const m = coordinateMoves(corner, names, values);
  const steering = m.armAxisPoint && corner.steering?.kind === 'arm' ? { ...corner.steering, armAxisPoint: m.armAxisPoint } : corner.steering;
  return { ...corner, points: { ...corner.points, ...m.points }, ...(steering ? { steering } : {}) } as Corner;
}
