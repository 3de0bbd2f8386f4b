/**
 * Response types of vehicles, axle designs and proposals (docs/api.md), as
 * they travel: timestamps are ISO 8601 UTC strings. Framework-free types only.
 */
import type { ChangedPoint } from '../io/hardpoints.js';
import type { Corner } from '../schema/corner.js';
import type { AxleName } from '../schema/axle.js';

/** `GET /api/teams/:teamId/vehicles` rows. */
export interface VehicleSummary {
  readonly id: string;
  readonly name: string;
  readonly archived: boolean;
  readonly revision: number;
  readonly updatedAt: string;
  readonly updatedByName: string | null;
}

/** `GET /api/teams/:teamId/vehicles/:vehicleId`: the vehicle with its data (null until entered). */
export interface VehicleRecord extends VehicleSummary {
  readonly data: unknown;
}

/** `GET /api/teams/:teamId/vehicles/:vehicleId/axle-designs` rows. */
export interface AxleDesignSummary {
  readonly id: string;
  readonly axle: AxleName;
  readonly name: string;
  readonly revision: number;
  readonly status: string;
  readonly updatedAt: string;
}

/** `GET /api/teams/:teamId/axle-designs/:designId`. */
export interface AxleDesign extends AxleDesignSummary {
  readonly vehicleId: string;
  readonly corner: Corner;
  readonly updatedByName: string | null;
}

/** A geometry proposal on an axle design (engineer proposes, designer accepts). */
export interface Proposal {
  readonly id: string;
  readonly designId: string;
  readonly baseRevision: number;
  readonly status: 'open' | 'accepted' | 'rejected' | 'withdrawn';
  readonly message: string | null;
  readonly origin: unknown;
  readonly authorName: string | null;
  readonly createdAt: string;
  readonly decidedByName: string | null;
  readonly decidedAt: string | null;
  readonly acceptedRevision: number | null;
  readonly corner?: Corner;
}

/** `GET …/vehicles/:vehicleId/revisions/:revision`: one stored revision (`data` upgraded to the current format). */
export interface VehicleRevisionRecord {
  readonly revision: number;
  readonly name: string;
  readonly archived: boolean;
  readonly data: unknown;
  readonly message: string | null;
  readonly authorName: string | null;
  readonly createdAt: string;
}

/** `GET …/axle-designs/:designId/revisions/:revision`: one stored revision. */
export interface DesignRevisionRecord {
  readonly revision: number;
  readonly name: string;
  readonly status: string;
  readonly archived: boolean;
  readonly corner: Corner;
  readonly message: string | null;
  readonly authorName: string | null;
  readonly createdAt: string;
}

/** `POST …/proposals/:proposalId/accept`: the accepted proposal and the design's new revision. */
export interface AcceptedProposal {
  readonly proposal: Proposal;
  readonly design: AxleDesign;
}

/** `POST /api/teams/:teamId/axle-designs/:designId/import` answer: a preview, nothing saved. */
export interface ImportPreview {
  readonly corner: Corner;
  readonly changedPoints: readonly ChangedPoint[];
  readonly warnings: readonly string[];
  /** The design revision the preview was made on (save with it as baseRevision). */
  readonly baseRevision: number;
}
