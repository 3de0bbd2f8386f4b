import { describe, expect, it } from 'vitest';
import { solvePose, sweepCorner, rollSteerCoefficient, axleKinematics } from '../../../shared/kinematics/index.js';
import type { Corner } from '../../../shared/schema/corner.js';
import { planarWishbone } from './helpers.js';

const toeAt = (c: Corner, travelMm: number, rackMm = 0) => solvePose(c, { travelMm, rackMm }).toeDeg;

describe('planar double wishbone, analytic cases', () => {
  it('case A: tie rod parallel to equal arms and as long: toe ≡ 0', () => {
    const c = planarWishbone({ tieRodInner: [-100, 300, 200] });
    for (const t of [-50, -25, -10, 0, 10, 25, 50]) {
      // Source: check-values.md "Kinematics: analytic cases", case A (parallelogram): toe ≡ 0 to 1e-9 deg.
      expect(Math.abs(toeAt(c, t))).toBeLessThan(1e-9);
    }
  });

  it('case B: tie rod 20 mm short gives the closed-form toe-out', () => {
    const c = planarWishbone({ tieRodInner: [-100, 320, 200] });
    // Source: check-values.md case B, derived closed form: toe −0.04287° at ±25 mm, −0.17443° at ±50 mm.
    expect(toeAt(c, 25)).toBeCloseTo(-0.04287, 5);
    expect(toeAt(c, -25)).toBeCloseTo(-0.04287, 5);
    expect(toeAt(c, 50)).toBeCloseTo(-0.17443, 5);
    expect(toeAt(c, -50)).toBeCloseTo(-0.17443, 5);
  });

  it('case B matches an independent evaluation of the closed form at other travels', () => {
    // Source: check-values.md case B, derived closed form, re-derived here (from memory): the parallelogram translates the
    // vertical kingpin to y = 300 + 300·cosθ, z offset t = 300·sinθ; the steering-arm point (100 mm behind the kingpin)
    // turns with steer ψ to (−100·cosψ, y − 100·sinψ, 200 + t) and must stay 280 mm from the tie-rod inner point
    // (−100, 320, 200). toe = −ψ. Solved by bisection, independent of the Newton solver.
    const c = planarWishbone({ tieRodInner: [-100, 320, 200] });
    for (const t of [-40, -25, -15, 5, 25, 35, 50]) {
      const ky = 300 + 300 * Math.cos(Math.asin(t / 300));
      const f = (psi: number) => Math.hypot(100 - 100 * Math.cos(psi), ky - 100 * Math.sin(psi) - 320, t) - 280;
      let a = -0.3;
      let b = 0.3;
      for (let i = 0; i < 200; i++) {
        const m = (a + b) / 2;
        if (Math.sign(f(m)) === Math.sign(f(a))) a = m;
        else b = m;
      }
      const psi = (a + b) / 2;
      expect(toeAt(c, t)).toBeCloseTo((-psi * 180) / Math.PI, 9);
    }
  });

  it('tie rod pointing at the front-view instant centre: zero toe slope at design, curvature remains', () => {
    // Unequal arms (upper 220 mm, lower 300 mm), upper arm rising outboard from z 330 to 350: the front-view lines meet inboard.
    const tilted = planarWishbone({ tieRodInner: [-100, 320, 200], upperLength: 220 });
    (tilted.points as Record<string, number[]>)['upperFront']![2] = 330;
    (tilted.points as Record<string, number[]>)['upperRear']![2] = 330;
    // IC of the planar linkage (from memory: intersection of the arm lines in front view).
    const lo = { y0: 300, z0: 120, y1: 600, z1: 120 };
    const up = { y0: 380, z0: 330, y1: 600, z1: 350 };
    const slope = (up.z1 - up.z0) / (up.y1 - up.y0);
    const yIc = up.y1 + (lo.z1 - up.z1) / slope;
    const zIc = 120;
    const outer = [-100, 600, 200];
    const dir = [yIc - outer[1]!, zIc - outer[2]!];
    const len = 280 / Math.hypot(dir[0]!, dir[1]!);
    (tilted.points as Record<string, number[]>)['tieRodInner'] = [-100, outer[1]! + dir[0]! * len, outer[2]! + dir[1]! * len];
    const sw = sweepCorner(tilted, { travel: { from: -25, to: 25, step: 5 } });
    // Source: check-values.md "A tie rod pointing at the front-view instant centre gives zero first derivative of toe at design height".
    expect(Math.abs(sw.fit.toeGradientAtDesignDegPerM!)).toBeLessThan(1e-7);
    // "a second-order residual remains"
    expect(Math.abs(sw.fit.curvatureDegPerM2)).toBeGreaterThan(1);
    // The same check against our own instant centre.
    const ours = axleKinematics(tilted).left.frontViewIc;
    expect(ours.yMm!).toBeCloseTo(yIc, 6);
    expect(ours.zMm!).toBeCloseTo(zIc, 6);
  });

  it('tie rod on the lower arm pivot axis and the fore-aft line through its ball joint: zero toe straight ahead, not with rack', () => {
    const c = planarWishbone({ tieRodInner: [-100, 300, 120], tieRodOuter: [-100, 600, 120], upperLength: 220 });
    (c.points as Record<string, number[]>)['upperFront']![2] = 330;
    (c.points as Record<string, number[]>)['upperRear']![2] = 330;
    // Source: domain.md / check-values.md (common practice; derived): zero bump steer straight ahead.
    for (const t of [-50, -20, 0, 20, 50]) expect(Math.abs(toeAt(c, t))).toBeLessThan(1e-9);
    // With the rack moved the inner point leaves the axis: bump steer appears (domain.md "any match holds at one rack position only").
    const sw = sweepCorner(c, { travel: { from: -25, to: 25, step: 5 }, rackMm: [-20, 0, 20] });
    const toe = (rack: number, t: number) => sw.rows.find((r) => r.rackMm === rack && r.travelMm === t)!.toeDeg;
    for (const rack of [-20, 20]) {
      for (const t of [-25, 25]) expect(Math.abs(toe(rack, t) - toe(rack, 0))).toBeGreaterThan(0.005);
    }
    expect(Math.abs(sw.fit.byRack.find((f) => f.rackMm === 0)!.maxDeviationDeg)).toBeLessThan(1e-9);
  });
});

