/**
 * Back-solver benchmark (issue 5): one solve of a double-wishbone front
 * corner over ±25 mm of travel at 3 rack positions, including the
 * verification sweep and a 21-member solution family. Target: median ≤ 100 ms.
 */
import { exampleCorners } from '../../shared/kinematics/index.js';
import { computeSolve } from '../../shared/intent/api.js';
import { median, round, timeRuns } from './stats.js';

export async function run(): Promise<Record<string, number>> {
  const corner = exampleCorners.fsFrontWishbone;
  const p = corner.points;
  const intent = {
    corner,
    axle: 'front',
    target: { rollSteerCoefficient: 0.03 },
    movable: ['tieRodInner.z', 'tieRodOuter.z'],
    bounds: { 'tieRodInner.z': [p.tieRodInner[2] - 20, p.tieRodInner[2] + 20], 'tieRodOuter.z': [p.tieRodOuter[2] - 20, p.tieRodOuter[2] + 20] },
    trackProfile: { id: 'smooth-circuit', travelMm: [-25, 25] },
    options: { familySize: 21 },
  };
  let last = computeSolve(intent);
  const rackPositions = new Set(last.achieved.toeCurve.map((r) => r.rackMm)).size;
  const times = timeRuns(() => {
    last = computeSolve(intent);
  }, 15);
  const ms = median(times);
  console.log(`  one solve: ${round(ms, 1)} ms median (target ≤ 100 ms), ${last.diagnostics.poses} poses, ${rackPositions} rack positions, ${last.family.length} family entries`);
  return {
    'intent.solve.medianMs': round(ms, 2),
    'intent.solve.poses': last.diagnostics.poses,
    'intent.solve.familyEntries': last.family.length,
  };
}
