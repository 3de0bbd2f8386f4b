/**
 * Round trips of the back-solver through the kinematics engine (issue 5):
 * the proposed geometry, re-run independently through
 * `rollSteerCoefficient`, meets the target within 0.002 deg/deg; bounds hold;
 * only movable coordinates change; starting points do not matter; infeasible
 * targets name their limiting bound; zero bump steer on the parallelogram
 * case of check-values.md gives zero toe change nearest the current geometry.
 */
import { describe, expect, it } from 'vitest';
import { exampleCorners, rollSteerCoefficient, solvePose, sweepCorner } from '../../../shared/kinematics/index.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { computeBalance } from '../../../shared/balance/api.js';
import { intentSchema, type IntentInput } from '../../../shared/schema/intent.js';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import { solveIntent, type SolveResult } from '../../../shared/intent/index.js';
import type { AxleName } from '../../../shared/schema/axle.js';

const solve = (i: IntentInput): SolveResult => solveIntent(intentSchema.parse(i));
const ROUND_TRIP_TOL = 0.002; // issue 5: verified ε within 0.002 deg/deg of the target

/** Bounds of ±range mm around the current heights of the tie-rod ends. */
function around(corner: Corner, range: number): Record<string, [number, number]> {
  const p = corner.points as Record<string, Vec3>;
  return {
    'tieRodInner.z': [p['tieRodInner']![2] - range, p['tieRodInner']![2] + range],
    'tieRodOuter.z': [p['tieRodOuter']![2] - range, p['tieRodOuter']![2] + range],
  };
}

function expectWithinBounds(r: SolveResult, bounds: Record<string, [number, number]>) {
  for (const c of r.coordinates) {
    expect(c.proposedMm).toBeGreaterThanOrEqual(bounds[c.name]![0] - 1e-9);
    expect(c.proposedMm).toBeLessThanOrEqual(bounds[c.name]![1] + 1e-9);
  }
  for (const m of r.family) {
    for (const [k, v] of Object.entries(m.coordinates)) {
      expect(v).toBeGreaterThanOrEqual(bounds[k]![0] - 1e-9);
      expect(v).toBeLessThanOrEqual(bounds[k]![1] + 1e-9);
    }
  }
}

/** Every field of the proposed corner equals the input except the movable coordinates. */
function expectOnlyMovableChanged(before: Corner, after: Corner, movable: string[]) {
  const { points: pb, ...restB } = before;
  const { points: pa, ...restA } = after;
  expect(restA).toEqual(restB);
  const axes = ['x', 'y', 'z'];
  for (const [name, v] of Object.entries(pb as Record<string, Vec3>)) {
    const w = (pa as Record<string, Vec3>)[name]!;
    v.forEach((x, k) => {
      const key = `${name}.${axes[k]}`;
      if (!movable.includes(key) && !(movable.includes('rack.z') && name === 'tieRodInner' && k === 2)) expect(w[k]).toBe(x);
    });
  }
}

