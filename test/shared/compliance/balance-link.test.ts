/**
 * The balance model and the cautions take compliance from the corner's bushings (issue 17): the axle
 * figures against closed forms, entered figures as overrides, and the caution from computed values.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Corner, Vec3 } from '../../../shared/schema/corner.js';
import type { Vehicle } from '../../../shared/schema/vehicle.js';
import { axleComplianceOf } from '../../../shared/compliance/axle.js';
import { cornerCompliance } from '../../../shared/compliance/index.js';
import { linkVehicle } from '../../../shared/balance/link.js';
import { evaluateBalance } from '../../../shared/balance/index.js';
import { exampleVehicles } from '../../../shared/balance/examples.js';
import { cautionInputs } from '../../../shared/cautions/measure.js';
import { PoseCounter } from '../../../shared/intent/link.js';
import { resolveTrackProfile } from '../../../shared/tracks/profiles.js';
import { planarWishbone } from '../kinematics/helpers.js';

const root = join(import.meta.dirname, '..', '..', '..');
const fixture = (n: string) => JSON.parse(readFileSync(join(root, 'test', 'fixtures', 'corners', `${n}.json`), 'utf8')) as Corner;
const RAD_PER_DEG = Math.PI / 180;

/** A vehicle with no compliance figures of its own. */
function bareVehicle(): Vehicle {
  const v = structuredClone<Vehicle>(exampleVehicles.brackenfieldB5);
  for (const a of [v.front, v.rear]) {
    delete a.complianceSteerDegPerKN;
    delete a.steeringStiffnessNmPerDeg;
    delete a.complianceCamberDegPerKN;
  }
  return v;
}

describe('axle compliance from a corner', () => {
  it('vertical steering axis, compliant tie rod only: no steer from a force through the axis, K = 2·k·r² for the axle', () => {
    // Closed form (from memory, statics): a force through a rigid steering axis has no moment about it, so
    // all the steer is the aligning-torque part; each wheel turns by M/(k·r²), and the axle's mean steer
    // under its two wheels' torques (half the axle's each) gives K_axle = 2·k·r² (N·mm/rad → N·m/deg).
    const k = 700;
    const r = 100;
    const c = planarWishbone({ tieRodInner: [-r, 300, 200] });
    c.points['wheelCentre'] = [25, c.points['wheelCentre'][1], c.points['wheelCentre'][2]];
    c.points['spindle'] = [25, c.points['spindle'][1], c.points['spindle'][2]];
    const a = axleComplianceOf({ ...c, bushings: { tieRodInner: { radialNPerMm: 5000, axialNPerMm: k } } }, { pneumaticTrailMm: 30 })!;
    expect(a.mechanicalTrailMm).toBeCloseTo(-25, 9);
    expect(a.complianceSteerDegPerKN).toBeCloseTo(0, 12);
    expect(a.steeringStiffnessNmPerDeg!).toBeCloseTo(((2 * k * r * r) / 1000) * RAD_PER_DEG, 6);
    // The contact-patch figure carries the trail's moment: steer out of the turn = F·t_m/K per axle.
    expect(a.contactPatchSteerDegPerKN).toBeCloseTo((1000 * -0.025) / a.steeringStiffnessNmPerDeg!, 9);
    // Total with the pneumatic trail: F·(t_m + t_p)/K.
    expect(a.totalSteerDegPerKN).toBeCloseTo((1000 * (-0.025 + 0.03)) / a.steeringStiffnessNmPerDeg!, 9);
  });

  it('a rigid corner has no computed compliance', () => {
    expect(axleComplianceOf(fixture('road-front-strut'))).toBeNull();
  });
});

