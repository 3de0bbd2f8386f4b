/**
 * Response types of the rig measurement API (docs/rig-measurements.md), as
 * they travel: timestamps are ISO 8601 UTC strings. The server's handlers are
 * checked against them (server/http/reply.ts) and the app's data access reads
 * them; framework-free types only.
 */
import type { RigMapping, RigPoint, RigPreview } from '../io/rig-measurement.js';
import type { RigBasis, RigComparison, RigTolerance } from '../rig/compare.js';
import type { AxleName } from '../schema/axle.js';

/** `GET …/rig-measurements` rows. */
export interface RigMeasurementSummary {
  readonly id: string;
  readonly name: string;
  readonly fileName: string;
  readonly attachedTo: 'configuration' | 'baseline';
  readonly configurationId: string | null;
  readonly configurationRevision: number | null;
  readonly axle: AxleName;
  readonly designId: string;
  readonly designName: string;
  readonly designRevision: number;
  readonly side: 'left' | 'right';
  readonly rackMm: number;
  readonly basis: RigBasis;
  readonly pointCount: number;
  readonly hasCamber: boolean;
  readonly note: string | null;
  readonly authorName: string | null;
  readonly createdAt: string;
}

/** `GET …/rig-measurements/:id`: the points and the comparison the server computed now. */
export interface RigMeasurementDetail extends RigMeasurementSummary {
  readonly mapping: RigMapping;
  readonly points: readonly RigPoint[];
  readonly comparison: RigComparison;
  readonly engineVersion: string;
}

/** `POST …/rig-measurements`: the stored measurement with its comparison. */
export type CreatedRigMeasurement = RigMeasurementSummary & { readonly comparison: RigComparison };

/** `POST …/rig-measurements/preview`: columns, first rows and a proposed mapping (nothing stored). */
export type RigPreviewAnswer = RigPreview & { readonly fileName: string };

/** `GET /rig-tolerance`: the team's tolerance, or the product defaults (`isDefault`). */
export interface RigToleranceView extends RigTolerance {
  readonly isDefault: boolean;
  readonly updatedAt: string | null;
  readonly updatedByName: string | null;
}
