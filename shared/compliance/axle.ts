/**
 * A corner's compliance as the axle figures the balance model reads
 * (docs/compliance.md §5): both wheels of an axle (the left corner and its
 * mirror) each carrying half the axle's lateral force, inboard on the
 * outside wheel and outboard on the inside one, acting a pneumatic trail
 * behind the contact patch.
 *
 * The lateral force at the contact patch is split (linear superposition)
 * into the same force where the steering axis meets the ground plus its
 * moment about the steering axis through the mechanical trail; with the
 * pneumatic trail's moment that is the aligning moment F·(t_m + t_p). So
 * the balance model's two terms are
 *   complianceSteer      = −T_G / 2 per kN of axle force (T_G: toe-in per kN
 *                          inboard at the ground point of the steering axis),
 *   aligning-torque steer = F·(t_m + t_p) / K, K = −2000 / A N·m/deg
 *                          (A: toe-in per kN·m of +z moment on the left wheel),
 * and the outward inclination per kN of axle force is half the camber per
 * kN inboard with the pneumatic moment. Steer "out of the turn" is positive
 * (docs/balance.md). A mirrored right wheel has the same toe (domain.md).
 */
import type { Corner } from '../schema/corner.js';
import { poseRow } from '../kinematics/index.js';
import { complianceRow, solvedCorner, hasCompliance, type ComplianceRow } from './index.js';

export interface AxleComplianceFigures {
  /** Pose the figures were read at. */
  travelMm: number;
  rackMm: number;
  /** The corner's own figures at that pose. */
  corner: ComplianceRow;
  /** Mechanical trail at the pose, mm (positive: steering axis meets the ground ahead of the contact patch). */
  mechanicalTrailMm: number;
  /** Lateral-force compliance steer of the axle with the force at the steering axis' ground point, deg per kN of axle lateral force, positive out of the turn. */
  complianceSteerDegPerKN: number;
  /** The same with the force at the contact patch (the mechanical trail's moment included), deg/kN, positive out of the turn. */
  contactPatchSteerDegPerKN: number;
  /** Equivalent steering stiffness against aligning torque, N·m per deg of road-wheel steer; null when the moment does not steer the wheel out of the turn. */
  steeringStiffnessNmPerDeg: number | null;
  /** Outward inclination of the wheels from compliance per kN of axle lateral force (with the pneumatic trail's moment), deg/kN. */
  complianceCamberDegPerKN: number;
  /** Total elastic steer out of the turn per kN of axle force with the given pneumatic trail, deg/kN. */
  totalSteerDegPerKN: number;
}

/**
 * Axle compliance figures of a corner at a rack position (travel 0), or
 * null when the corner carries no bushings, link or steering rates.
 */
export function axleComplianceOf(corner: Corner, options: { rackMm?: number | undefined; pneumaticTrailMm?: number | undefined } = {}): AxleComplianceFigures | null {
  if (!hasCompliance(corner)) return null;
  const s = solvedCorner(corner, { travelMm: 0, rackMm: options.rackMm ?? 0 });
  const row = complianceRow(s);
  const tm = poseRow(s).mechanicalTrailMm / 1000; // m
  const tp = (options.pneumaticTrailMm ?? 0) / 1000;
  const T = row.lateralForceToeDegPerKN;
  const A = row.aligningMomentToeDegPerKNm;
  const C = row.lateralForceCamberDegPerKN;
  const Ac = row.aligningMomentCamberDegPerKNm;
  // An inboard force at the patch is the same force at the axis' ground point plus +t_m·F about +z (left wheel).
  const TG = T - A * tm;
  // The pneumatic trail adds +t_p·F about +z: toe T + A·t_p, camber C + Ac·t_p per kN inboard.
  return {
    travelMm: 0,
    rackMm: s.rackMm,
    corner: row,
    mechanicalTrailMm: tm * 1000,
    complianceSteerDegPerKN: -TG / 2,
    contactPatchSteerDegPerKN: -T / 2,
    steeringStiffnessNmPerDeg: A < -1e-12 ? -2000 / A : null,
    complianceCamberDegPerKN: (C + Ac * tp) / 2,
    totalSteerDegPerKN: -(T + A * tp) / 2,
  };
}
