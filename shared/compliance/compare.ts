/**
 * Compliance steer beside the kinematic roll steer of one axle, both in
 * deg/g of lateral acceleration (docs/compliance.md §5): what the editor
 * and the budget show side by side.
 */
import type { Corner } from '../schema/corner.js';
import type { Vehicle } from '../schema/vehicle.js';
import { balanceCore } from '../balance/understeer.js';
import { cornerCompliance } from './index.js';
import { axleComplianceOf } from './axle.js';
import type { AxleName } from '../schema/axle.js';

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
  /** With a vehicle: compliance steer (with its tyres' pneumatic trail) and kinematic roll steer of the axle, deg/g, positive out of the turn, on the budget's own axle force and suspension roll. */
  perG: { complianceSteerDegPerG: number; rollSteerDegPerG: number } | null;
}

/** The corner's compliance figures, and with a vehicle both steers in deg/g (the balance model's suspension roll gradient and axle lateral force per g). */
export function complianceBesideRollSteer(corner: Corner, rollSteerCoefficient: number, axle: AxleName, vehicle?: Vehicle): ComplianceBesideRollSteer {
  const r = cornerCompliance(corner);
  const a = axleComplianceOf(corner, { pneumaticTrailMm: vehicle?.[axle].tyre.pneumaticTrailMm });
  let perG: ComplianceBesideRollSteer['perG'] = null;
  if (vehicle) {
    const core = balanceCore(vehicle)[axle];
    perG = { complianceSteerDegPerG: ((a?.totalSteerDegPerKN ?? 0) * core.lateralForceNPerG) / 1000, rollSteerDegPerG: rollSteerCoefficient * core.suspensionRollDegPerG };
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
