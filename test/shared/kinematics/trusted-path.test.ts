/**
 * The trusted internal path (`moveCornerPoints`): a corner the engine builds
 * from an already-validated one, moving only coordinates, skips the zod
 * parse but still gets every semantic geometry check, and solves exactly as
 * the same corner given from outside (parsed by zod).
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cornerSchema, type Corner, type Vec3 } from '../../../shared/schema/corner.js';
import { compileCorner, exampleCorners, moveCornerPoints, solvePose, sweepCorner } from '../../../shared/kinematics/index.js';
import { InputError } from '../../../shared/errors.js';
import { applyCoordinates } from '../../../shared/intent/index.js';

const base = exampleCorners.fsFrontWishbone;
const p = base.points as Record<string, Vec3>;
const up = (v: Vec3, dz: number): Vec3 => [v[0], v[1], v[2] + dz];

afterEach(() => vi.restoreAllMocks());

function inputErrorOf(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError');
}

describe('moveCornerPoints', () => {
  it('solves exactly as the same corner parsed from outside', () => {
    const moved = moveCornerPoints(base, { points: { tieRodInner: up(p['tieRodInner']!, 6), tieRodOuter: up(p['tieRodOuter']!, -3) } });
    const outside = structuredClone(applyCoordinates(base, ['tieRodInner.z', 'tieRodOuter.z'], [p['tieRodInner']![2] + 6, p['tieRodOuter']![2] - 3]));
    expect(moved).toEqual(outside);
    const opts = { travel: { from: -25, to: 25, step: 5 }, rackMm: [-15, 0, 15] };
    expect(sweepCorner(moved, opts)).toEqual(sweepCorner(outside, opts));
    expect(base.points.tieRodInner).toEqual(p['tieRodInner']); // the base is never mutated
  });

  it('skips the zod parse of the new geometry (the base is parsed once)', () => {
    compileCorner(base);
    const spy = vi.spyOn(cornerSchema, 'safeParse');
    const moved = moveCornerPoints(base, { points: { tieRodInner: up(p['tieRodInner']!, 2) } });
    solvePose(moved, { travelMm: 10 });
    expect(spy).not.toHaveBeenCalled();
    // A corner from outside still goes through it.
    solvePose(structuredClone<Corner>(moved), { travelMm: 10 });
    expect(spy).toHaveBeenCalledTimes(1);
  });

  it('still runs the semantic geometry checks, with the issues the parse would give', () => {
    const bad = { tieRodOuter: [...p['tieRodInner']!] as Vec3 };
    const trusted = inputErrorOf(() => moveCornerPoints(base, { points: bad }));
    const parsed = inputErrorOf(() => compileCorner({ ...structuredClone(base), points: { ...structuredClone(base.points), ...bad } }));
    expect(trusted.issues).toEqual(parsed.issues);
    expect(trusted.issues[0]!.path).toBe('points.tieRodOuter');
    expect(trusted.message).toBe(parsed.message);
  });

  it('refuses non-finite coordinates and names the point; an unknown point is an engine error', () => {
    const e = inputErrorOf(() => moveCornerPoints(base, { points: { tieRodInner: [p['tieRodInner']![0], Number.NaN, 150] } }));
    expect(e.issues[0]!.path).toBe('points.tieRodInner');
    expect(() => moveCornerPoints(base, { points: { strutTop: [0, 500, 600] } })).toThrow(/not a point of this double-wishbone corner/);
  });

  it('moves a steering-box arm axis point, and refuses one on a rack', () => {
    const arm = { ...structuredClone(base), steering: { kind: 'arm' as const, armAxisPoint: [-55, 150, 141.5] as Vec3, armAxisDirection: [0, 0, 1] as Vec3, angularStrokeDeg: [-30, 30] as [number, number] } };
    const moved = moveCornerPoints(arm, { points: { tieRodInner: up(p['tieRodInner']!, 4) }, armAxisPoint: [-55, 150, 145.5] });
    expect(moved.steering).toMatchObject({ kind: 'arm', armAxisPoint: [-55, 150, 145.5] });
    expect(solvePose(moved, { travelMm: 0, rackMm: 5 })).toEqual(solvePose(structuredClone<Corner>(moved), { travelMm: 0, rackMm: 5 }));
    expect(() => moveCornerPoints(base, { armAxisPoint: [0, 0, 0] })).toThrow(/steering-box arm/);
  });
});
