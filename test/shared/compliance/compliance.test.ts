/**
 * Corner compliance against outside references (issue 17, "How it is checked"):
 * closed forms of statics and elasticity, each named beside its check.
 */
import { describe, expect, it } from 'vitest';
import { lusolve } from 'mathjs';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import { compileCorner, CornerSolver, poseRow, type CornerModel } from '../../../shared/kinematics/index.js';
import { cornerCompliance, complianceSweep, solvedCorner, evaluatePoseCompliance, complianceSpec, unitLoad, respond, LOAD_NAMES } from '../../../shared/compliance/index.js';
import { planarWishbone } from '../kinematics/helpers.js';

const root = join(import.meta.dirname, '..', '..', '..');
const fixture = (n: string) => JSON.parse(readFileSync(join(root, 'test', 'fixtures', 'corners', `${n}.json`), 'utf8')) as Corner;
const RAD_PER_DEG = Math.PI / 180;

/** Every body mount of a corner on bushings of the given rates (and steering stiffness when steered). */
function bushed(c: Corner, radial = 3000, axial = 800, extra: Partial<Corner> = {}): Corner {
  const names =
    c.type === 'double-wishbone'
      ? ['lowerFront', 'lowerRear', 'upperFront', 'upperRear', 'tieRodInner']
      : c.type === 'strut'
        ? ['lowerFront', 'lowerRear', 'strutTop', 'tieRodInner']
        : [1, 2, 3, 4, 5].map((i) => `link${i}Inner`);
  const bushings = Object.fromEntries(names.map((n, i) => [n, { radialNPerMm: radial * (1 + 0.1 * i), axialNPerMm: axial * (1 + 0.07 * i) }]));
  return { ...c, bushings, ...(c.steered ? { steeringStiffnessNPerMm: 2500 } : {}), ...extra } as Corner;
}

