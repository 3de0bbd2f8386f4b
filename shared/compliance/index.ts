/**
 * Corner compliance: public library API (docs/compliance.md). Per pose: the
 * compliance matrix at the wheel centre, and per unit load at the tyre the
 * toe and camber change, contact-patch displacement and the force in every
 * link and mount; sweeps over travel and rack; lateral stiffness at the
 * contact patch. Conventions (axes, signs, units) are those of domain.md:
 * left corner, toe-in positive, camber positive top outboard.
 */
import { InputError } from '../errors.js';
import type { Corner } from '../schema/corner.js';
import { compileCorner, CornerSolver, checkRack, sweepTravels, type CornerModel } from '../kinematics/index.js';
import {
  complianceSpec,
  evaluatePoseCompliance,
  mountForces,
  respond,
  unitLoad,
  LOAD_DESCRIPTIONS,
  LOAD_NAMES,
  type ComplianceSpec,
  type LoadName,
  type MountForce,
  type PoseCompliance,
} from './engine.js';

export { complianceSpec, evaluatePoseCompliance, respond, unitLoad, mountForces, toeCamberOf, LOAD_NAMES, LOAD_DESCRIPTIONS, type LoadName, type PoseCompliance, type ComplianceSpec, type MountForce } from './engine.js';

/** Shown with every compliance result. */
export const COMPLIANCE_CAUTION =
  'Design estimates from an idealised linear elastic model (rigid arms and upright, linear bushing rates about one pose). ' +
  'Verify on a kinematics and compliance rig and in controlled testing, and follow your series’ technical regulations and the engineering codes and licensed practice that apply.';

/** The response to one unit load, scaled to 1 kN (1 kN·m for the moment). */
export interface LoadReport {
  load: LoadName;
  description: string;
  /** Toe change, deg per kN (per kN·m), toe-in positive. */
  toeDeg: number;
  /** Camber change, deg per kN (per kN·m), top outboard positive. */
  camberDeg: number;
  /** Contact-patch displacement, mm per kN (per kN·m), vehicle axes (left corner). */
  contactPatchMm: [number, number, number];
  /** Wheel-centre displacement, mm per kN (per kN·m). */
  wheelCentreMm: [number, number, number];
  /** Upright rotation vector, deg per kN (per kN·m), about x, y, z. */
  rotationDeg: [number, number, number];
  /** Force in each link or arm leg per unit load (N per N; per N·m for the moment), tension positive. */
  linkForcesN: Record<string, number>;
  /** Force each mount passes to the body (body points) or each ball joint to its arm, per unit load (N per N; per N·m), with axial (signed) and radial parts. */
  mountForcesN: Record<string, MountForce>;
  /** Vertical force carried by the spring and tyre (wheel-centre height held), per unit load, N per N (per N·m). */
  verticalSupportN: number;
}

export interface CornerComplianceReport {
  travelMm: number;
  rackMm: number;
  /** No bushing, link or steering rate given: every figure is zero and the lateral stiffness is unbounded (null). */
  rigid: boolean;
  notes: string[];
  lateralForceToeDegPerKN: number;
  lateralForceCamberDegPerKN: number;
  aligningMomentToeDegPerKNm: number;
  aligningMomentCamberDegPerKNm: number;
  brakingForceToeDegPerKN: number;
  brakingForceCamberDegPerKN: number;
  tractionForceToeDegPerKN: number;
  tractionForceCamberDegPerKN: number;
  verticalForceToeDegPerKN: number;
  verticalForceCamberDegPerKN: number;
  /** Inboard force at the contact patch per mm of inboard contact-patch displacement, N/mm; null when rigid. */
  lateralStiffnessNPerMm: number | null;
  /** Per load, per link: force per unit load (N per N of force; N per N·m of moment), tension positive. */
  linkForcesN: Record<LoadName, Record<string, number>>;
  loads: Record<LoadName, LoadReport>;
  /**
   * Compliance matrix of the upright at the wheel centre (symmetric), rows and
   * columns [x, y, z, rx, ry, rz]: translation mm and rotation rad against
   * force N and moment N·mm. The z row and column are zero: the wheel-centre
   * height is held (spring and tyre carry vertical load).
   */
  wheelCentreMatrix: { basis: string; values: number[][] };
  caution: string;
}

