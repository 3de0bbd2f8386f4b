/**
 * The editor's analysis of one corner, composed from the shared/ kinematics
 * engine (no engineering math here): travel sweeps with fits at several rack
 * positions, the roll sweep with ε, and the pose shown in the drawings.
 * Runs inside the Web Worker (or in the page where no Worker exists).
 */
import { InputError, SolveError } from '../../../shared/errors';
import { posedPoints, rollSweep, solvePose, sweepCorner } from '../../../shared/kinematics/index';
import type { Corner } from '../../../shared/schema/corner';
import { upgradeVehicleDocument, vehicleSchema, type Vehicle } from '../../../shared/schema/vehicle';
import { cautionRackPositions, measureCornerCautions } from '../../../shared/cautions/corner-cautions';
import { resolveTrackProfile } from '../../../shared/tracks/profiles';
import { complianceBesideRollSteer } from '../../../shared/compliance/compare';
import { describeFailure } from './describe-failure';
import type { AnalysisRequest, CautionRequest, CornerAnalysis, CornerCautions, DrawnPose, RackCurve, RollCurve } from './analysis-types';

/** The pose shown in the drawings: the solved pose's outputs and every hardpoint moved with it. */
function drawnPose(request: AnalysisRequest): DrawnPose {
  const { corner, pose } = request;
  const solved = solvePose(corner, { travelMm: pose.travelMm, rackMm: pose.rackMm });
  const drawn = posedPoints(corner, solved.state);
  return {
    travelMm: pose.travelMm,
    rackMm: pose.rackMm,
    toeDeg: solved.toeDeg,
    camberDeg: solved.camberDeg,
    points: drawn,
    contactPatch: solved.contactPatch,
  };
}

export function analyseCorner(request: AnalysisRequest): CornerAnalysis {
  const started = performance.now();
  const racks = [...request.rackMm];
  const sweep = sweepCorner(request.corner, { travel: { ...request.travel }, rackMm: racks });
  const curves: RackCurve[] = sweep.fit.byRack.map((fit) => ({
    rackMm: fit.rackMm,
    points: sweep.rows
      .filter((r) => r.rackMm === fit.rackMm)
      .map((r) => ({ travelMm: r.travelMm, toeDeg: r.toeDeg, camberDeg: r.camberDeg })),
    bumpSteerDegPerM: fit.bumpSteerDegPerM,
    curvatureDegPerM2: fit.curvatureDegPerM2,
    maxDeviationDeg: fit.maxDeviationDeg,
    camberGainDegPerM: fit.camberGainDegPerM,
  }));
  const roll = rollSweep(request.corner, { roll: { ...request.roll }, rackMm: racks });
  const rollCurves: RollCurve[] = roll.byRack.map((b) => ({
    rackMm: b.rackMm,
    rollSteerCoefficient: b.rollSteerCoefficient,
    points: roll.rows.filter((r) => r.rackMm === b.rackMm).map((r) => ({ rollDeg: r.rollDeg, axleSteerDeg: r.axleSteerDeg })),
  }));
  return {
    curves,
    roll: rollCurves,
    rollSteerCoefficient: roll.rollSteerCoefficient,
    rollCamberDegPerDeg: roll.rollCamberDegPerDeg,
    pose: drawnPose(request),
    cautions: request.cautions ? cornerCautions(request.corner, request.cautions) : null,
    compliance: cornerCompliance(request, roll.rollSteerCoefficient),
    elapsedMs: performance.now() - started,
  };
}

/** The vehicle's stored data as the balance model reads it, or why it cannot be used. */
function vehicleFrom(data: unknown): { vehicle: Vehicle | undefined; note: string | null } {
  if (data === null || data === undefined) return { vehicle: undefined, note: 'no vehicle data' };
  const parsed = vehicleSchema.safeParse(upgradeVehicleDocument(data));
  if (parsed.success) return { vehicle: parsed.data, note: null };
  const first = parsed.error.issues[0];
  return { vehicle: undefined, note: `the vehicle data is incomplete (${first ? `${first.path.join('.') || '(root)'}: ${first.message}` : 'invalid'})` };
}

/** Compliance steer beside the roll steer, in deg/g with the vehicle when its data is complete. */
function cornerCompliance(request: AnalysisRequest, eps: number): CornerAnalysis['compliance'] {
  const c = request.cautions;
  const vehicle = c ? vehicleFrom(c.vehicleData).vehicle : undefined;
  try {
    return { ok: true, value: complianceBesideRollSteer(request.corner, eps, c?.axle ?? 'front', vehicle) };
  } catch (error) {
    if (error instanceof InputError || error instanceof SolveError) return { ok: false, failure: describeFailure(error) };
    throw error;
  }
}

/** The corner's cautions on the chosen profile (shared/cautions); a profile it cannot reach is reported, not fatal to the kinematics. */
function cornerCautions(corner: Corner, request: CautionRequest): CornerCautions {
  const profile = resolveTrackProfile(request.trackProfile);
  const { vehicle, note } = vehicleFrom(request.vehicleData);
  try {
    const m = measureCornerCautions(corner, { axle: request.axle, trackProfile: request.trackProfile, vehicle });
    return {
      ok: true,
      list: m.cautions,
      profile,
      racksMm: cautionRackPositions(corner),
      vehicleUsed: vehicle !== undefined,
      vehicleNote: note,
      bumpCost: m.bumpCost,
      bumpCostUnavailable: m.bumpCostUnavailable,
    };
  } catch (error) {
    if (error instanceof InputError || error instanceof SolveError) return { ok: false, profile, failure: describeFailure(error) };
    throw error;
  }
}
