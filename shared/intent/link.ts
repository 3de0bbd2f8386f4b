/**
 * Every call the back-solver makes into the kinematics engine goes through
 * here, so the number of poses it evaluates is counted in one place
 * (`PoseCounter`) and the search never computes kinematics of its own.
 * Counts: one per pose solved (a sweep row, one wheel of an axle pose).
 */
import type { Corner } from '../schema/corner.js';
import type { Vehicle } from '../schema/vehicle.js';
import { axleKinematics, axleSummary, moveCornerPoints, rollSteerCoefficient, solvePose, sweepCorner, type AxleSummary, type PoseResult, type PoseState, type SweepResult } from '../kinematics/index.js';
import { linkVehicle, type LinkedVehicle } from '../balance/link.js';
import { coordinateMoves } from './coordinates.js';
import type { AxleName } from '../schema/axle.js';

export class PoseCounter {
  poses = 0;
}

/**
 * A trial geometry of the search: `current` (validated once) with the
 * movable coordinates set to `values`, through the engine's trusted path (no
 * zod parse of each new geometry; the semantic geometry checks still run).
 */
export function trialCorner(current: Corner, names: string[], values: number[]): Corner {
  return moveCornerPoints(current, coordinateMoves(current, names, values));
}

export type Pose = PoseResult & { state: PoseState };

export function pose(counter: PoseCounter, corner: Corner, travelMm: number, rackMm = 0): Pose {
  counter.poses++;
  return solvePose(corner, { travelMm, rackMm });
}

export function sweep(counter: PoseCounter, corner: Corner, travel: { from: number; to: number; step: number }, rackMm: number[]): SweepResult {
  const r = sweepCorner(corner, { travel, rackMm });
  counter.poses += r.rows.length;
  return r;
}

/** ε = −dδ̄/dφ at φ = 0, rack straight ahead (left corner and its mirror: two poses). */
export function rollSteer(counter: PoseCounter, corner: Corner, rackMm = 0): number {
  counter.poses += 2;
  return rollSteerCoefficient(corner, rackMm);
}

export function summary(counter: PoseCounter, corner: Corner): AxleSummary {
  counter.poses += 2;
  return axleSummary(corner);
}

/** Steering ratio and Ackermann over `points` rack positions across the stroke. */
export function steering(counter: PoseCounter, corner: Corner, wheelbaseMm: number | undefined, points: number) {
  counter.poses += 2 * points + 4;
  return axleKinematics(corner, { steeringPoints: points, ...(wheelbaseMm ? { wheelbaseMm } : {}) }).steering;
}

/**
 * The vehicle with this axle's corner linked in by the balance model
 * (`linkVehicle`, what `computeBalance` does): ε, roll camber, roll-centre
 * height and motion ratios read from the corner (its axleSummary, two poses),
 * the other axle as entered. `rollSteerCoefficient` overrides the corner's ε.
 */
export function linked(counter: PoseCounter, vehicle: Vehicle, axle: AxleName, corner: Corner, rollSteerCoefficient?: number): LinkedVehicle {
  counter.poses += 2;
  const overrides = rollSteerCoefficient === undefined ? undefined : { [axle]: { rollSteerCoefficient } };
  return linkVehicle({ vehicle, ...(axle === 'front' ? { frontCorner: corner } : { rearCorner: corner }), ...(overrides ? { overrides } : {}) });
}
