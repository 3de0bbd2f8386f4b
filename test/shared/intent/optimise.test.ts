/**
 * The search of shared/intent/optimise.ts on synthetic problems whose answer
 * is known in closed form (a linear target and a quadratic objective:
 * Lagrange's condition, common practice), so a wrong search cannot pass.
 */
import { describe, expect, it } from 'vitest';
import { solveFamily, type FamilyProblem } from '../../../shared/intent/optimise.js';
import { brentMinimise, linearFitDeviation, secantRoot } from '../../../shared/intent/numeric.js';

const base = (over: Partial<FamilyProblem> = {}): FamilyProblem => ({
  names: ['a.z', 'b.z'],
  lo: [0, 0],
  hi: [100, 100],
  current: [50, 50],
  // ε = 0.002·a − 0.001·b, target 0.03
  constraint: (q) => 0.002 * q[0]! - 0.001 * q[1]! - 0.03,
  // J = (a − 40)² + (b − 70)² / 4 (deg, synthetic)
  objective: (q) => (q[0]! - 40) ** 2 + (q[1]! - 70) ** 2 / 4,
  tolConstraint: 1e-9,
  familySize: 21,
  ...over,
});

describe('numeric helpers', () => {
  it('secantRoot finds the root of a cubic inside the interval and reports none outside', () => {
    const f = (x: number) => x * x * x - 2 * x - 5; // root 2.0945514815 (classic Newton example, common practice)
    const r = secantRoot(f, 1, 1, 0, 4, 1e-12);
    expect(r.found).toBe(true);
    expect(r.x).toBeCloseTo(2.0945514815, 9);
    // A wrong-signed slope estimate first pushes against the far bound; the root is still found.
    const wrong = secantRoot((x) => x - 3 + 0.01 * x * x, 0, -1, 0, 10, 1e-12);
    expect(wrong.found).toBe(true);
    expect(wrong.x).toBeCloseTo((-1 + Math.sqrt(1 + 0.12)) / 0.02, 9); // root of 0.01x² + x − 3
    const none = secantRoot((x) => x + 10, 0, 1, 0, 5, 1e-9);
    expect(none.found).toBe(false);
    expect(none.x).toBe(0);
  });
  it('brentMinimise finds the minimum of a shifted quadratic and of cos on [2, 4] (π)', () => {
    expect(brentMinimise((x) => (x - 1.3) ** 2, -5, 5, 1e-8).x).toBeCloseTo(1.3, 6);
    expect(brentMinimise(Math.cos, 2, 4, 1e-9).x).toBeCloseTo(Math.PI, 6);
  });
  it('linearFitDeviation: exact line has zero deviation; a parabola has the closed-form RMS', () => {
    const xs = [-2, -1, 0, 1, 2];
    expect(linearFitDeviation(xs, xs.map((x) => 3 * x + 1)).rms).toBeLessThan(1e-12);
    const f = linearFitDeviation(xs, xs.map((x) => x * x));
    // fit of x² on −2…2 is the constant 2; residuals 2, −1, −2, −1, 2 → RMS √(14/5)
    expect(f.slope).toBeCloseTo(0, 12);
    expect(f.rms).toBeCloseTo(Math.sqrt(14 / 5), 12);
    expect(f.max).toBeCloseTo(2, 12);
  });
});