const cross = (a: readonly number[], b: readonly number[]): Vec3 => [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
const dot = (a: readonly number[], b: readonly number[]) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;

describe('compliance: closed forms', () => {
  // A double wishbone with a vertical kingpin through x = 0 (ball joints at x = 0, same y), the tie rod
  // parallel to y, 100 mm behind the kingpin: every link rigid except the tie rod.
  const arm = 100;
  const base = (wheelX: number) => {
    const c = planarWishbone({ tieRodInner: [-arm, 300, 200] });
    const p = c.points as Record<string, Vec3>;
    p['wheelCentre'] = [wheelX, p['wheelCentre']![1], p['wheelCentre']![2]];
    p['spindle'] = [wheelX, p['spindle']![1], p['spindle']![2]];
    return c;
  };

  it('one compliant tie rod: toe = moment about the steering axis ÷ (tie-rod rate × effective arm²)', () => {
    // Closed form (from memory, elementary statics and Hooke's law): a rigid upright turning about a fixed
    // axis, restrained by one spring of rate k at lever r, turns by M/(k·r²) under moment M about that axis.
    const k = 500;
    const c = { ...base(0), bushings: { tieRodInner: { radialNPerMm: 4000, axialNPerMm: k } } } as Corner;
    const r = cornerCompliance(c);
    expect(r.rigid).toBe(false);
    const psiPerNmm = 1 / (k * arm * arm); // rad per N·mm, steer to the left for +M_z
    // +1 kN·m about +z steers the left wheel left, which is toe-out on the left wheel (toe = −δ).
    expect(r.aligningMomentToeDegPerKNm).toBeCloseTo((-1e6 * psiPerNmm) / RAD_PER_DEG, 10);
    // Nothing but the steering rotation: no camber, and no lateral compliance (ball joints rigid, trail 0).
    expect(r.aligningMomentCamberDegPerKNm).toBeCloseTo(0, 12);
    expect(r.lateralForceToeDegPerKN).toBeCloseTo(0, 12);
  });

  it('one compliant tie rod with a mechanical trail: the lateral force acts through the trail', () => {
    // Wheel 20 mm ahead of the kingpin: the inboard force at the contact patch has −20 N·mm per N about the
    // (vertical) steering axis, so δ = −20/(k·r²) per N (closed form as above, from memory).
    const k = 800;
    const ks = 2000;
    const c = { ...base(20), bushings: { tieRodInner: { radialNPerMm: 4000, axialNPerMm: k } }, steeringStiffnessNPerMm: ks } as Corner;
    const r = cornerCompliance(c);
    // Springs in series (Hooke's law): bushing and rack (rack axis along the tie rod) give 1/k_eff = 1/k + 1/ks.
    const kEff = 1 / (1 / k + 1 / ks);
    const steerPerN = -20 / (kEff * arm * arm);
    expect(r.lateralForceToeDegPerKN).toBeCloseTo((-1000 * steerPerN) / RAD_PER_DEG, 10);
    // The tie-rod force is the moment over the arm (statics): −20 N·mm turns the upright to the right, which
    // moves the steering-arm point (behind the axis) outboard, so the rod is in tension, 20/r N per N.
    expect(r.linkForcesN.lateralForce['tieRod']).toBeCloseTo(20 / arm, 10);
  });

  it('a two-force link under axial load stretches by F·(1/k_bushing + 1/k_link) (Hooke)', () => {
    // Hooke's law with springs in series (common practice). Every link of the five-link corner rigid except
    // link 3 (bushing at its inner end plus the link's own axial rate).
    const five = fixture('road-rear-five-link');
    const kb = 1200;
    const kl = 9000;
    const c = { ...five, bushings: { link3Inner: { radialNPerMm: 5000, axialNPerMm: kb } }, linkAxialNPerMm: { link3: kl } } as Corner;
    const r = cornerCompliance(c);
    const p = five.points as Record<string, Vec3>;
    const n = (() => {
      const d = [0, 1, 2].map((k) => p['link3Outer']![k]! - p['link3Inner']![k]!);
      const l = Math.hypot(...d);
      return d.map((v) => v / l);
    })();
    const wc = p['wheelCentre']!;
    for (const load of LOAD_NAMES) {
      const lr = r.loads[load];
      const rot = lr.rotationDeg.map((v) => v * RAD_PER_DEG);
      const arm3 = [0, 1, 2].map((k) => p['link3Outer']![k]! - wc[k]!);
      const move = [0, 1, 2].map((k) => lr.wheelCentreMm[k]! + cross(rot, arm3)[k]!);
      const stretch = dot(n, move); // mm per kN (kN·m)
      const forceN = 1000 * lr.linkForcesN['link3']!; // N per kN (kN·m)
      expect(Math.abs(stretch - forceN * (1 / kb + 1 / kl))).toBeLessThan(1e-12 * Math.max(1, Math.abs(stretch)) + 1e-13);
      // The rigid links do not stretch at all.
      for (const j of [1, 2, 4, 5]) {
        const nj = (() => {
          const d = [0, 1, 2].map((k) => p[`link${j}Outer`]![k]! - p[`link${j}Inner`]![k]!);
          const l = Math.hypot(...d);
          return d.map((v) => v / l);
        })();
        const armj = [0, 1, 2].map((k) => p[`link${j}Outer`]![k]! - wc[k]!);
        expect(Math.abs(dot(nj, [0, 1, 2].map((k) => lr.wheelCentreMm[k]! + cross(rot, armj)[k]!)))).toBeLessThan(1e-12);
      }
    }
  });
});

describe('compliance: energy theorems', () => {
  const corners = { 'double wishbone': bushed(fixture('fs-front-wishbone')), strut: bushed(fixture('road-front-strut')), 'five-link': bushed(fixture('road-rear-five-link')) };

  for (const [name, corner] of Object.entries(corners)) {
    it(`${name}: reciprocity (Maxwell–Betti: the work of load i on the motion under load j is symmetric)`, () => {
      // Maxwell–Betti reciprocal theorem (common practice, any linear elastic structure).
      const s = solvedCorner(corner, { travelMm: 10, rackMm: corner.steered ? 8 : 0 });
      const pc = evaluatePoseCompliance(s);
      const f = LOAD_NAMES.map((l) => {
        const v = new Float64Array(6);
        unitLoad(pc, l, v);
        return v;
      });
      const x = f.map((v) => respond(pc, v).x);
      let scale = 0;
      for (let i = 0; i < 5; i++) scale = Math.max(scale, Math.abs(dot6(f[i]!, x[i]!)));
      expect(scale).toBeGreaterThan(0);
      for (let i = 0; i < 5; i++) for (let j = 0; j < i; j++) expect(Math.abs(dot6(f[i]!, x[j]!) - dot6(f[j]!, x[i]!))).toBeLessThan(1e-11 * scale);
      // …and the matrix itself is symmetric and positive semi-definite on the loads (work ≥ 0).
      for (let i = 0; i < 5; i++) expect(dot6(f[i]!, x[i]!)).toBeGreaterThanOrEqual(-1e-15);
      const G = cornerCompliance(corner, { travelMm: 10, rackMm: corner.steered ? 8 : 0 }).wheelCentreMatrix.values;
      const gmax = Math.max(...G.flat().map(Math.abs));
      for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) expect(Math.abs(G[i]![j]! - G[j]![i]!)).toBeLessThan(1e-12 * gmax);
    });

    it(`${name}: doubling every rate halves every compliance and leaves the force split unchanged`, () => {
      // Linear elasticity (common practice): compliance scales as 1/k; a uniform scale of every rate does not
      // change how an indeterminate structure shares its load.
      const a = cornerCompliance(corner);
      const doubled = structuredClone(corner) as Corner & { bushings: Record<string, { radialNPerMm: number; axialNPerMm: number }>; steeringStiffnessNPerMm?: number };
      for (const b of Object.values(doubled.bushings)) (b.radialNPerMm *= 2), (b.axialNPerMm *= 2);
      if (doubled.steeringStiffnessNPerMm) doubled.steeringStiffnessNPerMm *= 2;
      const b = cornerCompliance(doubled);
      for (const k of ['lateralForceToeDegPerKN', 'lateralForceCamberDegPerKN', 'aligningMomentToeDegPerKNm', 'brakingForceToeDegPerKN', 'tractionForceToeDegPerKN'] as const) {
        expect(Math.abs(a[k])).toBeGreaterThan(1e-6);
        expect(b[k]).toBeCloseTo(a[k] / 2, 12);
      }
      expect(b.lateralStiffnessNPerMm!).toBeCloseTo(2 * a.lateralStiffnessNPerMm!, 6);
      for (const l of LOAD_NAMES) {
        for (const [m, v] of Object.entries(a.linkForcesN[l])) expect(b.linkForcesN[l][m]).toBeCloseTo(v, 10);
        for (const [m, v] of Object.entries(a.loads[l].mountForcesN)) expect(b.loads[l].mountForcesN[m]!.axialN).toBeCloseTo(v.axialN, 10);
      }
      a.wheelCentreMatrix.values.forEach((row, i) => row.forEach((v, j) => expect(b.wheelCentreMatrix.values[i]![j]!).toBeCloseTo(v / 2, 15)));
    });
  }
});