const v3 = (a: ArrayLike<number>, k: number): [number, number, number] => [a[0]! * k, a[1]! * k, a[2]! * k];

/** Solves the pose by continuation from design (InputError for a rack outside the stroke, SolveError if unreachable). */
export function solvedCorner(corner: Corner | unknown, at: { travelMm?: number | undefined; rackMm?: number | undefined }, field = 'rackMm'): CornerSolver {
  const model = compileCorner(corner);
  const travel = at.travelMm ?? 0;
  const rack = at.rackMm ?? 0;
  if (!Number.isFinite(travel)) throw new InputError('travelMm: must be a finite number', [{ path: 'travelMm', message: 'not a finite number' }]);
  try {
    checkRack(model, [rack], field);
  } catch (e) {
    // One position, so the message names the field itself rather than its first list entry.
    if (e instanceof InputError) throw new InputError(e.message.replace(`${field}[0]`, field), e.issues.map((i) => ({ ...i, path: field })));
    throw e;
  }
  const s = new CornerSolver(model, 'left');
  s.solve(0, 0);
  s.solveTowards(travel, rack);
  return s;
}

/** Headline figures of one pose (all five loads, no mount forces): what sweeps and the balance link read. */
export interface ComplianceRow {
  travelMm: number;
  rackMm: number;
  lateralForceToeDegPerKN: number;
  lateralForceCamberDegPerKN: number;
  aligningMomentToeDegPerKNm: number;
  aligningMomentCamberDegPerKNm: number;
  brakingForceToeDegPerKN: number;
  tractionForceToeDegPerKN: number;
  verticalForceToeDegPerKN: number;
  lateralStiffnessNPerMm: number | null;
}

const fBuf = new Float64Array(6);

/** The headline figures at the solver's current pose. */
export function complianceRow(s: CornerSolver, spec: ComplianceSpec = complianceSpec(s.model)): ComplianceRow {
  const pc = evaluatePoseCompliance(s, spec);
  const r = (l: LoadName) => {
    unitLoad(pc, l, fBuf);
    return respond(pc, fBuf);
  };
  const lat = r('lateralForce');
  const al = r('aligningMoment');
  return {
    travelMm: s.travelMm,
    rackMm: s.rackMm,
    lateralForceToeDegPerKN: lat.toeDeg * 1000,
    lateralForceCamberDegPerKN: lat.camberDeg * 1000,
    aligningMomentToeDegPerKNm: al.toeDeg * 1000,
    aligningMomentCamberDegPerKNm: al.camberDeg * 1000,
    brakingForceToeDegPerKN: r('brakingForce').toeDeg * 1000,
    tractionForceToeDegPerKN: r('tractionForce').toeDeg * 1000,
    verticalForceToeDegPerKN: r('verticalForce').toeDeg * 1000,
    lateralStiffnessNPerMm: lateralStiffness(spec, lat.contactPatchMm[1]),
  };
}

function lateralStiffness(spec: ComplianceSpec, cpYPerN: number): number | null {
  // Inboard force moves the patch inboard (−y): stiffness = 1 / (inboard displacement per N).
  return spec.rigid || !(-cpYPerN > 0) ? null : 1 / -cpYPerN;
}

