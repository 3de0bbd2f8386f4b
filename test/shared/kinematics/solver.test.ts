import { describe, expect, it } from 'vitest';
import {
  exampleCorners,
  solvePose,
  sweepCorner,
  compileCorner,
  CornerSolver,
  poseOutputs,
  axleSummary,
  axleKinematics,
  rollSweep,
  rollSteerCoefficient,
  rackForAxleSteer,
  ackermannPercent,
  polyFit,
} from '../../../shared/kinematics/index.js';
import { computeCornerSweep, computeAxleRoll, MAX_POSES_PER_REQUEST } from '../../../shared/kinematics/api.js';
import { SolveError, InputError } from '../../../shared/errors.js';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import { planarWishbone } from './helpers.js';

const sub = (a: number[], b: number[]) => a.map((v, i) => v - b[i]!);
const dot = (a: number[], b: number[]) => a.reduce((s, v, i) => s + v * b[i]!, 0);
const len = (a: number[]) => Math.sqrt(dot(a, a));
const cross = (a: number[], b: number[]) => [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
const addv = (a: number[], b: number[]) => a.map((v, i) => v + b[i]!);
const mul = (a: number[], s: number) => a.map((v) => v * s);

/** Three-sphere trilateration (closed form, two branches; check-values.md), the branch nearest `near`. */
function trilaterate(p1: number[], r1: number, p2: number[], r2: number, p3: number[], r3: number, near: number[]): number[] {
  const d = len(sub(p2, p1));
  const ex = mul(sub(p2, p1), 1 / d);
  const i = dot(ex, sub(p3, p1));
  const eyRaw = sub(sub(p3, p1), mul(ex, i));
  const ey = mul(eyRaw, 1 / len(eyRaw));
  const ez = cross(ex, ey);
  const j = dot(ey, sub(p3, p1));
  const x = (r1 * r1 - r2 * r2 + d * d) / (2 * d);
  const y = (r1 * r1 - r3 * r3 + i * i + j * j) / (2 * j) - (i / j) * x;
  const z = Math.sqrt(r1 * r1 - x * x - y * y);
  const base = addv(p1, addv(mul(ex, x), mul(ey, y)));
  const a = addv(base, mul(ez, z));
  const b = sub(base, mul(ez, z));
  return len(sub(a, near)) < len(sub(b, near)) ? a : b;
}

function rotate(v: number[], u: number[], t: number): number[] {
  const c = Math.cos(t);
  const s = Math.sin(t);
  return addv(addv(mul(v, c), mul(cross(u, v), s)), mul(u, dot(u, v) * (1 - c)));
}

describe('pose solver', () => {
  it('three-sphere trilateration places the ball joints and wheel centre where Newton does', () => {
    const c = exampleCorners.fsFrontWishbone;
    const p = c.points as Record<string, number[]>;
    const L = (a: string, b: string) => len(sub(p[a]!, p[b]!));
    const axis = mul(sub(p['lowerRear']!, p['lowerFront']!), 1 / L('lowerRear', 'lowerFront'));
    for (const angleDeg of [-4, -2, 1, 3]) {
      // Independent construction: turn the lower arm, then trilaterate upper joint, tie-rod outer and wheel centre.
      const lo = addv(p['lowerFront']!, rotate(sub(p['lowerOuter']!, p['lowerFront']!), axis, (angleDeg * Math.PI) / 180));
      const up = trilaterate(p['upperFront']!, L('upperFront', 'upperOuter'), p['upperRear']!, L('upperRear', 'upperOuter'), lo, L('lowerOuter', 'upperOuter'), p['upperOuter']!);
      const tr = trilaterate(p['tieRodInner']!, L('tieRodInner', 'tieRodOuter'), lo, L('lowerOuter', 'tieRodOuter'), up, L('upperOuter', 'tieRodOuter'), p['tieRodOuter']!);
      const wc = trilaterate(lo, L('lowerOuter', 'wheelCentre'), up, L('upperOuter', 'wheelCentre'), tr, L('tieRodOuter', 'wheelCentre'), p['wheelCentre']!);
      const travel = wc[2]! - p['wheelCentre']![2]!;
      const pose = solvePose(c, { travelMm: travel });
      // Source: check-values.md "Three-sphere trilateration ... cross-check the Newton solver".
      for (let k = 0; k < 3; k++) expect(pose.wheelCentre[k]!).toBeCloseTo(wc[k]!, 7);
    }
  });

  it('reports convergence diagnostics and solves the design pose with zero iterations', () => {
    // Source: issue 3 / conventions.md (result objects carry converged, iterations, residual); the design pose satisfies every constraint by construction (derived).
    const p = solvePose(exampleCorners.roadFrontStrut, { travelMm: 0 });
    expect(p.diagnostics.iterations).toBe(0);
    expect(p.diagnostics.residualMm).toBeLessThan(1e-12);
    const q = solvePose(exampleCorners.roadFrontStrut, { travelMm: 60, rackMm: 40 });
    expect(q.diagnostics.converged).toBe(true);
    expect(q.diagnostics.residualMm).toBeLessThan(1e-10);
    // warm start from that pose converges in a few iterations
    const w = solvePose(exampleCorners.roadFrontStrut, { travelMm: 61, rackMm: 40 }, q.state);
    expect(w.diagnostics.iterations).toBeLessThanOrEqual(4);
    expect(w.wheelCentre[2] - q.wheelCentre[2]).toBeCloseTo(1, 9);
  });

  it('an unreachable pose is a SolveError naming travel, rack and the link, never NaN', () => {
    // Source: domain.md "A pose that cannot be reached ... is an error with the travel at which it happened, never NaN"; a 300 mm arm cannot lift its joint 400 mm (derived).
    const c = planarWishbone({ tieRodInner: [-100, 300, 200] });
    let err: unknown;
    try {
      solvePose(c, { travelMm: 400, rackMm: 5 });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SolveError);
    const e = err as SolveError;
    expect(e.code).toBe('unreachable_pose');
    expect(e.message).toMatch(/travel \d+(\.\d+)? mm, rack 5 mm/);
    expect(e.details['link']).toBeTypeOf('string');
    expect(String(e.details['link'])).toMatch(/arm|tie rod|wheel-centre/);
    expect(() => sweepCorner(c, { travel: { from: 0, to: 500, step: 50 } })).toThrow(SolveError);
  });

  it('analytic tangents agree with finite differences (toe and camber gradients, motion ratios)', () => {
    // Source: central differences of the solved poses (common practice), independent of the analytic tangent.
    for (const c of Object.values(exampleCorners)) {
      const h = 1e-3;
      const a = solvePose(c, { travelMm: 10 - h });
      const b = solvePose(c, { travelMm: 10 + h });
      const m = solvePose(c, { travelMm: 10 });
      // central differences, common practice
      expect(m.toeGradientDegPerM).toBeCloseTo(((b.toeDeg - a.toeDeg) / (2 * h)) * 1000, 4);
      expect(m.camberGradientDegPerM).toBeCloseTo(((b.camberDeg - a.camberDeg) / (2 * h)) * 1000, 4);
      expect(m.motionRatio!).toBeCloseTo(-(b.springLengthMm! - a.springLengthMm!) / (2 * h), 6);
    }
  });

  it('kingpin outputs of the planar case: vertical kingpin, no caster, scrub = wheel-centre offset', () => {
    const c = planarWishbone({ tieRodInner: [-100, 300, 200] });
    const p = solvePose(c, { travelMm: 0 });
    // Source: check-values.md planar case has a vertical kingpin at y = 600; contact patch under the wheel centre (y = 650).
    expect(p.kingpinInclinationDeg).toBeCloseTo(0, 12);
    expect(p.casterDeg).toBeCloseTo(0, 12);
    expect(p.scrubRadiusMm).toBeCloseTo(50, 9);
    expect(p.mechanicalTrailMm).toBeCloseTo(0, 9);
    expect(p.contactPatch).toEqual([0, 650, 0].map((v, i) => (i === 2 ? 235 - 235 : v)));
  });

  it('a steering-box arm on the lower arm axis with a matching tie rod gives near-zero bump steer', () => {
    // Source: issue 3 "an arm that swings on the control arm's axis with a matching tie rod is a known way to near-zero bump steer" (common practice).
    const c = planarWishbone({ tieRodInner: [-100, 300, 120], tieRodOuter: [-100, 600, 120], upperLength: 220 });
    (c.points as Record<string, number[]>)['upperFront']![2] = 330;
    (c.points as Record<string, number[]>)['upperRear']![2] = 330;
    c.steering = { kind: 'arm', armAxisPoint: [-230, 300, 0], armAxisDirection: [0, 0, 1], angularStrokeDeg: [-20, 20] };
    const m = compileCorner(c);
    expect(m.rackStroke[1]).toBeCloseTo((130 * 20 * Math.PI) / 180, 9);
    const sw = sweepCorner(c, { travel: { from: -25, to: 25, step: 5 }, rackMm: [0, 10] });
    expect(sw.fit.byRack[0]!.maxDeviationDeg).toBeLessThan(1e-9);
    // the arm point swings on a circle: steering still works
    expect(Math.abs(sw.rows.find((r) => r.rackMm === 10 && r.travelMm === 0)!.steerDeg)).toBeGreaterThan(1);
  });

  it('a five-link kingpin is the instantaneous steering axis', () => {
    // Source: issue 3 (five-link kingpin = instantaneous steering axis); screw-axis definition from memory: points on the axis move only along it.
    const c = exampleCorners.roadRearFiveLink;
    const m = compileCorner(c);
    const s = new CornerSolver(m);
    s.solve(0, 0);
    const p = poseOutputs(s);
    // Moving the toe link's inner point turns the upright about that axis: points on it do not move.
    const t = s.tSteer;
    const w = [t[3]!, t[4]!, t[5]!];
    const v = [t[0]!, t[1]!, t[2]!];
    const pt = addv(Array.from(s.c), mul(cross(w, v), 1 / dot(w, w)));
    const vel = addv(v, cross(w, sub(pt, Array.from(s.c))));
    // velocity along the screw axis only
    expect(len(cross(vel, w)) / len(w)).toBeLessThan(1e-9);
    expect(Number.isFinite(p.kingpinInclinationDeg)).toBe(true);
  });
});

describe('sweeps, fits and the axle', () => {
  it('a travel list with repeats, uneven steps and both directions gives the same poses as separate solves', async () => {
    // Source: derived (a pose depends only on travel and rack, not on the path the continuation took);
    // exercises the predictor's memory (repeated nodes, resumed downward pass).
    const { sweepTravels } = await import('../../../shared/kinematics/index.js');
    const c = exampleCorners.fsFrontWishbone;
    const s = new CornerSolver(compileCorner(c));
    const travels = [-7, -3, 0, 0, 0.5, 0.5, 1.5, 4, 4.5, 12, 12.5];
    const toe: number[] = [];
    sweepTravels(s, travels, 10, (i) => (toe[i] = poseOutputs(s).toeDeg));
    travels.forEach((t, i) => expect(toe[i]).toBeCloseTo(solvePose(c, { travelMm: t, rackMm: 10 }).toeDeg, 9));
  });

  it('polyFit recovers a known quadratic', () => {
    // Source: derived (exact data of a known polynomial).
    const xs = [-2, -1, 0, 1, 2, 3];
    const ys = xs.map((x) => 1.5 - 0.25 * x + 0.75 * x * x);
    const [b0, b1, b2] = polyFit(xs, ys, true);
    expect(b0).toBeCloseTo(1.5, 12);
    expect(b1).toBeCloseTo(-0.25, 12);
    expect(b2).toBeCloseTo(0.75, 12);
  });

  it('sweep rows are grouped by rack and ordered by travel; fits per rack', () => {
    // Source: issue 3 (505-pose sweep: 101 travel points × 5 racks, fit per rack); slope vs analytic gradient derived.
    const sw = sweepCorner(exampleCorners.fsFrontWishbone, { travel: { from: -25, to: 25, step: 0.5 }, rackMm: [-20, -10, 0, 10, 20] });
    expect(sw.rows).toHaveLength(505);
    expect(sw.rows[0]!.rackMm).toBe(-20);
    expect(sw.rows[100]!.travelMm).toBe(25);
    expect(sw.fit.byRack).toHaveLength(5);
    expect(sw.fit.rackMm).toBe(0);
    // the fit's slope is close to the analytic gradient at design for a nearly linear toe curve
    expect(sw.fit.bumpSteerDegPerM).toBeCloseTo(sw.fit.toeGradientAtDesignDegPerM!, 0);
    expect(sw.diagnostics.iterationsPerPose).toBeLessThan(4);
  });

  it('roll steer coefficient follows the toe gradient: ε = −g·(t/2)·π/180 for a symmetric axle', () => {
    for (const c of Object.values(exampleCorners)) {
      const s = axleSummary(c);
      // Source: domain.md "A per-wheel linear toe gradient g ... gives ε = −g · (t/2) · π/180".
      expect(s.rollSteerCoefficient).toBeCloseTo(((-s.bumpSteerDegPerM / 1000) * (s.trackMm / 2) * Math.PI) / 180, 12);
      expect(rollSteerCoefficient(c)).toBeCloseTo(s.rollSteerCoefficient, 14);
    }
  });

  it('roll sweep: ε and roll camber agree with central differences of the rows', () => {
    // Source: domain.md definitions of ε and the roll camber coefficient, checked by central differences (common practice).
    const r = rollSweep(exampleCorners.roadFrontStrut, { roll: { from: -3, to: 3, step: 0.1 }, rackMm: [0, 30], wheelbaseMm: 2650 });
    expect(r.rows).toHaveLength(122);
    const at = (rack: number, phi: number) => r.rows.find((x) => x.rackMm === rack && Math.abs(x.rollDeg - phi) < 1e-9)!;
    for (const rack of [0, 30]) {
      const eps = -(at(rack, 0.1).axleSteerDeg - at(rack, -0.1).axleSteerDeg) / 0.2;
      const rc = (at(rack, 0.1).rollCamberDeg - at(rack, -0.1).rollCamberDeg) / 0.2;
      const s = r.byRack.find((b) => b.rackMm === rack)!;
      expect(s.rollSteerCoefficient).toBeCloseTo(eps, 4);
      expect(s.rollCamberDegPerDeg).toBeCloseTo(rc, 4);
    }
    // a double wishbone / strut leans out less than the body (domain.md): coefficient below 1
    expect(r.rollCamberDegPerDeg).toBeLessThan(1);
    expect(r.rollCamberDegPerDeg).toBeGreaterThan(0);
    // roll centre on the centreline at zero roll, migrating sideways in roll
    expect(Math.abs(at(0, 0).rollCentreYMm!)).toBeLessThan(1e-6);
    expect(Math.abs(at(0, 2).rollCentreYMm!)).toBeGreaterThan(1);
    expect(at(30, 1).ackermannPercent).not.toBeNull();
  });

  it('explicit right corner equal to the mirror gives the same roll result', () => {
    // Source: domain.md (the right corner is the mirror unless given explicitly; rack mapping r·(u_x, −u_y, u_z)).
    const left = exampleCorners.fsFrontWishbone;
    const right = structuredClone(left) as Corner;
    const flip = (o: any): any =>
      Array.isArray(o)
        ? o.length === 3 && typeof o[0] === 'number'
          ? [o[0], -o[1], o[2]]
          : o.map(flip)
        : o && typeof o === 'object'
          ? Object.fromEntries(Object.entries(o).map(([k, v]) => [k, k === 'rackAxis' ? v : flip(v)]))
          : o;
    const r = flip(right);
    const a = rollSweep(left, { roll: { from: -2, to: 2, step: 1 }, rackMm: [10] });
    const b = rollSweep(left, { roll: { from: -2, to: 2, step: 1 }, rackMm: [10], rightCorner: r });
    expect(b.rollSteerCoefficient).toBeCloseTo(a.rollSteerCoefficient, 12);
    b.rows.forEach((row, i) => expect(row.axleSteerDeg).toBeCloseTo(a.rows[i]!.axleSteerDeg, 10));
    // an asymmetric right corner changes the result, and its errors name rightCorner
    const asym = flip(structuredClone(left));
    asym.points.tieRodInner[2] += 5;
    expect(rollSweep(left, { roll: { from: -1, to: 1, step: 1 }, rightCorner: asym }).rollSteerCoefficient).not.toBeCloseTo(a.rollSteerCoefficient, 4);
    const bad = flip(structuredClone(left));
    bad.points.tieRodOuter = [...bad.points.tieRodInner];
    expect(() => rollSweep(left, { roll: { from: -1, to: 1, step: 1 }, rightCorner: bad })).toThrow(/rightCorner\.points\.tieRodOuter/);
  });

  it('axle: symmetric instant centres, roll centre on the centreline, anti-dive sign, steering ratio and Ackermann', () => {
    // Source: symmetry of a mirrored axle (derived); anti-dive positive with the side-view IC behind and above the front contact patch (Gillespie, from memory); overall ratio = handwheel deg / wheel deg (common practice).
    const ak = axleKinematics(exampleCorners.roadFrontStrut, { wheelbaseMm: 2650, anti: { axle: 'front', cgHeightMm: 550, wheelbaseMm: 2650, brakeFrontFraction: 0.7 }, rackMmPerHandwheelRev: 50 });
    expect(ak.left.frontViewIc.yMm!).toBeCloseTo(-ak.right.frontViewIc.yMm!, 9);
    expect(ak.rollCentreYMm!).toBeCloseTo(0, 9);
    expect(ak.rollCentreHeightMm!).toBeGreaterThan(0);
    expect(ak.anti!['antiDivePercent']).toBeGreaterThan(0);
    expect(ak.steering!.rows[0]!.leftSteerDeg).toBeCloseTo(-ak.steering!.rows[ak.steering!.rows.length - 1]!.rightSteerDeg, 9);
    expect(ak.steering!.overallRatio!).toBeCloseTo(360 / 50 / Math.abs(ak.steering!.steeringRatioDegPerMm), 9);
  });

  it('ackermannPercent: 100 % for ideal geometry, 0 % for parallel steer', () => {
    // cot δo = cot δi + t/L (common practice)
    const t = 1500;
    const L = 2600;
    const di = 30;
    const dout = (Math.atan(1 / (1 / Math.tan((di * Math.PI) / 180) + t / L)) * 180) / Math.PI;
    expect(ackermannPercent(di, dout, t, L)).toBeCloseTo(100, 9);
    expect(ackermannPercent(di, di, t, L)).toBeCloseTo(0, 9);
    expect(ackermannPercent(0.1, 0.1, t, L)).toBeNull();
  });

  it('rackForAxleSteer inverts the mean steer angle', () => {
    // Source: derived (round trip through solvePose of both wheels; δ̄ = (δ_L + δ_R)/2 from domain.md).
    const c = exampleCorners.roadFrontStrut;
    const rack = rackForAxleSteer(c, 12);
    const l = solvePose(c, { travelMm: 0, rackMm: rack });
    const r = solvePose(c, { travelMm: 0, rackMm: rack, side: 'right' });
    expect((l.steerDeg + r.steerDeg) / 2).toBeCloseTo(12, 8);
    expect(() => rackForAxleSteer(c, 80)).toThrow(SolveError);
    expect(() => rackForAxleSteer(exampleCorners.fsRearWishbone, 2)).toThrow(InputError);
  });
});

describe('request API', () => {
  it('validates, caps poses and returns plain JSON', () => {
    // Source: issue 3 (same zod schemas, caps on poses per request, JSON-safe results).
    const res = computeCornerSweep({ corner: exampleCorners.fsRearWishbone, travel: { from: -25, to: 25, step: 5 } });
    expect(JSON.stringify(JSON.parse(JSON.stringify(res)))).toBe(JSON.stringify(res));
    expect(JSON.stringify(res)).not.toMatch(/null|NaN/);
    expect(() => computeCornerSweep({ corner: exampleCorners.fsRearWishbone, travel: { from: -25, to: 25, step: 50 / MAX_POSES_PER_REQUEST } })).toThrow(/poses/);
    try {
      computeCornerSweep({ corner: { ...exampleCorners.fsRearWishbone, wheel: { radius: -3 } }, travel: { from: 0, to: 1, step: 1 } });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).issues[0]!.path).toBe('corner.wheel.radius');
    }
    expect(() => computeCornerSweep({ corner: exampleCorners.fsRearWishbone, travel: { from: 0, to: 1, step: 1 }, rackMm: [5] })).toThrow(/not steered/);
    const roll = computeAxleRoll({ corner: exampleCorners.roadRearFiveLink, roll: { from: -3, to: 3, step: 0.5 }, anti: { axle: 'rear', cgHeightMm: 540, wheelbaseMm: 2650 } });
    expect(roll.rows).toHaveLength(13);
    expect(roll.axle.anti!['antiSquatPercent']).toBeTypeOf('number');
  });
});