function dot6(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < 6; i++) s += a[i]! * b[i]!;
  return s;
}

describe('compliance: finite-difference check through the kinematics solver', () => {
  // Re-solve the pose with every link (and arm leg) lengthened by its computed elastic deflection C·λ, and
  // again shortened by it; the central difference of the two poses found by the nonlinear kinematics solver
  // must match the linear response (central differences cancel the second-order terms: the remaining
  // error is O((δ/L)²) relative, below 1e-8 at this small load, plus the solver's 1e-10 mm tolerance).
  for (const name of ['fs-front-wishbone', 'road-rear-five-link'] as const) {
    it(`${name}: toe, camber and wheel-centre move agree with the re-solved pose`, () => {
      const corner = bushed(fixture(name));
      const travel = 5;
      const rack = corner.steered ? 6 : 0;
      const s = solvedCorner(corner, { travelMm: travel, rackMm: rack });
      const pc = evaluatePoseCompliance(s);
      const model = compileCorner(corner);
      for (const load of ['lateralForce', 'brakingForce', 'aligningMoment'] as const) {
        const f = new Float64Array(6);
        unitLoad(pc, load, f);
        const scale = 2; // 2 N, or 2 N·m
        for (let i = 0; i < 6; i++) f[i]! *= scale;
        const r = respond(pc, f);
        const resolve = (sign: number) => {
          const stretched: CornerModel = { ...model, lengths: model.lengths.slice() };
          for (let i = 0; i < model.nDist; i++) {
            let d = 0;
            for (let j = 0; j < 6; j++) d += pc.C[6 * i + j]! * r.lambda[j]!;
            stretched.lengths[i]! += sign * d;
          }
          const t = new CornerSolver(stretched, 'left');
          t.c.set(s.c);
          t.R.set(s.R);
          t.travelMm = travel;
          t.rackMm = rack;
          t.forgetHistory();
          t.solve(travel, rack);
          return { row: poseRow(t), c: Array.from(t.c) };
        };
        const plus = resolve(1);
        const minus = resolve(-1);
        const big = Math.max(Math.abs(r.toeDeg), Math.abs(r.camberDeg));
        const tol = 1e-6 * big + 1e-10;
        expect(Math.abs(r.toeDeg)).toBeGreaterThan(1e-6);
        expect(Math.abs((plus.row.toeDeg - minus.row.toeDeg) / 2 - r.toeDeg)).toBeLessThan(tol);
        expect(Math.abs((plus.row.camberDeg - minus.row.camberDeg) / 2 - r.camberDeg)).toBeLessThan(tol);
        // Wheel-centre move (mm): the solver converges each pose to 1e-10 mm.
        for (const k of [0, 1]) expect(Math.abs((plus.c[k]! - minus.c[k]!) / 2 - r.x[k]!)).toBeLessThan(1e-6 * Math.hypot(r.x[0]!, r.x[1]!) + 1e-9);
      }
    });
  }
});

