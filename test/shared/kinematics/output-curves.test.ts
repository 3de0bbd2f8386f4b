import { describe, expect, it } from 'vitest';
import { axleKinematics, exampleCorners, rollSweep, solvePose, sweepCorner } from '../../../shared/kinematics/index.js';
import { outputCurves } from '../../../shared/kinematics/output-curves.js';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import { planarWishbone } from './helpers.js';

import { RAD_PER_DEG } from '../../../shared/angles.js';

/** check-values.md case A: equal, parallel arms 300 mm long (front view), tie rod parallel and as long: the upright translates. */
const parallelogram = (): Corner => planarWishbone({ tieRodInner: [-100, 300, 200] });

describe('output curves against wheel travel (both wheels, heave)', () => {
  it('parallelogram: roll centre, half-track change, toe and camber follow the planar closed form', () => {
    const curves = outputCurves(parallelogram(), { axis: 'travel', range: { from: -40, to: 40, step: 10 } });
    expect(curves.rows.map((r) => r.x)).toEqual([-40, -30, -20, -10, 0, 10, 20, 30, 40]);
    for (const row of curves.rows) {
      // Planar four-bar, derived here (from memory: Milliken & Milliken, Race Car Vehicle Dynamics, ch. 17, the roll centre
      // lies where the lines from each contact patch through its front-view instant centre meet; with parallel arms the
      // instant centre is at infinity and the line runs parallel to the arms). Arms at β = asin(z/300) from horizontal, the
      // contact patch (design y 650, on the ground) translates to y = 650 − 300(1 − cos β), z = travel; the left line
      // meets the centreline 650·tanβ-ish below the contact patch: height above the ground = −y_cp·tan β.
      const beta = Math.asin(row.x / 300);
      const yCp = 650 - 300 * (1 - Math.cos(beta));
      expect(row.halfTrackChangeMm).toBeCloseTo(-300 * (1 - Math.cos(beta)), 8);
      // Translation only: toe and camber stay at their static values (check-values.md case A: toe ≡ 0).
      expect(Math.abs(row.toeDeg)).toBeLessThan(1e-9);
      expect(Math.abs(row.camberDeg)).toBeLessThan(1e-9);
      if (row.x === 0) {
        // Horizontal parallel arms: both lines run along the ground and never meet.
        expect(row.rollCentreHeightMm).toBeNull();
        continue;
      }
      expect(row.rollCentreHeightMm).toBeCloseTo(-yCp * Math.tan(beta), 6);
      // Symmetric axle: the roll centre stays on the centreline in heave (common practice).
      expect(row.rollCentreYMm).toBeCloseTo(0, 6);
    }
  });

  it('spring motion ratio of a vertical spring on the lower arm follows the planar closed form', () => {
    // Spring from the lower arm 200 mm out from its pivot axis straight up 250 mm to the body.
    const c = parallelogram();
    const a = 200;
    const ls = 250;
    const withSpring: Corner = {
      ...c,
      spring: { kind: 'direct', springBody: [0, 300 + a, 120 + ls], springOuter: [0, 300 + a, 120], springOuterOn: 'lowerArm' },
    };
    const curves = outputCurves(withSpring, { axis: 'travel', range: { from: -30, to: 30, step: 15 } });
    for (const row of curves.rows) {
      // Derived here (from memory, planar geometry): the lower arm turns by β = asin(z/300) (the parallelogram carries the
      // wheel centre with the ball joint); the spring point at (300 + a·cosβ, 120 + a·sinβ); length
      // ℓ = √((a(cosβ − 1))² + (ls − a·sinβ)²); motion ratio = −dℓ/dz = −(dℓ/dβ)/(300·cosβ).
      const beta = Math.asin(row.x / 300);
      const len = Math.hypot(a * (Math.cos(beta) - 1), ls - a * Math.sin(beta));
      const dLen = (a * (Math.cos(beta) - 1) * -a * Math.sin(beta) + (ls - a * Math.sin(beta)) * -a * Math.cos(beta)) / len;
      expect(row.springMotionRatio).toBeCloseTo(-dLen / (300 * Math.cos(beta)), 9);
    }
    // At design the ratio is the lever ratio a / arm length (common practice).
    expect(curves.rows.find((r) => r.x === 0)!.springMotionRatio).toBeCloseTo(a / 300, 12);
    expect(outputCurves(c, { axis: 'travel', range: { from: 0, to: 0, step: 1 } }).rows[0]!.springMotionRatio).toBeNull();
  });

  it('anti-dive and anti-lift follow the side-view path of the wheel, evaluated by finite differences', () => {
    // Gillespie, Fundamentals of Vehicle Dynamics, ch. 9 (from memory): anti % = tanθ · (L/h) · share · 100, θ the side-view
    // path angle of the contact patch (outboard brakes) or of the wheel centre (drive through half-shafts). Here tanθ is
    // measured independently of the solver's tangents: central differences (±0.001 mm) of upright-fixed points between two
    // solved poses. Tolerance: the solver closes every link to 1e-10 mm, so a 0.002 mm difference carries ~1e-7 in tanθ,
    // times L/h·share·100 ≈ 300: 3e-5 %.
    const corner = exampleCorners.fsFrontWishbone;
    const anti = { axle: 'front' as const, cgHeightMm: 300, wheelbaseMm: 1550, brakeFrontFraction: 0.6, driveFrontFraction: 0.3 };
    const curves = outputCurves(corner, { axis: 'travel', range: { from: -20, to: 20, step: 10 }, anti, wheelbaseMm: 1550 });
    const wc0 = corner.points.wheelCentre;
    const fixed = (travelMm: number, p: Vec3): Vec3 => {
      const { c, R } = solvePose(corner, { travelMm }).state;
      const d = [p[0] - wc0[0], p[1] - wc0[1], p[2] - wc0[2]];
      return [0, 1, 2].map((i) => c[i]! + R[3 * i]! * d[0]! + R[3 * i + 1]! * d[1]! + R[3 * i + 2]! * d[2]!) as Vec3;
    };
    for (const row of curves.rows) {
      // The upright point that is the contact patch at this pose.
      const cpHere = solvePose(corner, { travelMm: row.x }).contactPatch;
      const { c, R } = solvePose(corner, { travelMm: row.x }).state;
      // Back to design coordinates: p = wc0 + Rᵀ(cp − c).
      const e = [cpHere[0] - c[0], cpHere[1] - c[1], cpHere[2] - c[2]];
      const cpBody: Vec3 = [0, 1, 2].map((i) => wc0[i]! + R[i]! * e[0]! + R[3 + i]! * e[1]! + R[6 + i]! * e[2]!) as Vec3;
      const h = 0.001;
      const a = fixed(row.x - h, cpBody);
      const b = fixed(row.x + h, cpBody);
      const tanCp = (b[0] - a[0]) / (b[2] - a[2]);
      const wa = fixed(row.x - h, wc0);
      const wb = fixed(row.x + h, wc0);
      const tanWc = (wb[0] - wa[0]) / (wb[2] - wa[2]);
      expect(row.antiBrakePercent).toBeCloseTo(tanCp * (1550 / 300) * 0.6 * 100, 3);
      // Front view (Milliken & Milliken, Race Car Vehicle Dynamics, ch. 17, from memory): the instant centre lies on the
      // normal to the contact patch's path through the contact patch; in heave of a symmetric axle the two normals meet on
      // the centreline, cp_y·v_y/v_z above the ground (v the contact patch's velocity, here by the same differences).
      expect(row.rollCentreHeightMm).toBeCloseTo((cpHere[1] * (b[1] - a[1])) / (b[2] - a[2]), 3);
      expect(row.antiDrivePercent).toBeCloseTo(tanWc * (1550 / 300) * 0.3 * 100, 3);
    }
    // At design, the same figures as the axle analysis (one formula, two callers).
    const design = axleKinematics(corner, { anti });
    const at0 = curves.rows.find((r) => r.x === 0)!;
    expect(at0.antiBrakePercent).toBeCloseTo(design.anti!['antiDivePercent']!, 10);
    expect(at0.antiDrivePercent).toBeCloseTo(design.anti!['antiLiftDrivePercent']!, 10);
  });

  it('per-wheel outputs are the sweep rows of the left corner at the same travels', () => {
    const corner = exampleCorners.roadFrontStrut;
    const curves = outputCurves(corner, { axis: 'travel', range: { from: -60, to: 60, step: 20 }, rackMm: 10 });
    const sweep = sweepCorner(corner, { travel: { from: -60, to: 60, step: 20 }, rackMm: [10] });
    curves.rows.forEach((row, i) => {
      const s = sweep.rows[i]!;
      expect(row.toeDeg).toBeCloseTo(s.toeDeg, 9);
      expect(row.camberDeg).toBeCloseTo(s.camberDeg, 9);
      expect(row.casterDeg).toBeCloseTo(s.casterDeg, 9);
      expect(row.kingpinInclinationDeg).toBeCloseTo(s.kingpinInclinationDeg, 9);
      expect(row.scrubRadiusMm).toBeCloseTo(s.scrubRadiusMm, 7);
      expect(row.mechanicalTrailMm).toBeCloseTo(s.mechanicalTrailMm, 7);
      expect(row.wheelbaseChangeMm).toBeCloseTo(s.wheelCentreShiftXMm, 7);
    });
  });
});

