/**
 * The compliance part of the balance link (docs/compliance.md §5): when a
 * linked corner carries bushings, link or steering rates, the axle's
 * lateral-force compliance steer, its aligning-torque steering stiffness and
 * its compliance camber come from the corner's computed compliance. Figures
 * entered in the vehicle stay as overrides; `source` says which was used.
 */
import type { Corner } from '../schema/corner.js';
import type { Vehicle } from '../schema/vehicle.js';
import { axleComplianceOf, type AxleComplianceFigures } from '../compliance/axle.js';
import type { AxleName } from '../schema/axle.js';

export type ComplianceSource = 'entered' | 'computed' | 'none';

export interface ComplianceLink {
  /** Where each figure the balance model used came from. */
  source: { complianceSteerDegPerKN: ComplianceSource; steeringStiffnessNmPerDeg: ComplianceSource; complianceCamberDegPerKN: ComplianceSource };
  used: { complianceSteerDegPerKN: number | null; steeringStiffnessNmPerDeg: number | null; complianceCamberDegPerKN: number | null };
  /** The corner's computed figures (null: the corner is rigid, or no corner). */
  computed: AxleComplianceFigures | null;
}

/** Writes the computed compliance into the copied axle where the vehicle enters none; notes say what was used. */
export function linkCompliance(axle: Vehicle['front'], name: AxleName, corner: Corner | undefined, rackMm: number | null, notes: string[]): ComplianceLink {
  const computed = corner ? axleComplianceOf(corner, { rackMm: rackMm ?? 0, pneumaticTrailMm: axle.tyre.pneumaticTrailMm }) : null;
  const enteredSteer = axle.complianceSteerDegPerKN !== undefined;
  const enteredK = axle.steeringStiffnessNmPerDeg !== undefined;
  const enteredCamber = axle.complianceCamberDegPerKN !== undefined;
  const src = (entered: boolean, has: boolean): ComplianceSource => (entered ? 'entered' : has ? 'computed' : 'none');
  let usedK = false;
  if (computed) {
    // Without an entered steering stiffness, the whole computed steer (lateral force at the contact patch, so the
    // mechanical trail's moment, plus the pneumatic trail's moment) goes into complianceSteer and no equivalent
    // stiffness is written: the aligning-torque term then holds the tyre moment's own effect only, whatever trail
    // it applies a stiffness with. With an entered stiffness, that carries the aligning torque and the computed
    // figure is the lateral force at the steering axis' ground point. An entered complianceSteer alone gets the
    // computed equivalent stiffness for the aligning torque.
    if (!enteredSteer) axle.complianceSteerDegPerKN = enteredK ? computed.complianceSteerDegPerKN : computed.totalSteerDegPerKN;
    else if (!enteredK && computed.steeringStiffnessNmPerDeg !== null) {
      axle.steeringStiffnessNmPerDeg = computed.steeringStiffnessNmPerDeg;
      usedK = true;
    }
    if (!enteredCamber) axle.complianceCamberDegPerKN = computed.complianceCamberDegPerKN;
    const entered = [enteredSteer && 'complianceSteerDegPerKN', enteredK && 'steeringStiffnessNmPerDeg', enteredCamber && 'complianceCamberDegPerKN'].filter(Boolean);
    notes.push(
      `${name} compliance steer and camber computed from the corner's bushings at rack ${computed.rackMm} mm` +
        (entered.length ? `; the vehicle's entered ${entered.join(', ')} override${entered.length === 1 ? 's' : ''} the computed value` : ''),
    );
  }
  return {
    source: {
      complianceSteerDegPerKN: src(enteredSteer, computed !== null),
      steeringStiffnessNmPerDeg: src(enteredK, usedK),
      complianceCamberDegPerKN: src(enteredCamber, computed !== null),
    },
    used: { complianceSteerDegPerKN: axle.complianceSteerDegPerKN ?? null, steeringStiffnessNmPerDeg: axle.steeringStiffnessNmPerDeg ?? null, complianceCamberDegPerKN: axle.complianceCamberDegPerKN ?? null },
    computed,
  };
}
