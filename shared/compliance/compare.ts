/**
 * Compliance steer beside the kinematic roll steer of one axle, both in
 * deg/g of lateral acceleration (docs/compliance.md §5): what the editor
 * and the budget show side by side.
 */
import type { Corner } from '../schema/corner.js';
import type { Vehicle } from '../schema/vehicle.js';
import { suspensionRollGradients } from '../balance/understeer.js';
import { cornerCompliance } from './index.js';
import { axleComplianceOf } from './axle.js';

const G_STD = 9.80665;

export interface ComplianceBesideRollSteer {
  /** No bushings, link or steering rates: every compliance figure is zero. */
  rigid: boolean;
  /** The corner's own figures at design (travel 0, rack 0), per kN (kN·m) of load on the wheel. */
  lateralForceToeDegPerKN: number;
  lateralForceCamberDegPerKN: number;
  aligningMomentToeDegPerKNm: number;
  lateralStiffnessNPerMm: number | null;
  /** Axle steer out of the turn per kN of axle lateral force at the contact patch (no pneumatic trail), deg/kN. */
  axleSteerDegPerKN: number;
  /** With a vehicle: compliance steer (with its tyres' pneumatic trail) and kinematic roll steer of the axle, deg/g, positive out of the turn. */
  perG: { complianceSteerDegPerG: number; rollSteerDegPerG: number } | null;
}

/** The corner's compliance figures, and with a vehicle both steers in deg/g (the vehicle's suspension roll gradient, the axle's static load). */
export function complianceBesideRollSteer(corner: Corner, rollSteerCoefficient: number, axle: 'front' | 'rear', vehicle?: Vehicle): ComplianceBesideRollSteer {
  const r = cornerCompliance(corner);
  const a = axleComplianceOf(corner, { pneumaticTrailMm: vehicle?.[axle].tyre.pneumaticTrailMm });
  let perG: ComplianceBesideRollSteer['perG'] = null;
  if (vehicle) {
    const share = axle === 'front' ? (vehicle.wheelbaseMm - vehicle.cgToFrontAxleMm) / vehicle.wheelbaseMm : vehicle.cgToFrontAxleMm / vehicle.wheelbaseMm;
    const axleLoadKN = (vehicle.massKg * G_STD * share) / 1000;
    const g = suspensionRollGradients(vehicle);
    perG = { complianceSteerDegPerG: (a?.totalSteerDegPerKN ?? 0) * axleLoadKN, rollSteerDegPerG: rollSteerCoefficient * (axle === 'front' ? g.frontDegPerG : g.rearDegPerG) };
  }
  return {
    rigid: r.rigid,
    lateralForceToeDegPerKN: r.lateralForceToeDegPerKN,
    lateralForceCamberDegPerKN: r.lateralForceCamberDegPerKN,
    aligningMomentToeDegPerKNm: r.aligningMomentToeDegPerKNm,
    lateralStiffnessNPerMm: r.lateralStiffnessNPerMm,
    axleSteerDegPerKN: a?.contactPatchSteerDegPerKN ?? 0,
    perG,
  };
}
