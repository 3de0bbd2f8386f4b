/**
 * Issue 13 §1.7: the corner validation refuses only geometry that is truly
 * singular, shown with the pose Jacobian at the design pose (built from the
 * hardpoints in ./jacobian-helpers.ts, not by the solver). Well-posed corners
 * have condition numbers of order 10 (the example corners: 5–11); a refused
 * rule's geometry is singular (condition number limited only by the finite
 * differences, > 1e7) or, where noted, so ill-conditioned that the link in
 * question holds nothing.
 */
import { describe, expect, it } from 'vitest';
import { cornerSchema, type Corner, type Vec3 } from '../../../shared/schema/corner.js';
import { exampleCorners, solvePose, sweepCorner } from '../../../shared/kinematics/index.js';
import { conditionNumber, designJacobian } from './jacobian-helpers.js';
import { planarWishbone } from './helpers.js';

const kappa = (c: Corner) => conditionNumber(designJacobian(c));
const clone = <T>(c: T): any => structuredClone(c);

/** The road strut with its lower ball joint moved onto the strut axis (same height), then `offsetMm` outboard of it. */
function strutWithJoint(offsetMm: number): Corner {
  const c = clone(exampleCorners.roadFrontStrut);
  const lo = c.points.strutLower as Vec3;
  const top = c.points.strutTop as Vec3;
  const z = c.points.lowerOuter[2];
  const t = (z - lo[2]) / (top[2] - lo[2]);
  c.points.lowerOuter = [lo[0] + t * (top[0] - lo[0]), lo[1] + t * (top[1] - lo[1]) + offsetMm, z];
  return c;
}

describe('a strut whose lower ball joint lies on the strut axis is well posed (issue 13 §1.7)', () => {
  const onAxis = strutWithJoint(0);
  const offset = strutWithJoint(12);

  it('is accepted, and its pose Jacobian is as well conditioned as with a 12 mm offset', () => {
    expect(cornerSchema.safeParse(onAxis).success).toBe(true);
    const k0 = kappa(onAxis);
    const k12 = kappa(offset);
    expect(k0).toBeLessThan(20);
    expect(Math.abs(k0 - k12) / k12).toBeLessThan(0.05);
  });

  it('solves over travel and steer, with the steering axis on the strut axis', () => {
    const sweep = sweepCorner(onAxis, { travel: { from: -60, to: 60, step: 10 }, rackMm: [-30, 0, 30] });
    expect(sweep.rows.length).toBe(39);
    // Kingpin inclination = the strut axis's inclination in the front view, atan(Δy/Δz) of top − lower joint (derived).
    const p = solvePose(onAxis, { travelMm: 0, rackMm: 0 });
    const { lowerOuter: lo, strutTop: top } = onAxis.points as { lowerOuter: Vec3; strutTop: Vec3 };
    expect(p.kingpinInclinationDeg).toBeCloseTo((Math.atan2(lo[1] - top[1], top[2] - lo[2]) * 180) / Math.PI, 9);
  });
});

describe('rules that were dropped: well posed, so accepted', () => {
  const dw = exampleCorners.fsFrontWishbone;
  const strut = exampleCorners.roadFrontStrut;
  const five = exampleCorners.roadRearFiveLink;
  const cases: Array<[string, Corner]> = [
    ['a body-side pivot at the spindle point', { ...clone(dw), points: { ...dw.points, lowerFront: [...dw.points.spindle] } }],
    ['a strut lower-arm pivot at the spindle point', { ...clone(strut), points: { ...strut.points, lowerRear: [...strut.points.spindle] } }],
    ['a five-link inner point at another link’s outer point', { ...clone(five), points: { ...five.points, link1Inner: [...five.points.link2Outer] } }],
    ['a tie-rod inner point at the lower ball joint', { ...clone(dw), points: { ...dw.points, tieRodInner: [...dw.points.lowerOuter] } }],
  ];
  for (const [what, c] of cases) {
    it(`${what}: accepted, regular Jacobian (condition number below 1e4)`, () => {
      expect(cornerSchema.safeParse(c).success).toBe(true);
      expect(kappa(c)).toBeLessThan(1e4);
    });
  }
});

describe('rules that stay: the geometry they refuse is singular', () => {
  const dw = exampleCorners.fsFrontWishbone;
  const five = exampleCorners.roadRearFiveLink;
  it('the example corners are regular (condition numbers 5–11)', () => {
    for (const c of Object.values(exampleCorners)) expect(kappa(c)).toBeLessThan(20);
  });
  it('a ball joint on its arm pivot axis: singular', () => {
    const c = { ...clone(dw), points: { ...dw.points, lowerOuter: [0, 205, 112.5] } };
    expect(cornerSchema.safeParse(c).success).toBe(false);
    expect(kappa(c)).toBeGreaterThan(1e7);
  });
  it('both ball joints at one point (no kingpin): singular', () => {
    const c = { ...clone(dw), points: { ...dw.points, upperOuter: [...dw.points.lowerOuter] } };
    expect(cornerSchema.safeParse(c).success).toBe(false);
    expect(kappa(c)).toBeGreaterThan(1e7);
  });
  it('two identical links of a five-link: singular', () => {
    const c = { ...clone(five), points: { ...five.points, link2Inner: [...five.points.link1Inner], link2Outer: [...five.points.link1Outer] } };
    expect(cornerSchema.safeParse(c).success).toBe(false);
    expect(kappa(c)).toBeGreaterThan(1e7);
  });
  it('the tie-rod outer point on the steering axis: singular with a vertical kingpin, and with caster and inclination held only by their second-order coupling', () => {
    // Vertical kingpin (ball joints straight above each other): steering about it leaves the wheel centre's height
    // unchanged, so nothing holds the steer: exactly singular.
    const planar = planarWishbone({ tieRodInner: [-100, 300, 200], tieRodOuter: [0, 600, 200] });
    expect(cornerSchema.safeParse(planar).success).toBe(false);
    expect(kappa(planar)).toBeGreaterThan(1e7);
    // The FS front corner: the tie-rod outer point moved to the middle of its ball joints. The steer is then held only
    // by the wheel centre's height change in steer (caster × kingpin offset): hundreds of times worse conditioned.
    const lo = dw.points.lowerOuter;
    const up = dw.points.upperOuter;
    const c = { ...clone(dw), points: { ...dw.points, tieRodOuter: [0, 1, 2].map((i) => (lo[i]! + up[i]!) / 2) } };
    expect(cornerSchema.safeParse(c).success).toBe(false);
    expect(kappa(c)).toBeGreaterThan(100 * kappa(dw));
  });
});
