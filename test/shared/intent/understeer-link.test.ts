/**
 * One understeer figure for one geometry: the intent solver's understeer
 * change is the difference of the balance API's roll-steer term
 * (`computeBalance(...).understeerBudget.rollSteer`, the corners linked in
 * through `axleSummary`: ε, roll camber, roll-centre height, motion ratios)
 * for the baseline and the proposed corner. Same code path, so equal to
 * rounding (1e-9 relative); K_rs itself is domain.md's
 * ε_f·dφs,f/da_y − ε_r·dφs,r/da_y (Gillespie, from memory).
 */
import { describe, expect, it } from 'vitest';
import { exampleCorners } from '../../../shared/kinematics/index.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { computeBalance } from '../../../shared/balance/api.js';
import { intentSchema, type IntentInput } from '../../../shared/schema/intent.js';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import type { Vehicle } from '../../../shared/schema/vehicle.js';
import { applyCoordinates, solveIntent, understeerChange } from '../../../shared/intent/index.js';
import type { AxleName } from '../../../shared/schema/axle.js';

const REL = 1e-9;

function around(corner: Corner, names: string[], range: number): Record<string, [number, number]> {
  const p = corner.points as Record<string, Vec3>;
  const axis = { x: 0, y: 1, z: 2 } as const;
  return Object.fromEntries(
    names.map((n) => {
      const [point, ax] = n.split('.') as [string, 'x' | 'y' | 'z'];
      const v = p[point]![axis[ax]];
      return [n, [v - range, v + range]];
    }),
  );
}

/** ΔK_rs of the balance API, proposed minus baseline corner on `axle`. */
function balanceDelta(vehicle: Vehicle, axle: AxleName, baseline: Corner, proposed: Corner): number {
  const kRs = (c: Corner) => computeBalance({ vehicle, [axle === 'front' ? 'frontCorner' : 'rearCorner']: c, sensitivity: false }).understeerBudget.rollSteer;
  return kRs(proposed) - kRs(baseline);
}

function expectRelEqual(actual: number | null, expected: number) {
  expect(actual).not.toBeNull();
  expect(Math.abs(actual! - expected)).toBeLessThanOrEqual(REL * Math.abs(expected));
}

describe('intent understeer change = balance API roll-steer term difference', () => {
  const cases: Array<{ what: string; vehicle: Vehicle; corner: Corner; axle: AxleName; target: IntentInput['target']; movable: string[]; range: number }> = [
    // The case reported: the rear geometry change where the two used to read 0.020 and 0.030 deg/g.
    { what: 'FS rear toe link, ε target', vehicle: exampleVehicles.tur26Ember, corner: exampleCorners.fsRearWishbone, axle: 'rear', target: { rollSteerCoefficient: -0.05 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], range: 25 },
    { what: 'FS front tie rod (steered), ε target', vehicle: exampleVehicles.tur26Ember, corner: exampleCorners.fsFrontWishbone, axle: 'front', target: { rollSteerCoefficient: 0.03 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], range: 20 },
    { what: 'FS rear toe link, understeer target', vehicle: exampleVehicles.tur26Ember, corner: exampleCorners.fsRearWishbone, axle: 'rear', target: { understeerChangeDegPerG: 0.03 }, movable: ['tieRodInner.z', 'tieRodOuter.z'], range: 25 },
    { what: 'road rear five-link, ε target', vehicle: exampleVehicles.brackenfieldB5, corner: exampleCorners.roadRearFiveLink, axle: 'rear', target: { rollSteerCoefficient: -0.04 }, movable: ['link5Inner.z', 'link5Outer.z'], range: 30 },
  ];
  for (const c of cases) {
    it(c.what, () => {
      const r = solveIntent(intentSchema.parse({ corner: c.corner, axle: c.axle, target: c.target, movable: c.movable, bounds: around(c.corner, c.movable, c.range), trackProfile: 'smooth-circuit', vehicle: c.vehicle }));
      expect(r.feasible).toBe(true);
      const expected = balanceDelta(c.vehicle, c.axle, c.corner, r.corner);
      expect(Math.abs(expected)).toBeGreaterThan(1e-3); // a real change, so the relative check means something
      expectRelEqual(r.understeerChangeDegPerG, expected);
      // The public helper is the same path.
      expectRelEqual(understeerChange(c.vehicle, c.axle, c.corner, r.corner), expected);
      // Family members too (first and last: the ends of the curve).
      for (const m of [r.family[0]!, r.family[r.family.length - 1]!]) {
        const mc = applyCoordinates(c.corner, c.movable, c.movable.map((n) => m.coordinates[n]!));
        expectRelEqual(m.understeerChangeDegPerG, balanceDelta(c.vehicle, c.axle, c.corner, mc));
      }
      if ('understeerChangeDegPerG' in c.target) expect(Math.abs(r.understeerChangeDegPerG! - c.target.understeerChangeDegPerG)).toBeLessThan(1e-8);
    });
  }
});