describe('compliance: an independent stiffness-method model', () => {
  // The same corner built the textbook way (common practice, direct stiffness method with Lagrange
  // multipliers): upright and both arms as 6-DOF rigid bodies, every bushing a 3-D spring
  // k_r(I − aaᵀ) + k_a·aaᵀ, ball joints as equality constraints, the tie rod an axial spring, the
  // wheel-centre height held; solved densely with mathjs. Nothing is shared with the engine but the pose.
  it('double wishbone: wheel-centre motion per load matches to rounding', () => {
    const corner = bushed(fixture('fs-front-wishbone'));
    const s = solvedCorner(corner, { travelMm: -8, rackMm: 5 });
    const pc = evaluatePoseCompliance(s);
    const p = corner.points as Record<string, Vec3>;
    const bush = (corner as { bushings: Record<string, { radialNPerMm: number; axialNPerMm: number }> }).bushings;
    // Current positions: body points as designed (the rack moves tieRodInner), upright points from the pose.
    const up = (n: string): Vec3 => {
      const d = [0, 1, 2].map((k) => p[n]![k]! - p['wheelCentre']![k]!);
      return [0, 1, 2].map((k) => s.c[k]! + s.R[3 * k]! * d[0]! + s.R[3 * k + 1]! * d[1]! + s.R[3 * k + 2]! * d[2]!) as Vec3;
    };
    const c: Vec3 = [s.c[0]!, s.c[1]!, s.c[2]!];
    const N = 18; // upright, lower arm, upper arm: (u, θ) each, about the body's own reference point
    const K: number[][] = Array.from({ length: N }, () => new Array<number>(N).fill(0));
    const cons: number[][] = [];
    // Point q of body b (reference point ref) moves by u + θ × (q − ref) = T·[u; θ].
    const T = (q: Vec3, ref: Vec3) => {
      const r = [q[0] - ref[0], q[1] - ref[1], q[2] - ref[2]];
      return [
        [1, 0, 0, 0, r[2]!, -r[1]!],
        [0, 1, 0, -r[2]!, 0, r[0]!],
        [0, 0, 1, r[1]!, -r[0]!, 0],
      ];
    };
    const addSpring = (b: number, q: Vec3, ref: Vec3, k3: number[][]) => {
      const t = T(q, ref);
      for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) {
        let v = 0;
        for (let a = 0; a < 3; a++) for (let d = 0; d < 3; d++) v += t[a]![i]! * k3[a]![d]! * t[d]![j]!;
        K[6 * b + i]![6 * b + j]! += v;
      }
    };
    const k3 = (kr: number, ka: number, axis: Vec3) => [0, 1, 2].map((i) => [0, 1, 2].map((j) => kr * ((i === j ? 1 : 0) - axis[i]! * axis[j]!) + ka * axis[i]! * axis[j]!));
    const unit = (v: number[]): Vec3 => {
      const l = Math.hypot(v[0]!, v[1]!, v[2]!);
      return [v[0]! / l, v[1]! / l, v[2]! / l];
    };
    const arms = [
      { b: 1, front: 'lowerFront', rear: 'lowerRear', outer: 'lowerOuter' },
      { b: 2, front: 'upperFront', rear: 'upperRear', outer: 'upperOuter' },
    ];
    for (const a of arms) {
      const P = up(a.outer);
      const axis = unit([0, 1, 2].map((k) => p[a.rear]![k]! - p[a.front]![k]!));
      for (const pivot of [a.front, a.rear]) addSpring(a.b, p[pivot]!, P, k3(bush[pivot]!.radialNPerMm, bush[pivot]!.axialNPerMm, axis));
      // Ball joint: arm point P (reference of the arm) = upright point P.
      const tu = T(P, c);
      for (let k = 0; k < 3; k++) {
        const row = new Array<number>(N).fill(0);
        for (let j = 0; j < 6; j++) row[j] = tu[k]![j]!;
        row[6 * a.b + k] = -1;
        cons.push(row);
      }
    }
    // Tie rod: an axial spring of the series rate (inner bushing axially, and the rack through the rod's direction).
    const Q: Vec3 = [s.steerInner[0]!, s.steerInner[1]!, s.steerInner[2]!];
    const Pt = up('tieRodOuter');
    const n = unit([0, 1, 2].map((k) => Pt[k]! - Q[k]!));
    const kt = 1 / (1 / bush['tieRodInner']!.axialNPerMm + (n[1] * n[1]) / corner.steeringStiffnessNPerMm!);
    addSpring(0, Pt, c, [0, 1, 2].map((i) => [0, 1, 2].map((j) => kt * n[i]! * n[j]!)));
    // Height held.
    const h = new Array<number>(N).fill(0);
    h[2] = 1;
    cons.push(h);
    const m = cons.length;
    const KKT = Array.from({ length: N + m }, (_, i) => Array.from({ length: N + m }, (_, j) => (i < N && j < N ? K[i]![j]! : i < N ? cons[j - N]![i]! : j < N ? cons[i - N]![j]! : 0)));
    for (const load of LOAD_NAMES) {
      const f = new Float64Array(6);
      unitLoad(pc, load, f);
      const rhs = Array.from({ length: N + m }, (_, i) => [i < 6 ? f[i]! : 0]);
      const sol = (lusolve(KKT, rhs) as number[][]).map((r) => r[0]!);
      const x = respond(pc, f).x;
      const big = Math.max(...Array.from(x).map(Math.abs));
      for (let i = 0; i < 6; i++) expect(Math.abs(sol[i]! - x[i]!)).toBeLessThan(1e-9 * big);
    }
    expect(complianceSpec(s.model).rigid).toBe(false);
  });
});

