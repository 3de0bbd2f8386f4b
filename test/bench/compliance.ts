/**
 * Compliance benchmark (issue 17): all five unit loads with link and mount
 * forces at one pose of a bushed double wishbone (pose solved from design),
 * and the headline figures over 41 travels × 3 rack positions.
 * Targets: corner median ≤ 0.5 ms, sweep median ≤ 20 ms.
 */
import { cornerCompliance, complianceSweep } from '../../shared/compliance/index.js';
import { exampleCorners } from '../../shared/kinematics/index.js';
import type { Corner } from '../../shared/schema/corner.js';
import { median, round, timeRuns } from './stats.js';

const corner: Corner = {
  ...exampleCorners.fsFrontWishbone,
  bushings: {
    lowerFront: { radialNPerMm: 6000, axialNPerMm: 1500 },
    lowerRear: { radialNPerMm: 4000, axialNPerMm: 1200 },
    upperFront: { radialNPerMm: 5000, axialNPerMm: 1400 },
    upperRear: { radialNPerMm: 3500, axialNPerMm: 1000 },
    tieRodInner: { radialNPerMm: 5000, axialNPerMm: 9000 },
  },
  steeringStiffnessNPerMm: 4000,
};
const travels = Array.from({ length: 41 }, (_, i) => -20 + i);
const racks = [-15, 0, 15];

export async function run(): Promise<Record<string, number>> {
  const one = timeRuns(() => cornerCompliance(corner, { travelMm: 10, rackMm: 5 }), 400, 50);
  const sweep = timeRuns(() => complianceSweep(corner, travels, racks), 100, 30);
  console.log('  target compliance.corner.medianMs ≤ 0.5, compliance.sweep.medianMs ≤ 20');
  return {
    'compliance.corner.medianMs': round(median(one), 4),
    'compliance.corner.targetRatio': round(median(one) / 0.5, 3),
    'compliance.sweep.medianMs': round(median(sweep), 3),
    'compliance.sweep.targetRatio': round(median(sweep) / 20, 3),
  };
}