describe('posedHardpoints', () => {
  it('moves upright points rigidly, keeps body points and carries the tie-rod inner point with the rack', async () => {
    // Source: derived (rigid upright, body-fixed pivots, rack displacement along rackAxis per domain.md).
    const { posedHardpoints } = await import('../../../shared/kinematics/index.js');
    const c = exampleCorners.fsFrontWishbone;
    const p = posedHardpoints(c, { travelMm: 15, rackMm: 12 });
    const pose = solvePose(c, { travelMm: 15, rackMm: 12 });
    for (let k = 0; k < 3; k++) expect(p['wheelCentre']![k]!).toBeCloseTo(pose.wheelCentre[k]!, 9);
    expect(p['lowerFront']).toEqual(c.points.lowerFront);
    expect(p['tieRodInner']![1]).toBeCloseTo(c.points.tieRodInner[1] + 12, 12);
    const L = (a: string, b: string, q: Record<string, number[]>) => len(sub(q[a]!, q[b]!));
    const design = c.points as Record<string, number[]>;
    expect(L('tieRodInner', 'tieRodOuter', p)).toBeCloseTo(L('tieRodInner', 'tieRodOuter', design), 9);
    expect(L('upperOuter', 'lowerOuter', p)).toBeCloseTo(L('upperOuter', 'lowerOuter', design), 9);
  });
});

