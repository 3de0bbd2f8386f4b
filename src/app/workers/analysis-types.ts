import type { Corner, Vec3 } from '../../../shared/schema/corner';
import type { Caution } from '../../../shared/cautions/cautions';
import type { ComplianceBesideRollSteer } from '../../../shared/compliance/compare';
import type { TrackProfile, TrackProfileChoice } from '../../../shared/tracks/profiles';
import type { BumpCost } from '../../../shared/ride/cost';
import type { AxleName } from '../../../shared/schema/axle';

/** What the cautions beside the results are measured for. */
export interface CautionRequest {
  readonly axle: AxleName;
  readonly trackProfile: TrackProfileChoice;
  /** The vehicle's stored data (validated in the worker; left out of the cautions when incomplete), or null. */
  readonly vehicleData: unknown;
}

/** The cautions of the corner (shared/cautions `cautionsForCorner`), or why they could not be measured. */
export type CornerCautions =
  | {
      readonly ok: true;
      readonly list: readonly Caution[];
      readonly profile: TrackProfile;
      /** Rack positions the bump cautions were measured at, mm. */
      readonly racksMm: readonly number[];
      /** Whether the vehicle's tyres, loads and roll were used, and why not. */
      readonly vehicleUsed: boolean;
      readonly vehicleNote: string | null;
      /** The ride model's bump cost on the profile (shared/ride), or why there is none. */
      readonly bumpCost: BumpCost | null;
      readonly bumpCostUnavailable: string | null;
    }
  | { readonly ok: false; readonly profile: TrackProfile; readonly failure: AnalysisFailure };

/** What the editor asks the engine for: one corner, its sweep ranges and the pose to draw. */
export interface AnalysisRequest {
  readonly corner: Corner;
  readonly travel: { readonly from: number; readonly to: number; readonly step: number };
  /** Rack positions for the toe and camber curves, mm; 0 first. */
  readonly rackMm: readonly number[];
  readonly roll: { readonly from: number; readonly to: number; readonly step: number };
  /** Pose shown in the drawings. */
  readonly pose: { readonly travelMm: number; readonly rackMm: number };
  /** Cautions to measure beside the results (left out: none). */
  readonly cautions?: CautionRequest;
}

export interface CurvePoint {
  readonly travelMm: number;
  readonly toeDeg: number;
  readonly camberDeg: number;
}

export interface RackCurve {
  readonly rackMm: number;
  readonly points: readonly CurvePoint[];
  /** Toe-in per metre of bump, deg/m (linear fit). */
  readonly bumpSteerDegPerM: number;
  /** Second-order term of the toe fit, deg/m². */
  readonly curvatureDegPerM2: number;
  /** Largest deviation of toe from its linear fit, deg. */
  readonly maxDeviationDeg: number;
  /** Camber change per metre of bump, deg/m. */
  readonly camberGainDegPerM: number;
}

export interface RollCurve {
  readonly rackMm: number;
  /** ε at this rack position, deg/deg. */
  readonly rollSteerCoefficient: number;
  readonly points: readonly { readonly rollDeg: number; readonly axleSteerDeg: number }[];
}

/** A pose of the corner for the drawings: every hardpoint where it is at that travel and rack. */
export interface DrawnPose {
  readonly travelMm: number;
  readonly rackMm: number;
  readonly toeDeg: number;
  readonly camberDeg: number;
  readonly points: Readonly<Record<string, Vec3>>;
  readonly contactPatch: Vec3;
}

export interface CornerAnalysis {
  readonly curves: readonly RackCurve[];
  readonly roll: readonly RollCurve[];
  /** ε = −dδ̄/dφ at φ = 0 and rack 0, deg/deg (domain.md). */
  readonly rollSteerCoefficient: number;
  readonly rollCamberDegPerDeg: number;
  readonly pose: DrawnPose;
  readonly cautions: CornerCautions | null;
  /** Compliance from the corner's bushings beside the roll steer (shared/compliance), or why it could not be computed. */
  readonly compliance: { readonly ok: true; readonly value: ComplianceBesideRollSteer } | { readonly ok: false; readonly failure: AnalysisFailure };
  /** Time the engine took, ms (shown as a small figure; the bench measures properly). */
  readonly elapsedMs: number;
}

/** An engine failure in a form that crosses the worker boundary. */
export interface AnalysisFailure {
  readonly code: string;
  readonly message: string;
  readonly details?: unknown;
}

export type WorkerRequest = { readonly id: number; readonly request: AnalysisRequest };
export type WorkerReply =
  | { readonly id: number; readonly ok: true; readonly analysis: CornerAnalysis }
  | { readonly id: number; readonly ok: false; readonly failure: AnalysisFailure };
