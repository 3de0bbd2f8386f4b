/**
 * The linkage views' engine calls, composed from shared/ (no engineering
 * math here): every per-pose output along one sweep axis for each geometry
 * shown, and the posed hardpoints of a travel sweep for the 3D animation.
 * Runs inside the views Web Worker (or in the page where no Worker exists).
 */
import { outputCurves } from '../../../../shared/kinematics/output-curves';
import { posedHardpoints, solvePose } from '../../../../shared/kinematics/index';
import { upgradeVehicleDocument, vehicleSchema } from '../../../../shared/schema/vehicle';
import type { Corner } from '../../../../shared/schema/corner';
import { describeFailure } from '../../workers/describe-failure';
import type { CurvesReply, CurvesRequest, PosesReply, PosesRequest, SourceCurves, ViewsReply, ViewsRequest } from './views-types';

export { describeFailure };

function vehicleFigures(data: unknown): { wheelbaseMm: number; cgHeightMm: number } | string {
  if (data === null || data === undefined) return 'no vehicle data';
  const parsed = vehicleSchema.safeParse(upgradeVehicleDocument(data));
  if (!parsed.success) return 'the vehicle data is incomplete';
  return { wheelbaseMm: parsed.data.wheelbaseMm, cgHeightMm: parsed.data.cgHeightMm };
}

function curves(request: CurvesRequest): CurvesReply {
  const vehicle = vehicleFigures(request.vehicleData);
  const figures = typeof vehicle === 'string' ? null : vehicle;
  const out: SourceCurves[] = request.sources.map((s) => {
    try {
      const rows = outputCurves(s.corner, {
        axis: request.axis,
        ...(request.axis === 'steer' ? { travelMm: request.travelMm } : { range: { ...request.range }, rackMm: request.rackMm }),
        ...(figures
          ? { wheelbaseMm: figures.wheelbaseMm, anti: { axle: request.axle, cgHeightMm: figures.cgHeightMm, wheelbaseMm: figures.wheelbaseMm } }
          : {}),
      }).rows;
      return { id: s.id, label: s.label, rows, failure: null };
    } catch (error) {
      return { id: s.id, label: s.label, rows: null, failure: describeFailure(error) };
    }
  });
  return { kind: 'curves', curves: out, vehicleNote: typeof vehicle === 'string' ? vehicle : null };
}

function poses(request: PosesRequest): PosesReply {
  const corner: Corner = request.corner;
  return {
    kind: 'poses',
    poses: request.travelsMm.map((t) => ({
      travelMm: t,
      points: posedHardpoints(corner, { travelMm: t, rackMm: request.rackMm }),
      contactPatch: solvePose(corner, { travelMm: t, rackMm: request.rackMm }).contactPatch,
    })),
  };
}

export function runViewsRequest(request: ViewsRequest): ViewsReply {
  return request.kind === 'curves' ? curves(request) : poses(request);
}