describe('round trips (verified ε within 0.002 deg/deg, issue 5)', () => {
  const cases: Array<{ what: string; corner: Corner; axle: AxleName; targets: number[]; range: number }> = [
    { what: 'front double wishbone', corner: exampleCorners.fsFrontWishbone, axle: 'front', targets: [-0.05, 0, 0.03, 0.08], range: 20 },
    { what: 'rear double wishbone (toe link)', corner: exampleCorners.fsRearWishbone, axle: 'rear', targets: [-0.08, -0.03, 0.02], range: 20 },
    { what: 'front strut', corner: exampleCorners.roadFrontStrut, axle: 'front', targets: [-0.03, 0.02, 0.1], range: 30 },
  ];
  for (const c of cases) {
    for (const target of c.targets) {
      it(`${c.what}: ε = ${target}`, () => {
        const bounds = around(c.corner, c.range);
        const movable = ['tieRodInner.z', 'tieRodOuter.z'];
        const r = solve({ corner: c.corner, axle: c.axle, target: { rollSteerCoefficient: target }, movable, bounds, trackProfile: 'smooth-circuit' });
        expect(r.feasible).toBe(true);
        // Independent re-run of the proposed corner through the kinematics engine.
        const eps = rollSteerCoefficient(r.corner);
        expect(Math.abs(eps - target)).toBeLessThan(ROUND_TRIP_TOL);
        expect(r.achieved.rollSteerCoefficient).toBeCloseTo(eps, 12);
        expectWithinBounds(r, bounds);
        expectOnlyMovableChanged(c.corner, r.corner, movable);
        expect(r.family.length).toBeGreaterThanOrEqual(21);
        expect(r.family.filter((m) => m.chosen)).toHaveLength(1);
        for (const m of r.family) expect(Math.abs(m.rollSteerCoefficient - target)).toBeLessThan(ROUND_TRIP_TOL);
        // The chosen member is the best of the family (the objective it minimises).
        const best = Math.min(...r.family.map((m) => m.objectiveRmsDeg));
        expect(r.achieved.objectiveRmsDeg).toBeLessThanOrEqual(best + 1e-7);
      });
    }
  }

  it('five-link rear: only the toe link ends move', () => {
    const corner = exampleCorners.roadRearFiveLink;
    const p = corner.points as Record<string, Vec3>;
    const bounds: Record<string, [number, number]> = { 'link5Inner.z': [p['link5Inner']![2] - 30, p['link5Inner']![2] + 30], 'link5Outer.z': [p['link5Outer']![2] - 30, p['link5Outer']![2] + 30] };
    const r = solve({ corner, axle: 'rear', target: { rollSteerCoefficient: -0.04 }, movable: ['link5Inner.z', 'link5Outer.z'], bounds, trackProfile: 'rough-road' });
    expect(r.feasible).toBe(true);
    expect(Math.abs(rollSteerCoefficient(r.corner) + 0.04)).toBeLessThan(ROUND_TRIP_TOL);
    expect(r.geometry.innerPoint).toBe('link5Inner');
    expectOnlyMovableChanged(corner, r.corner, ['link5Inner.z', 'link5Outer.z']);
    expectWithinBounds(r, bounds);
  });

  it('three movable coordinates (with the rack length) still meet the target inside the bounds', () => {
    const corner = exampleCorners.fsFrontWishbone;
    const bounds = { ...around(corner, 15), 'tieRodInner.y': [195, 225] as [number, number] };
    const movable = ['tieRodInner.z', 'tieRodOuter.z', 'tieRodInner.y'];
    const r = solve({ corner, axle: 'front', target: { rollSteerCoefficient: 0.01 }, movable, bounds, trackProfile: 'smooth-circuit' });
    expect(r.feasible).toBe(true);
    expect(Math.abs(rollSteerCoefficient(r.corner) - 0.01)).toBeLessThan(ROUND_TRIP_TOL);
    expectWithinBounds(r, bounds);
    expectOnlyMovableChanged(corner, r.corner, movable);
  });

  it('an understeer-gradient target is met through the balance model (its roll-steer term with the corner linked in)', () => {
    const vehicle = exampleVehicles.tur26Ember;
    const corner = exampleCorners.fsRearWishbone;
    const r = solve({ corner, axle: 'rear', target: { understeerChangeDegPerG: 0.05 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: around(corner, 25), trackProfile: 'smooth-circuit', vehicle });
    expect(r.feasible).toBe(true);
    const e0 = rollSteerCoefficient(corner);
    const e1 = rollSteerCoefficient(r.corner);
    // K_rs = ε_f·dφs,f/da_y − ε_r·dφs,r/da_y (domain.md), read by the balance API with each corner linked in.
    const kRs = (c: Corner) => computeBalance({ vehicle, rearCorner: c, sensitivity: false }).understeerBudget.rollSteer;
    const dK = kRs(r.corner) - kRs(corner);
    expect(dK).toBeCloseTo(0.05, 9);
    expect(r.understeerChangeDegPerG).toBeCloseTo(dK, 9);
    expect(r.target.understeerChangeDegPerG).toBe(0.05);
    expect(e1).toBeLessThan(e0); // more rear roll understeer (ε_r more negative) adds understeer
  });
});

describe('search behaviour', () => {
  it('different starting points reach the same solution (interior optimum of a front strut)', () => {
    const base = exampleCorners.roadFrontStrut;
    const p = base.points as Record<string, Vec3>;
    const shifted = (di: number, dO: number): Corner =>
      ({ ...base, points: { ...base.points, tieRodInner: [p['tieRodInner']![0], p['tieRodInner']![1], p['tieRodInner']![2] + di], tieRodOuter: [p['tieRodOuter']![0], p['tieRodOuter']![1], p['tieRodOuter']![2] + dO] } });
    const bounds = around(base, 40);
    const run = (c: Corner) => solve({ corner: c, axle: 'front', target: { rollSteerCoefficient: 0.05 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds, trackProfile: 'smooth-circuit' });
    const runs = [run(base), run(shifted(12, -9)), run(shifted(-15, 14)), run(shifted(25, 25))];
    const first = runs[0]!;
    // An interior optimum (no bound active), so the answer is the objective's, not a bound's.
    expect(first.coordinates.every((c) => c.atBound === null)).toBe(true);
    for (const r of runs) {
      expect(r.tieBreak).toBe('unique');
      // Same solution to a hundredth of a millimetre (TIE_MOVE_MM; far below shim and machining tolerances).
      expect(Math.abs(r.coordinates[0]!.proposedMm - first.coordinates[0]!.proposedMm)).toBeLessThan(0.01);
      expect(Math.abs(r.coordinates[1]!.proposedMm - first.coordinates[1]!.proposedMm)).toBeLessThan(0.01);
    }
  });

  it('an infeasible target is reported with the closest achievable geometry and the limiting bound', () => {
    const corner = exampleCorners.fsFrontWishbone;
    const bounds = around(corner, 5);
    const r = solve({ corner, axle: 'front', target: { rollSteerCoefficient: 0.5 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds, trackProfile: 'smooth-circuit' });
    expect(r.feasible).toBe(false);
    expect(r.reason).toMatch(/cannot be met/);
    expect(r.limitingBound).not.toBeNull();
    expect(r.reason).toContain(r.limitingBound!.coordinate);
    expect(r.family).toEqual([]);
    // The closest achievable: no corner of the box gets nearer the target (ε near-linear, so a box corner is optimal).
    const eps = rollSteerCoefficient(r.corner);
    expect(r.achieved.rollSteerCoefficient).toBeCloseTo(eps, 12);
    const p = corner.points as Record<string, Vec3>;
    for (const zi of [bounds['tieRodInner.z']![0], bounds['tieRodInner.z']![1]]) {
      for (const zo of [bounds['tieRodOuter.z']![0], bounds['tieRodOuter.z']![1]]) {
        const c = { ...corner, points: { ...corner.points, tieRodInner: [p['tieRodInner']![0], p['tieRodInner']![1], zi], tieRodOuter: [p['tieRodOuter']![0], p['tieRodOuter']![1], zo] } } as Corner;
        expect(Math.abs(rollSteerCoefficient(c) - 0.5)).toBeGreaterThanOrEqual(Math.abs(eps - 0.5) - 1e-12);
      }
    }
    expectWithinBounds(r, bounds);
  });

  it('a worst-toe bound nobody can meet makes the result infeasible and names the bound', () => {
    const corner = exampleCorners.fsFrontWishbone;
    const r = solve({ corner, axle: 'front', target: { rollSteerCoefficient: 0.02 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: around(corner, 10), trackProfile: 'smooth-circuit', options: { worstToeBoundDeg: 1e-4 } });
    expect(r.feasible).toBe(false);
    expect(r.limitingBound?.coordinate).toBe('options.worstToeBoundDeg');
    expect(r.achieved.worstToeDeg).toBeGreaterThan(1e-4);
  });
});

/** Case A of check-values.md (planar double wishbone, parallelogram; metres there, mm here). */
function parallelogram(innerZ = 200, outerZ = 200): Corner {
  return {
    formatVersion: 1,
    type: 'double-wishbone',
    steered: true,
    wheel: { radius: 250 },
    points: {
      wheelCentre: [0, 650, 250],
      spindle: [0, 600, 250],
      upperFront: [100, 300, 350],
      upperRear: [-100, 300, 350],
      upperOuter: [0, 600, 350],
      lowerFront: [100, 300, 120],
      lowerRear: [-100, 300, 120],
      lowerOuter: [0, 600, 120],
      tieRodInner: [-100, 300, innerZ],
      tieRodOuter: [-100, 600, outerZ],
    },
    steering: { kind: 'rack', rackAxis: [0, 1, 0], rackStroke: [-20, 20] },
  };
}

describe('zero bump steer on the parallelogram (check-values.md case A)', () => {
  const bounds = { 'tieRodInner.z': [150, 250] as [number, number], 'tieRodOuter.z': [150, 250] as [number, number] };
  const movable = ['tieRodInner.z', 'tieRodOuter.z'];

  it('keeps the current geometry: it already has zero toe change, and it is the nearest', () => {
    const r = solve({ corner: parallelogram(), axle: 'front', target: { zeroBumpSteer: true }, movable, bounds, trackProfile: 'smooth-circuit' });
    expect(r.feasible).toBe(true);
    expect(r.coordinates[0]!.proposedMm).toBeCloseTo(200, 6);
    expect(r.coordinates[1]!.proposedMm).toBeCloseTo(200, 6);
    // check-values.md: toe ≡ 0 over all travel (to 1e-9 deg)
    for (const row of r.achieved.toeCurve.filter((x) => x.rackMm === 0)) expect(Math.abs(row.toeDeg)).toBeLessThan(1e-9);
  });

  it('from a tie rod that is not parallel, returns a parallel one nearest the current heights with zero toe change', () => {
    const r = solve({ corner: parallelogram(190, 200), axle: 'front', target: { zeroBumpSteer: true }, movable, bounds, trackProfile: 'smooth-circuit' });
    expect(r.feasible).toBe(true);
    const [zi, zo] = r.coordinates.map((c) => c.proposedMm);
    // Parallel and equal length at any height keeps the parallelogram (toe ≡ 0); nearest to (190, 200) is (195, 195).
    expect(zi!).toBeCloseTo(195, 2);
    expect(zo!).toBeCloseTo(195, 2);
    const sw = sweepCorner(r.corner, { travel: { from: -25, to: 25, step: 5 }, rackMm: [0] });
    for (const row of sw.rows) expect(Math.abs(row.toeDeg)).toBeLessThan(1e-6);
  });
});

describe('workshop numbers', () => {
  const corner = exampleCorners.fsRearWishbone;
  const r = solve({ corner, axle: 'rear', target: { rollSteerCoefficient: -0.06 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: around(corner, 20), trackProfile: 'smooth-circuit', options: { shimThicknessMm: 0.5, threadPitchMm: 1.25 } });
  const p = corner.points as Record<string, Vec3>;

  it('the shim stack at each end moves that point by exactly the stack (as built)', () => {
    const built = r.workshop.asBuilt.geometry;
    const inner = r.workshop.shims.find((s) => s.end === 'inner')!;
    const outer = r.workshop.shims.find((s) => s.end === 'outer')!;
    expect(built.tieRodInner[2] - p['tieRodInner']![2]).toBeCloseTo(inner.shims * 0.5, 12);
    expect(built.tieRodOuter[2] - p['tieRodOuter']![2]).toBeCloseTo(outer.shims * 0.5, 12);
    expect(inner.stackMm).toBe(inner.shims * 0.5);
    expect(Math.abs(inner.residualMm)).toBeLessThanOrEqual(0.25 + 1e-12);
    expect(inner.heightChangeMm).toBeCloseTo(r.coordinates[0]!.changeMm, 12);
    // The as-built ε is a real re-run of the shimmed geometry.
    const c = { ...corner, points: { ...corner.points, tieRodInner: built.tieRodInner, tieRodOuter: built.tieRodOuter } } as Corner;
    expect(r.workshop.asBuilt.rollSteerCoefficient).toBeCloseTo(rollSteerCoefficient(c), 12);
  });

  it('turns × pitch equals the as-built length change; the new length is the distance of the new points', () => {
    const w = r.workshop;
    expect(w.adjuster.lengthPerTurnMm).toBe(1.25);
    expect(w.adjuster.turns * 1.25).toBeCloseTo(w.tieRod.asBuiltLengthMm - w.tieRod.lengthBeforeMm, 12);
    const g = r.geometry;
    expect(w.tieRod.lengthAfterMm).toBeCloseTo(Math.hypot(g.tieRodOuter[0] - g.tieRodInner[0], g.tieRodOuter[1] - g.tieRodInner[1], g.tieRodOuter[2] - g.tieRodInner[2]), 12);
  });

  it('a turnbuckle halves the turns', () => {
    const t = solve({ corner, axle: 'rear', target: { rollSteerCoefficient: -0.06 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: around(corner, 20), trackProfile: 'smooth-circuit', options: { shimThicknessMm: 0.5, threadPitchMm: 1.25, adjuster: 'turnbuckle' } });
    expect(t.workshop.adjuster.turns).toBeCloseTo(r.workshop.adjuster.turns / 2, 9);
  });

  it('static toe before the adjuster is turned: a rack-length change equals the old tie rod at that rack travel', () => {
    // Moving the inner point by Δy with the old tie-rod length is the current corner with the rack at Δy (exactly).
    const front = exampleCorners.fsFrontWishbone;
    const y0 = (front.points as Record<string, Vec3>)['tieRodInner']![1];
    const s = solve({ corner: front, axle: 'front', target: { rollSteerCoefficient: rollSteerCoefficient(front) + 0.002 }, movable: ['tieRodInner.y'], bounds: { 'tieRodInner.y': [y0 - 8, y0 + 8] }, trackProfile: 'smooth-circuit' });
    expect(s.feasible).toBe(true);
    const dy = s.coordinates[0]!.changeMm;
    expect(Math.abs(dy)).toBeGreaterThan(0.05);
    expect(s.workshop.shims.every((x) => x.shims === 0)).toBe(true);
    const exact = solvePose(front, { travelMm: 0, rackMm: dy }).toeDeg;
    expect(s.workshop.staticToe.toeAfterShimmingDeg).toBeCloseTo(exact, 3);
    expect(s.workshop.staticToe.resetDeg).toBeCloseTo(s.workshop.staticToe.designToeDeg - exact, 3);
  });
});

describe('result contents', () => {
  const corner = exampleCorners.fsFrontWishbone;
  const r = solve({ corner, axle: 'front', target: { rollSteerCoefficient: 0.02 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: around(corner, 20), trackProfile: 'smooth-circuit', vehicle: exampleVehicles.tur26Ember });

  it('sensitivity is dε/dmm of the verified kinematics', () => {
    const p = r.corner.points as Record<string, Vec3>;
    const at = (dz: number) => rollSteerCoefficient({ ...r.corner, points: { ...r.corner.points, tieRodOuter: [p['tieRodOuter']![0], p['tieRodOuter']![1], p['tieRodOuter']![2] + dz] } } as Corner);
    expect(r.sensitivity['tieRodOuter.z']).toBeCloseTo((at(0.01) - at(-0.01)) / 0.02, 5);
  });

  it('reports side effects, the safety caution and the pose count', () => {
    expect(r.sideEffects.steeringRatioDegPerMm).not.toBeNull();
    expect(r.sideEffects.ackermannPct).not.toBeNull();
    expect(Number.isFinite(r.sideEffects.rollCentreHeightMm!.change)).toBe(true);
    expect(r.sideEffects.ballJointArticulationDeg.inner.after).toBeGreaterThan(0);
    expect(r.cautions.at(-1)!.code).toBe('safety-notice');
    expect(r.diagnostics.poses).toBeGreaterThan(100);
    expect(r.understeerChangeDegPerG).not.toBeNull();
  });

  it('the toe curve is the verification sweep at every rack position', () => {
    const racks = [...new Set(r.achieved.toeCurve.map((x) => x.rackMm))];
    expect(racks).toEqual([0, -30, 30]);
    const sw = sweepCorner(r.corner, { travel: { from: -25, to: 25, step: 2.5 }, rackMm: [0] });
    expect(r.achieved.bumpSteerDegPerM).toBeCloseTo(sw.fit.bumpSteerDegPerM, 9);
  });
});

describe('coordinates and profiles', () => {
  it('rack.z moves the tie-rod inner height by an offset from the current rack height', () => {
    const corner = exampleCorners.fsFrontWishbone;
    const p = corner.points as Record<string, Vec3>;
    const bounds = { 'rack.z': [-15, 15] as [number, number], 'tieRodOuter.z': [p['tieRodOuter']![2] - 15, p['tieRodOuter']![2] + 15] as [number, number] };
    const r = solve({ corner, axle: 'front', target: { rollSteerCoefficient: 0.04 }, movable: ['rack.z', 'tieRodOuter.z'], bounds, trackProfile: 'smooth-circuit' });
    expect(r.feasible).toBe(true);
    const rack = r.coordinates.find((c) => c.name === 'rack.z')!;
    expect(rack.currentMm).toBe(0);
    expect(r.geometry.tieRodInner[2]).toBeCloseTo(p['tieRodInner']![2] + rack.proposedMm, 12);
    expect(Math.abs(rollSteerCoefficient(r.corner) - 0.04)).toBeLessThan(ROUND_TRIP_TOL);
    expectOnlyMovableChanged(corner, r.corner, ['rack.z', 'tieRodOuter.z']);
    expect(r.workshop.shims.find((s) => s.end === 'inner')!.heightChangeMm).toBeCloseTo(rack.proposedMm, 12);
  });

  it('deliberate roll steer on the off-road profile carries the zero-bump-steer advice', () => {
    const corner = exampleCorners.fsRearWishbone;
    const r = solve({ corner, axle: 'rear', target: { rollSteerCoefficient: -0.05 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: around(corner, 20), trackProfile: { id: 'off-road', travelMm: [-25, 25], bumpHeightMm: 20 } });
    const c = r.cautions.find((x) => x.code === 'long-travel-roll-steer');
    expect(c?.level).toBe('critical'); // |ε| = 0.05 ≥ 0.03
    expect(c?.message).toMatch(/zero bump steer/);
    const z = solve({ corner, axle: 'rear', target: { zeroBumpSteer: true }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: around(corner, 20), trackProfile: { id: 'off-road', travelMm: [-25, 25], bumpHeightMm: 20 } });
    expect(z.cautions.some((x) => x.code === 'long-travel-roll-steer')).toBe(false);
    expect(Math.abs(z.achieved.rollSteerCoefficient)).toBeLessThan(1e-6);
  });
});

describe('travel beyond the corner', () => {
  it('a profile travel the corner cannot reach is a SolveError naming the travel and the setting to change', () => {
    const corner = exampleCorners.fsFrontWishbone;
    expect(() => solve({ corner, axle: 'front', target: { rollSteerCoefficient: 0.02 }, movable: ['tieRodInner.z'], bounds: { 'tieRodInner.z': [130, 150] }, trackProfile: 'off-road' })).toThrow(
      /travel -?\d+(\.\d+)? mm.*trackProfile\.travelMm/,
    );
  });
});

describe('rack positions the linkage cannot reach', () => {
  it('are reported with a caution, left out of the worst toe, and do not stop the solve', () => {
    const corner = structuredClone(exampleCorners.fsFrontWishbone) as Corner;
    if (corner.steering?.kind !== 'rack') throw new Error('expected a rack');
    corner.steering.rackStroke = [-30, 120]; // beyond what the tie rod can follow (the kinematics engine says where)
    const r = solve({ corner, axle: 'front', target: { rollSteerCoefficient: 0.02 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], bounds: around(corner, 20), trackProfile: 'smooth-circuit', options: { rackPositionsMm: [-30, 110], worstToeBoundDeg: 1 } });
    expect(r.feasible).toBe(true);
    expect(r.achieved.unreachableRacks.map((u) => u.rackMm)).toEqual([110]);
    expect(r.achieved.byRack.map((b) => b.rackMm)).toEqual([0, -30]);
    expect(r.cautions.find((c) => c.code === 'rack-pose-unreachable')?.value).toBe(110);
    expect(Math.abs(rollSteerCoefficient(r.corner) - 0.02)).toBeLessThan(ROUND_TRIP_TOL);
  });
});

describe('steering-box arm', () => {
  it('rack.z raises the arm axis with the tie-rod inner point, and the target is met', () => {
    const corner = structuredClone(exampleCorners.fsFrontWishbone) as Corner;
    const p = corner.points as Record<string, Vec3>;
    // An idler-style arm swinging about a vertical axis 60 mm inboard of the tie-rod inner point (invented layout).
    corner.steering = { kind: 'arm', armAxisPoint: [p['tieRodInner']![0], p['tieRodInner']![1] - 60, 100], armAxisDirection: [0, 0, 1], angularStrokeDeg: [-20, 20] };
    const bounds = { 'rack.z': [-10, 10] as [number, number], 'tieRodOuter.z': [p['tieRodOuter']![2] - 15, p['tieRodOuter']![2] + 15] as [number, number] };
    const r = solve({ corner, axle: 'front', target: { rollSteerCoefficient: 0.03 }, movable: ['rack.z', 'tieRodOuter.z'], bounds, trackProfile: 'smooth-circuit' });
    expect(r.feasible).toBe(true);
    const dz = r.coordinates.find((c) => c.name === 'rack.z')!.proposedMm;
    expect(r.corner.steering?.kind).toBe('arm');
    if (r.corner.steering?.kind === 'arm') expect(r.corner.steering.armAxisPoint[2]).toBeCloseTo(100 + dz, 12);
    expect(r.geometry.tieRodInner[2]).toBeCloseTo(p['tieRodInner']![2] + dz, 12);
    expect(Math.abs(rollSteerCoefficient(r.corner) - 0.03)).toBeLessThan(ROUND_TRIP_TOL);
    // Rack positions of an arm are its arc travel at the stroke ends: 60 mm × 20° × π/180
    const arc = (60 * 20 * Math.PI) / 180;
    expect(r.achieved.byRack.map((b) => b.rackMm).sort((a, b) => a - b).map((x) => +x.toFixed(6))).toEqual([-arc, 0, arc].map((x) => +x.toFixed(6)));
  });
});