describe('balance link', () => {
  const front = fixture('road-front-strut-bushings');
  const rear = fixture('road-rear-five-link-bushings');

  it('takes compliance steer and camber from bushed corners and says so', () => {
    const v = bareVehicle();
    const l = linkVehicle({ vehicle: v, frontCorner: front, rearCorner: rear });
    for (const [name, corner] of [['front', front], ['rear', rear]] as const) {
      const link = l[name].compliance;
      const a = axleComplianceOf(corner, { pneumaticTrailMm: v[name].tyre.pneumaticTrailMm })!;
      expect(link.source.complianceSteerDegPerKN).toBe('computed');
      expect(link.source.complianceCamberDegPerKN).toBe('computed');
      // No stiffness entered: the whole computed steer (contact patch, plus the pneumatic trail's moment) is the
      // compliance steer, and no equivalent stiffness is written (the aligning-torque term keeps the tyre moment only).
      expect(l.vehicle[name].complianceSteerDegPerKN).toBe(a.totalSteerDegPerKN);
      expect(l.vehicle[name].steeringStiffnessNmPerDeg).toBeUndefined();
      expect(link.source.steeringStiffnessNmPerDeg).toBe('none');
      expect(l.vehicle[name].complianceCamberDegPerKN).toBe(a.complianceCamberDegPerKN);
      expect(l[name].notes.join(' ')).toMatch(/computed from the corner's bushings/);
    }
    // The axle figure is the corner's toe per kN inboard, halved and signed "out of the turn" (two wheels share
    // the axle force; domain.md: toe-in positive, right wheel mirrored), once the trail moments are added back.
    const c = cornerCompliance(front);
    const a = l.front.compliance.computed!;
    expect(a.contactPatchSteerDegPerKN).toBeCloseTo(-c.lateralForceToeDegPerKN / 2, 12);
    // The budget's complianceSteer term is that figure times the axle's lateral force per g (docs/balance.md).
    const b = evaluateBalance(l.vehicle, { sensitivity: false });
    expect(Math.abs(b.axleCompliance.front.complianceSteer)).toBeGreaterThan(0);
    expect(b.understeerBudget.complianceSteer).toBeCloseTo(b.axleCompliance.front.complianceSteer - b.axleCompliance.rear.complianceSteer, 12);
  });

  it('figures entered in the vehicle override the computed ones', () => {
    const v = bareVehicle();
    v.front.complianceSteerDegPerKN = 0.123;
    const l = linkVehicle({ vehicle: v, frontCorner: front });
    expect(l.front.compliance.source.complianceSteerDegPerKN).toBe('entered');
    expect(l.front.compliance.source.complianceCamberDegPerKN).toBe('computed');
    expect(l.vehicle.front.complianceSteerDegPerKN).toBe(0.123);
    expect(l.front.notes.join(' ')).toMatch(/entered complianceSteerDegPerKN overrides/);
    // The aligning torque then gets the computed equivalent stiffness.
    expect(l.front.compliance.source.steeringStiffnessNmPerDeg).toBe('computed');
    expect(l.vehicle.front.steeringStiffnessNmPerDeg).toBe(l.front.compliance.computed!.steeringStiffnessNmPerDeg);
  });

  it('an entered steering stiffness carries the aligning torque; the computed steer is then the force at the steering axis', () => {
    const v = bareVehicle();
    v.front.steeringStiffnessNmPerDeg = 900;
    const l = linkVehicle({ vehicle: v, frontCorner: front });
    expect(l.front.compliance.source.steeringStiffnessNmPerDeg).toBe('entered');
    expect(l.vehicle.front.complianceSteerDegPerKN).toBe(l.front.compliance.computed!.complianceSteerDegPerKN);
  });

  it('a rigid corner leaves the vehicle as entered', () => {
    const v = bareVehicle();
    const l = linkVehicle({ vehicle: v, frontCorner: fixture('road-front-strut') });
    expect(l.front.compliance.source.complianceSteerDegPerKN).toBe('none');
    expect(l.vehicle.front.complianceSteerDegPerKN).toBeUndefined();
  });
});

describe('caution "compliance rivals roll steer" from computed values', () => {
  it('uses the corner’s computed compliance steer when the vehicle enters none', () => {
    const v = bareVehicle();
    const rear = fixture('road-rear-five-link-bushings');
    const eps = -0.05;
    const grads = { frontDegPerG: 3, rearDegPerG: 3 };
    const byRack = [{ rackMm: 0, bumpSteerDegPerM: 0, curvatureDegPerM2: 0, maxDeviationDeg: 0, bumpToeChangeDeg: 0 }];
    const inputs = cautionInputs(new PoseCounter(), { axle: 'rear', vehicle: v, gradients: grads }, resolveTrackProfile('rough-road'), rear, eps, byRack, []);
    const a = axleComplianceOf(rear, { pneumaticTrailMm: v.rear.tyre.pneumaticTrailMm })!;
    const axleLoadN = (v.massKg * 9.80665 * v.cgToFrontAxleMm) / v.wheelbaseMm;
    expect(inputs.complianceSource).toBe('computed');
    expect(inputs.complianceRatio!).toBeCloseTo(Math.abs((a.totalSteerDegPerKN * axleLoadN) / 1000) / Math.abs(eps * 3), 12);
    // Without bushings and without an entered figure there is nothing to compare.
    const rigid = cautionInputs(new PoseCounter(), { axle: 'rear', vehicle: v, gradients: grads }, resolveTrackProfile('rough-road'), fixture('road-rear-five-link'), eps, byRack, []);
    expect(rigid.complianceRatio).toBeNull();
  });
});

describe('compliance beside roll steer (the editor figure)', () => {
  it('gives both steers in deg/g on the budget’s own terms', async () => {
    // docs/balance.md: roll steer term ε·dφs/da_y; compliance steer = (deg/kN) × the axle's lateral force per g
    // (kN), the lateral force and aligning-torque parts together. Compared with the balance API's axle terms.
    const { complianceBesideRollSteer } = await import('../../../shared/compliance/compare.js');
    const { computeBalance } = await import('../../../shared/balance/api.js');
    const v = bareVehicle();
    const rear = fixture('road-rear-five-link-bushings');
    const b = computeBalance({ vehicle: v, rearCorner: rear, sensitivity: false });
    const eps = b.kinematicsLink.rear.used.rollSteerCoefficient;
    const c = complianceBesideRollSteer(rear, eps, 'rear', b.effectiveVehicle);
    const a = b.axleCompliance.rear;
    expect(c.rigid).toBe(false);
    expect(c.perG!.rollSteerDegPerG).toBeCloseTo(a.rollSteer, 9);
    expect(a.alignTorqueComplianceSteer).toBe(0);
    expect(c.perG!.complianceSteerDegPerG).toBeCloseTo(a.complianceSteer, 9);
    expect(complianceBesideRollSteer(fixture('road-rear-five-link'), eps, 'rear').rigid).toBe(true);
  });
});
