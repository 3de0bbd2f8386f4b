import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import type { OutputCurveAxis, OutputCurveRow } from '../../../../shared/kinematics/output-curves';
import type { AnalysisFailure } from '../../workers/analysis-types';
import type { AxleName } from '../../../../shared/schema/axle';

/** One geometry to draw curves for: the design being edited, a saved revision or a proposal. */
export interface CurveSource {
  readonly id: string;
  readonly label: string;
  readonly corner: Corner;
}

/** What the curves panel asks the views worker for. */
export interface CurvesRequest {
  readonly kind: 'curves';
  readonly sources: readonly CurveSource[];
  readonly axis: OutputCurveAxis;
  /** Travel (mm) or roll (deg) range; unused for the steer axis (whole stroke). */
  readonly range: { readonly from: number; readonly to: number; readonly step: number };
  /** Rack held in travel and roll sweeps; travel held in the steer sweep. */
  readonly rackMm: number;
  readonly travelMm: number;
  readonly axle: AxleName;
  /** The vehicle's stored data (wheelbase and CG height for Ackermann and the anti features), validated in the worker. */
  readonly vehicleData: unknown;
}

export interface SourceCurves {
  readonly id: string;
  readonly label: string;
  readonly rows: readonly OutputCurveRow[] | null;
  readonly failure: AnalysisFailure | null;
}

export interface CurvesReply {
  readonly kind: 'curves';
  readonly curves: readonly SourceCurves[];
  /** Why Ackermann and the anti features are missing, or null when the vehicle gave what they need. */
  readonly vehicleNote: string | null;
}

/** Poses of the linkage over a travel sweep, for the 3D view's animation. */
export interface PosesRequest {
  readonly kind: 'poses';
  readonly corner: Corner;
  readonly travelsMm: readonly number[];
  readonly rackMm: number;
}

export interface LinkagePose {
  readonly travelMm: number;
  readonly points: Readonly<Record<string, Vec3>>;
  readonly contactPatch: Vec3;
}

export interface PosesReply {
  readonly kind: 'poses';
  readonly poses: readonly LinkagePose[];
}

export type ViewsRequest = CurvesRequest | PosesRequest;
export type ViewsReply = CurvesReply | PosesReply;

export type ViewsWorkerMessage = { readonly id: number; readonly request: ViewsRequest };
export type ViewsWorkerAnswer =
  | { readonly id: number; readonly ok: true; readonly reply: ViewsReply }
  | { readonly id: number; readonly ok: false; readonly failure: AnalysisFailure };