/** The full report at the solver's current pose. */
export function complianceReport(s: CornerSolver): CornerComplianceReport {
  const spec = complianceSpec(s.model);
  const pc: PoseCompliance = evaluatePoseCompliance(s, spec);
  const f = new Float64Array(6);
  const loads = {} as Record<LoadName, LoadReport>;
  const linkForcesN = {} as Record<LoadName, Record<string, number>>;
  for (const load of LOAD_NAMES) {
    unitLoad(pc, load, f);
    const r = respond(pc, f);
    // Forces per unit load: 1 N, or 1 N·m (the moment was applied as 1000 N·mm).
    const links: Record<string, number> = {};
    spec.forceNames.forEach((n, i) => (links[n] = r.lambda[i]!));
    linkForcesN[load] = links;
    const k = 1000;
    loads[load] = {
      load,
      description: LOAD_DESCRIPTIONS[load],
      toeDeg: r.toeDeg * k,
      camberDeg: r.camberDeg * k,
      contactPatchMm: v3(r.contactPatchMm, k),
      wheelCentreMm: v3(r.x, k),
      rotationDeg: v3(r.x.subarray(3), (k * 180) / Math.PI),
      linkForcesN: links,
      mountForcesN: mountForces(pc, spec, r.lambda),
      verticalSupportN: r.lambda[5]!,
    };
  }
  const notes: string[] = [];
  if (spec.rigid) notes.push('No bushings, link stiffness or steering stiffness given: the corner is rigid, so every compliance figure is zero and the lateral stiffness is unbounded (null).');
  notes.push('Wheel-centre height held at the pose: the spring and tyre carry vertical load; the kinematic response to wheel travel (bump steer) is reported by the sweep, not here.');
  const c = s.model.corner;
  if (c.type === 'five-link' || Object.keys(c.bushings ?? {}).some((k) => /Inner$|Outer$/.test(k) && k !== 'lowerOuter' && k !== 'upperOuter')) {
    notes.push('A single link carries only axial force here, so only the axial rates of its end bushings count (their conical and torsional rates are not modelled).');
  }
  const G = pc.G;
  return {
    travelMm: s.travelMm,
    rackMm: s.rackMm,
    rigid: spec.rigid,
    notes,
    lateralForceToeDegPerKN: loads.lateralForce.toeDeg,
    lateralForceCamberDegPerKN: loads.lateralForce.camberDeg,
    aligningMomentToeDegPerKNm: loads.aligningMoment.toeDeg,
    aligningMomentCamberDegPerKNm: loads.aligningMoment.camberDeg,
    brakingForceToeDegPerKN: loads.brakingForce.toeDeg,
    brakingForceCamberDegPerKN: loads.brakingForce.camberDeg,
    tractionForceToeDegPerKN: loads.tractionForce.toeDeg,
    tractionForceCamberDegPerKN: loads.tractionForce.camberDeg,
    verticalForceToeDegPerKN: loads.verticalForce.toeDeg,
    verticalForceCamberDegPerKN: loads.verticalForce.camberDeg,
    lateralStiffnessNPerMm: lateralStiffness(spec, loads.lateralForce.contactPatchMm[1] / 1000),
    linkForcesN,
    loads,
    wheelCentreMatrix: {
      basis: 'rows and columns [x, y, z, rx, ry, rz] at the wheel centre, left corner: mm and rad against N and N·mm',
      values: [0, 1, 2, 3, 4, 5].map((i) => [0, 1, 2, 3, 4, 5].map((j) => G[6 * i + j]!)),
    },
    caution: COMPLIANCE_CAUTION,
  };
}

/** Compliance of a corner at one pose (travel and rack in mm). */
export function cornerCompliance(corner: Corner | unknown, at: { travelMm?: number | undefined; rackMm?: number | undefined } = {}): CornerComplianceReport {
  return complianceReport(solvedCorner(corner, at));
}

/** Headline figures over travels × rack positions (continuation along each rack's travel list). */
export function complianceSweep(corner: Corner | unknown, travels: number[], racks: number[] = [0]): ComplianceRow[] {
  const model: CornerModel = compileCorner(corner);
  checkRack(model, racks, 'rackMm');
  const spec = complianceSpec(model);
  const s = new CornerSolver(model, 'left');
  const rows: ComplianceRow[] = [];
  for (const rack of racks) {
    const block = new Array<ComplianceRow>(travels.length);
    sweepTravels(s, travels, rack, (i) => {
      block[i] = complianceRow(s, spec);
    });
    rows.push(...block);
  }
  return rows;
}

/** Does the corner carry any elastic data (bushings, link or steering rates)? */
export function hasCompliance(corner: Corner): boolean {
  return !complianceSpec(compileCorner(corner)).rigid;
}
