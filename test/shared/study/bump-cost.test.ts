/**
 * The bump cost of a study is the ride model's (shared/ride, docs/ride.md):
 * the RMS yaw-rate disturbance from bump steer on the track profile's
 * ISO 8608 road class, as a percentage of the steady yaw rate on the
 * profile's corner. Sources: ISO 8608:2016 road classes (the profile's road
 * class and its words); the 9-point Gauss–Hermite rule is exact for
 * polynomials up to degree 17 (Abramowitz & Stegun 25.4.46, from memory),
 * which is why the ride model takes the toe statistics at those travels.
 * These checks hold the study to the ride model's own figures: the nominal
 * design against bumpCost() (the full ride evaluation), and sweep variants
 * against the ride model's toe curves solved separately (ToeCurve, its own
 * sweep from design height) at the same judged rack positions.
 */
import { describe, expect, it } from 'vitest';
import { exampleCorners } from '../../../shared/kinematics/index.js';
import { exampleVehicles } from '../../../shared/balance/index.js';
import type { Vehicle } from '../../../shared/schema/vehicle.js';
import { resolveTrackProfile } from '../../../shared/tracks/profiles.js';
import { bumpCost, RandomRoadYawCost } from '../../../shared/ride/cost.js';
import { ToeCurve } from '../../../shared/ride/toe.js';
import { combineStudyChunks, runStudyChunk, variantCorner } from '../../../shared/study/index.js';

const corner = exampleCorners.fsFrontWishbone;
const vehicle = exampleVehicles.tur26Ember;
const z0 = corner.points.tieRodInner[2];

const sweep = {
  kind: 'sweep',
  axle: 'front',
  corner,
  vehicle,
  trackProfile: 'bumpy-circuit',
  design: 'full-factorial',
  balanceDirection: 'more-understeer',
  factors: [{ point: 'tieRodInner', axis: 'z', fromMm: z0 - 5, toMm: z0 + 5, levels: 3 }],
};

describe('bump cost of a study: the ride model on the profile’s road class', { timeout: 120_000 }, () => {
  const chunk = runStudyChunk(sweep, 0);
  const result = combineStudyChunks(sweep, [chunk]);
  const k = result.outputs.findIndex((o) => o.key === 'bumpYawDisturbancePct');
  /** The chunk's output k of variant i (StudyChunkResult.values: output by output). */
  const value = (i: number) => chunk.values[k * chunk.samples + i]!;
  const profile = resolveTrackProfile('bumpy-circuit');

  it('names the road (ISO 8608 class of the profile) and ranks the Pareto front by the yaw disturbance', () => {
    expect(result.bumpCost.output).toBe('bumpYawDisturbancePct');
    expect(result.bumpCost.roadInWords).toContain(`class ${profile.roadClass}`);
    expect(result.bumpCost.roadInWords).toContain(`${profile.speedKph} km/h`);
    expect(result.sweep!.costOutput).toBe('bumpYawDisturbancePct');
    expect(result.outputs[k]!.breach?.code).toBe('bump-yaw-disturbance');
    for (const v of result.sweep!.pareto) expect(v.cost).toBe(value(v.index));
  });

  it('the nominal design costs what the full ride model says (bumpCost)', () => {
    const full = bumpCost(vehicle, 'front', corner, profile);
    // Same poses, same quadrature: agreement to the solver's convergence (residuals below 1e-10 mm).
    expect(result.outputs[k]!.nominal!).toBeCloseTo(full.yawDisturbancePct!, 9);
    expect(value(1)).toBeCloseTo(full.yawDisturbancePct!, 9); // variant 1 is the design itself
  });

  it('each variant costs what the ride model’s own toe curves give at the judged racks', () => {
    const model = new RandomRoadYawCost(vehicle, 'front', profile);
    const racks = model.racksMm(corner);
    expect(racks.length).toBe(2); // steered: on-centre and the operating steer of the profile's corner
    for (const i of [0, 2]) {
      const v = variantCorner(sweep, i);
      const toe = (side: 'left' | 'right', rack: number) => new ToeCurve(v, side, rack, profile.travelMm).gaussian(model.sigmaMm).rmsDeg;
      const expected = model.fromToeRms(racks.map((r) => [toe('left', r), toe('right', r)]))!;
      expect(value(i)).toBeCloseTo(expected.yawDisturbancePct, 9);
      // A toe link 5 mm off its design height steers over bumps: it costs more than the design.
      expect(value(i)).toBeGreaterThan(value(1));
    }
  });

  it('without a vehicle there is no ride-model bump cost, and the result says what is missing', () => {
    const noVehicle = {
      kind: 'tolerance',
      axle: 'front',
      corner,
      trackProfile: 'bumpy-circuit',
      samples: 20,
      tolerances: [{ point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }],
    };
    const r = combineStudyChunks(noVehicle, [runStudyChunk(noVehicle, 0)]);
    expect(r.bumpCost.output).toBeNull();
    expect(r.bumpCost.why).toMatch(/vehicle/);
    expect(r.outputs.some((o) => o.key === 'bumpYawDisturbancePct')).toBe(false);
  });
});