describe('solveFamily', () => {
  it('meets a linear target and reaches the constrained minimum of a quadratic (Lagrange)', () => {
    const o = solveFamily(base());
    expect(o.feasible).toBe(true);
    // On the target b = 2a − 30, J = (a − 40)² + (a − 50)², least at a = 45, b = 60.
    const aStar = 45;
    expect(o.q[0]).toBeCloseTo(aStar, 3);
    expect(o.q[1]).toBeCloseTo(2 * aStar - 30, 3);
    expect(Math.abs(o.constraint)).toBeLessThan(1e-9);
    expect(o.family).toHaveLength(21);
    for (const m of o.family) if (m.feasible) expect(Math.abs(m.constraint)).toBeLessThan(1e-9);
  });

  it('never leaves the bounds, and different starting points reach the same solution', () => {
    const tight = { lo: [0, 60], hi: [100, 100] };
    const s1 = solveFamily(base({ ...tight, current: [10, 95] }));
    const s2 = solveFamily(base({ ...tight, current: [90, 61] }));
    for (const s of [s1, s2]) {
      expect(s.q[1]).toBeGreaterThanOrEqual(60);
      for (const m of s.family) {
        expect(m.q[0]).toBeGreaterThanOrEqual(0);
        expect(m.q[1]).toBeGreaterThanOrEqual(60);
        expect(m.q[1]).toBeLessThanOrEqual(100);
      }
    }
    // Unconstrained optimum b = 60 sits on the bound b ≥ 60 now → a = 45
    expect(s1.q[0]).toBeCloseTo(45, 3);
    expect(s1.q[1]).toBeCloseTo(60, 3);
    expect(s2.q[0]).toBeCloseTo(s1.q[0]!, 4);
    expect(s2.q[1]).toBeCloseTo(s1.q[1]!, 4);
  });

  it('on a flat family takes the member nearest the current geometry', () => {
    const o = solveFamily(base({ objective: () => 0, current: [45, 61] }));
    // nearest point of the line 2a − b = 30 to (45, 61): foot of the perpendicular
    const t = (2 * 45 - 61 - 30) / 5;
    expect(o.tieBreak).toBe('nearest-current');
    expect(o.q[0]).toBeCloseTo(45 - 2 * t, 3);
    expect(o.q[1]).toBeCloseTo(61 + t, 3);
  });

  it('reports an infeasible target with the closest corner of the box and the limiting bounds', () => {
    const o = solveFamily(base({ constraint: (q) => 0.002 * q[0]! - 0.0001 * q[1]! - 0.5 }));
    expect(o.feasible).toBe(false);
    expect(o.q).toEqual([100, 0]);
    expect(o.limiting[0]).toEqual({ coordinate: 'a.z', side: 'max', value: 100, unit: 'mm' });
    expect(o.limiting.map((l) => l.coordinate)).toContain('b.z');
    expect(o.constraint).toBeCloseTo(0.2 - 0.5, 12);
  });

  it('when infeasible, a coordinate with no authority over the target stays at its current value', () => {
    const o = solveFamily(base({ constraint: (q) => 0.002 * q[0]! + 0 * q[1]! - 0.5, current: [50, 37] }));
    expect(o.feasible).toBe(false);
    expect(o.q).toEqual([100, 37]);
    expect(o.limiting.map((l) => l.coordinate)).toEqual(['a.z']);
  });

  it('solves a single coordinate by the secant search alone', () => {
    const o = solveFamily(base({ names: ['a.z'], lo: [0], hi: [100], current: [10], constraint: (q) => 0.002 * q[0]! + 1e-6 * q[0]! ** 2 - 0.1, objective: () => 1 }));
    expect(o.feasible).toBe(true);
    expect(0.002 * o.q[0]! + 1e-6 * o.q[0]! ** 2).toBeCloseTo(0.1, 9);
    expect(o.family).toHaveLength(1);
  });

  it('handles three coordinates by cyclic searches and still meets the target', () => {
    const o = solveFamily(
      base({
        names: ['a.z', 'b.z', 'c.y'],
        lo: [0, 0, 0],
        hi: [100, 100, 100],
        current: [50, 50, 50],
        constraint: (q) => 0.002 * q[0]! - 0.001 * q[1]! + 0.0001 * q[2]! - 0.035,
        objective: (q) => (q[0]! - 40) ** 2 + (q[1]! - 70) ** 2 / 4 + (q[2]! - 20) ** 2,
      }),
    );
    expect(o.feasible).toBe(true);
    expect(Math.abs(o.constraint)).toBeLessThan(1e-9);
    expect(o.q[2]).toBeCloseTo(20, 0);
  });
});