describe('roll steer coefficient', () => {
  it('worked check: +4 deg/m toe-in on both wheels at t = 1500 mm gives ε = −0.0524', () => {
    // Wheel centre at y = 750 with zero camber: contact-patch track exactly 1500 mm. Tune the tie-rod inner height so the
    // toe-in gradient at design is +4 deg/m (secant on our own analytic gradient).
    const make = (z: number) => planarWishbone({ tieRodInner: [-100, 320, z], upperLength: 220, wheelCentreY: 750 });
    const grad = (z: number) => sweepCorner(make(z), { travel: { from: -5, to: 5, step: 5 } }).fit.toeGradientAtDesignDegPerM! - 4;
    let z0 = 200;
    let z1 = 210;
    let f0 = grad(z0);
    let f1 = grad(z1);
    for (let i = 0; i < 30 && Math.abs(f1) > 1e-12; i++) {
      const z2 = z1 - (f1 * (z1 - z0)) / (f1 - f0);
      z0 = z1;
      f0 = f1;
      z1 = z2;
      f1 = grad(z1);
    }
    const c = make(z1);
    const eps = rollSteerCoefficient(c);
    // Source: domain.md worked check: ε = −0.004·750·π/180 = −0.0524 (rear: roll understeer).
    expect(eps).toBeCloseTo(-0.0524, 4);
    expect(eps).toBeCloseTo((-0.004 * 750 * Math.PI) / 180, 9);
  });
});