describe('steering-box arm on both sides', () => {
  it('right wheel mirrors the left with the arm input mapped like the rack', () => {
    // Source: domain.md (right corner solved as the mirror: δ_R = −δ_mirror, toe_R = toe_mirror); both arms turn the same
    // way seen from above, so vehicle-frame input −s on the right equals +s on the left in the mirrored frame (derived).
    const c = structuredClone(exampleCorners.fsFrontWishbone) as Corner;
    c.steering = { kind: 'arm', armAxisPoint: [-55, 150, 141.5], armAxisDirection: [0, 0, 1], angularStrokeDeg: [-30, 30] };
    for (const [t, s] of [
      [-20, 12],
      [0, -15],
      [15, 8],
    ] as const) {
      const l = solvePose(c, { travelMm: t, rackMm: s });
      const r = solvePose(c, { travelMm: t, rackMm: -s, side: 'right' });
      expect(r.toeDeg).toBeCloseTo(l.toeDeg, 10);
      expect(r.steerDeg).toBeCloseTo(-l.steerDeg, 10);
      expect(r.wheelCentre[1]).toBeCloseTo(-l.wheelCentre[1], 10);
    }
    // the arm's inner point moves on its circle: 60 mm radius, so 10 mm of arc is 10/60 rad of arm rotation
    const p = posedHardpointsOf(c, 10);
    const d = Math.hypot(p[0] + 55, p[1] - 150);
    expect(d).toBeCloseTo(60, 9);
    expect(Math.atan2(p[1] - 150, p[0] + 55)).toBeCloseTo(Math.PI / 2 + 10 / 60, 9);
  });
});

function posedHardpointsOf(c: Corner, rackMm: number): Vec3 {
  const m = compileCorner(c);
  const s = new CornerSolver(m);
  s.solve(0, 0);
  s.solveTowards(0, rackMm);
  return [s.steerInner[0]!, s.steerInner[1]!, s.steerInner[2]!];
}
