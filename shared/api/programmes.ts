/**
 * Response types of the programmes API (docs/api.md, "Programmes"), as they
 * travel: timestamps are ISO 8601 UTC strings. The server's handlers are
 * checked against them (server/http/reply.ts) and the app's data access reads
 * them; a snapshot stores its board in this shape. Framework-free types only.
 */
import type { TrackProfileId } from '../tracks/profiles.js';

export type ProgrammeTeamStatus = 'invited' | 'accepted' | 'declined';

/** `GET /api/programmes` rows and `POST /api/programmes`. */
export interface Programme {
  readonly id: string;
  readonly name: string;
  readonly trackProfile: TrackProfileId;
  readonly instructorId: string;
  readonly createdAt: string;
}

/** A team's place in a programme (also the answer of inviting a team). */
export interface ProgrammeTeam {
  readonly teamId: string;
  readonly teamName: string;
  readonly teamSlug: string;
  readonly status: ProgrammeTeamStatus;
  readonly invitedAt: string;
  readonly decidedAt: string | null;
}

export interface ProgrammeDetail extends Programme {
  readonly teams: readonly ProgrammeTeam[];
}

/** Key figures of one configuration, read out of its results (no computation). */
export interface KeyFigures {
  /** ε per axle, deg/deg (as used by the balance model). */
  readonly rollSteerFront: number | null;
  readonly rollSteerRear: number | null;
  /** Roll-steer term of the understeer budget: the understeer-gradient change roll steer makes, deg/g. */
  readonly rollSteerUndersteerDegPerG: number | null;
  /** Whole understeer gradient, deg/g. */
  readonly understeerGradientDegPerG: number | null;
  /** Bump steer of each corner over the profile's travel, deg/m. */
  readonly bumpSteerFrontDegPerM: number | null;
  readonly bumpSteerRearDegPerM: number | null;
}

/** The latest revision computed now on the programme's profile, or why it could not be. */
export type BoardLatest =
  | { readonly revision: number; readonly trackProfile: string; readonly figures: KeyFigures }
  | { readonly revision: number; readonly error: string };

/** The latest approval's frozen figures. */
export interface BoardApproved {
  readonly revision: number;
  readonly approvedAt: string;
  readonly engineVersion: string;
  readonly trackProfile: string;
  readonly figures: KeyFigures;
}

export interface BoardRow {
  readonly teamId: string;
  readonly teamName: string;
  readonly configurationId: string;
  readonly configurationName: string;
  readonly status: string;
  readonly latest: BoardLatest;
  readonly approved: BoardApproved | null;
}

/** `GET /api/programmes/:programmeId/board`, and a snapshot's frozen board. */
export interface Board {
  readonly programmeId: string;
  readonly trackProfile: string;
  readonly engineVersion: string;
  readonly rows: readonly BoardRow[];
}

export interface SnapshotSummary {
  readonly id: string;
  readonly label: string | null;
  readonly takenAt: string;
}

export interface Snapshot extends SnapshotSummary {
  readonly programmeId: string;
  readonly board: Board;
}

/** `GET /api/teams/:teamId/programmes` rows (the team owner's view). */
export interface TeamProgramme {
  readonly programmeId: string;
  readonly name: string;
  readonly instructorName: string | null;
  readonly trackProfile: TrackProfileId;
  readonly status: ProgrammeTeamStatus;
  readonly invitedAt: string;
}
