/**
 * Response types of vehicles, axle designs and proposals (docs/api.md), as
 * they travel: timestamps are ISO 8601 UTC strings. Framework-free types only.
 */
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
