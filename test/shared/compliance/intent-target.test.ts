/**
 * The intent solver with compliance (issue 17): it can target the axle's roll steer plus compliance steer,
 * and verifies its proposal with compliance included. Checked through the balance API, an independent
 * path: the budget's own roll-steer, compliance-steer and aligning-torque compliance terms (docs/balance.md).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import type { Vehicle } from '../../../shared/schema/vehicle.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import { computeBalance } from '../../../shared/balance/api.js';
import { intentSchema, type IntentInput } from '../../../shared/schema/intent.js';
import { solveIntent } from '../../../shared/intent/index.js';

const root = join(import.meta.dirname, '..', '..', '..');
const corner = JSON.parse(readFileSync(join(root, 'test', 'fixtures', 'corners', 'road-rear-five-link-bushings.json'), 'utf8')) as Corner;
const vehicle = structuredClone<Vehicle>(exampleVehicles.brackenfieldB5);
delete vehicle.rear.complianceSteerDegPerKN;
delete vehicle.rear.steeringStiffnessNmPerDeg;

/** The axle's roll plus compliance steer out of the turn, deg/g, as the balance API reports it. */
function axleSteer(c: Corner): number {
  const a = computeBalance({ vehicle, rearCorner: c, sensitivity: false }).axleCompliance.rear;
  return a.rollSteer + a.complianceSteer + a.alignTorqueComplianceSteer;
}

describe('intent target: roll steer plus compliance steer', () => {
  it('is met, verified with compliance included, and says the compliance was computed', { timeout: 120_000 }, () => {
    const p = corner.points as Record<string, Vec3>;
    const before = axleSteer(corner);
    const target = before - 0.1;
    const input: IntentInput = {
      corner,
      axle: 'rear',
      target: { rollAndComplianceSteerDegPerG: target },
      movable: ['link5Inner.z', 'link5Outer.z'],
      bounds: { 'link5Inner.z': [p['link5Inner']![2] - 40, p['link5Inner']![2] + 40], 'link5Outer.z': [p['link5Outer']![2] - 40, p['link5Outer']![2] + 40] },
      trackProfile: 'rough-road',
      vehicle,
    };
    const r = solveIntent(intentSchema.parse(input));
    expect(r.feasible).toBe(true);
    expect(r.target.kind).toBe('rollAndComplianceSteerDegPerG');
    // The search tolerance is in ε units (TARGET_TOL); times the suspension roll gradient (a few deg/g) that is
    // well inside 1e-4 deg/g.
    expect(Math.abs(axleSteer(r.corner) - target)).toBeLessThan(1e-4);
    expect(r.axleSteer!.totalDegPerG).toBeCloseTo(axleSteer(r.corner), 9);
    expect(r.axleSteer!.complianceSource).toBe('computed');
    expect(Math.abs(r.axleSteer!.complianceSteerDegPerG)).toBeGreaterThan(0.01);
  });

  it('needs a vehicle, naming the field', () => {
    const res = intentSchema.safeParse({ corner, axle: 'rear', target: { rollAndComplianceSteerDegPerG: 0.1 }, movable: ['link5Inner.z'], bounds: { 'link5Inner.z': [200, 260] }, trackProfile: 'rough-road' });
    expect(res.success).toBe(false);
    expect(res.error!.issues.map((i) => i.path.join('.'))).toContain('vehicle');
  });
});