describe('compliance: rigid corners, sweeps and input', () => {
  it('a corner without bushings is rigid: zero compliance, unbounded stiffness, and it says so', () => {
    const r = cornerCompliance(fixture('road-front-strut'));
    expect(r.rigid).toBe(true);
    expect(r.notes[0]).toMatch(/rigid/);
    for (const l of LOAD_NAMES) expect(Math.abs(r.loads[l].toeDeg) + Math.abs(r.loads[l].camberDeg)).toBe(0);
    expect(r.lateralStiffnessNPerMm).toBeNull();
    // Statics still hold: the link forces of a rigid corner balance the load (a lateral force is carried).
    expect(Math.max(...Object.values(r.linkForcesN.lateralForce).map(Math.abs))).toBeGreaterThan(0.1);
  });

  it('sweeps travels × rack positions, figures varying with the pose', () => {
    const corner = bushed(fixture('fs-front-wishbone'));
    const rows = complianceSweep(corner, [-20, 0, 20], [-10, 0, 10]);
    expect(rows).toHaveLength(9);
    const mid = rows[4]!;
    expect(mid.travelMm).toBe(0);
    expect(mid.rackMm).toBe(0);
    expect(mid.lateralForceToeDegPerKN).toBeCloseTo(cornerCompliance(corner).lateralForceToeDegPerKN, 12);
    expect(new Set(rows.map((r) => r.aligningMomentToeDegPerKNm.toFixed(6))).size).toBeGreaterThan(1);
  });

  it('a rack outside the stroke is refused naming the field', () => {
    expect(() => cornerCompliance(bushed(fixture('fs-front-wishbone')), { rackMm: 99 })).toThrow(/rackMm.*outside the steering stroke/);
  });
});