describe('output curves against steering and roll', () => {
  it('Ackermann over the rack stroke is the axle analysis figure at the same rack positions', () => {
    const corner = exampleCorners.fsFrontWishbone;
    const curves = outputCurves(corner, { axis: 'steer', wheelbaseMm: 1550 });
    const axle = axleKinematics(corner, { wheelbaseMm: 1550, steeringPoints: 21 });
    expect(curves.rows).toHaveLength(21);
    curves.rows.forEach((row, i) => {
      const s = axle.steering!.rows[i]!;
      expect(row.x).toBeCloseTo(s.rackMm, 12);
      expect(row.steerDeg).toBeCloseTo(s.leftSteerDeg, 9);
      if (s.ackermannPercent === null) expect(row.ackermannPercent).toBeNull();
      else expect(row.ackermannPercent).toBeCloseTo(s.ackermannPercent, 7);
    });
  });

  it('an unsteered corner has no steer sweep', () => {
    expect(() => outputCurves(exampleCorners.fsRearWishbone, { axis: 'steer' })).toThrow(/not steered/);
  });

  it('roll: wheel travels ∓(t/2)·sin φ (domain.md), toe, camber and roll-centre migration as the roll sweep gives them', () => {
    const corner = exampleCorners.fsRearWishbone;
    const curves = outputCurves(corner, { axis: 'roll', range: { from: -2, to: 2, step: 1 } });
    const roll = rollSweep(corner, { roll: { from: -2, to: 2, step: 1 } });
    curves.rows.forEach((row, i) => {
      const r = roll.rows[i]!;
      // domain.md "Roll sweep": left −s, right +s with s = (t/2)·sin φ.
      expect(row.leftTravelMm).toBeCloseTo((-curves.trackMm / 2) * Math.sin(row.x * RAD_PER_DEG), 12);
      expect(row.rightTravelMm).toBeCloseTo(-row.leftTravelMm, 12);
      expect(row.toeDeg).toBeCloseTo(r.leftToeDeg, 9);
      expect(row.camberDeg).toBeCloseTo(r.leftCamberDeg, 9);
      expect(row.rollCentreYMm).toBeCloseTo(r.rollCentreYMm!, 6);
    });
    expect(() => outputCurves(corner, { axis: 'roll', range: { from: -50, to: 0, step: 10 } })).toThrow(/45 deg/);
  });
});