describe('compliance: corner keys', () => {
  // Issue 17 ("Bad input … naming the field"; unknown point names refused with the nearest real key).
  const wishbone = fixture('fs-front-wishbone');
  const fails = (extra: Record<string, unknown>, base: Corner = wishbone) => {
    try {
      cornerCompliance({ ...base, ...extra });
    } catch (e) {
      return (e as { issues: { path: string; message: string }[] }).issues[0]!;
    }
    throw new Error('accepted');
  };
  it('a misspelt bushing point is refused with the nearest real point', () => {
    const i = fails({ bushings: { lowerFrnt: { radialNPerMm: 1000, axialNPerMm: 500 } } });
    expect(i.message).toMatch(/bushings\.lowerFrnt \(did you mean bushings\.lowerFront\?\)/);
  });
  it('a point of another corner type is refused', () => {
    expect(fails({ bushings: { strutTop: { radialNPerMm: 1000, axialNPerMm: 500 } } }).message).toMatch(/bushings\.strutTop/);
  });
  it('non-positive or missing rates name the field', () => {
    expect(fails({ bushings: { lowerFront: { radialNPerMm: 0, axialNPerMm: 500 } } }).path).toBe('bushings.lowerFront.radialNPerMm');
    expect(fails({ bushings: { lowerFront: { radialNPerMm: 1000 } } }).path).toBe('bushings.lowerFront.axialNPerMm');
    expect(fails({ linkAxialNPerMm: { tieRod: -5 } }).path).toBe('linkAxialNPerMm.tieRod');
    expect(fails({ steeringStiffnessNPerMm: Number.NaN }).path).toBe('steeringStiffnessNPerMm');
  });
  it('steering stiffness on an unsteered corner is refused', () => {
    expect(fails({ steeringStiffnessNPerMm: 2000 }, fixture('road-rear-five-link')).path).toBe('steeringStiffnessNPerMm');
  });
});
