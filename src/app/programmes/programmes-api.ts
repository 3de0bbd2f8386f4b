import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { TrackProfileId } from '../../../shared/intent/profiles';
import { SHOW_ERRORS_INLINE } from '../core/http/api-error';

/** For requests made from a form that shows the error beside itself. */
const INLINE = { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };

export type ProgrammeTeamStatus = 'invited' | 'accepted' | 'declined';

/** `GET /api/programmes` rows and `POST /api/programmes` (docs/api.md, "Programmes"). */
export interface Programme {
  readonly id: string;
  readonly name: string;
  readonly trackProfile: TrackProfileId;
  readonly instructorId: string;
  readonly createdAt: string;
}

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

/** Key figures of one configuration (server/services/programmes.ts `KeyFigures`). */
export interface KeyFigures {
  /** ε per axle, deg/deg. */
  readonly rollSteerFront: number | null;
  readonly rollSteerRear: number | null;
  /** Roll-steer term of the understeer budget: the understeer-gradient change roll steer makes, deg/g. */
  readonly rollSteerUndersteerDegPerG: number | null;
  readonly understeerGradientDegPerG: number | null;
  /** Bump steer over the profile's travel, deg/m. */
  readonly bumpSteerFrontDegPerM: number | null;
  readonly bumpSteerRearDegPerM: number | null;
}

export type BoardLatest =
  | { readonly revision: number; readonly trackProfile: string; readonly figures: KeyFigures }
  | { readonly revision: number; readonly error: string };

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

const base = '/api/programmes';
const one = (id: string) => `${base}/${encodeURIComponent(id)}`;

/** Programmes (instructors) and a team's programme invitations (owners). */
@Injectable({ providedIn: 'root' })
export class ProgrammesApi {
  private readonly http = inject(HttpClient);

  list(): Observable<Programme[]> {
    return this.http.get<Programme[]>(base);
  }

  create(name: string, trackProfile: TrackProfileId): Observable<Programme> {
    return this.http.post<Programme>(base, { name, trackProfile }, INLINE);
  }

  get(id: string): Observable<ProgrammeDetail> {
    return this.http.get<ProgrammeDetail>(one(id));
  }

  inviteTeam(id: string, teamSlug: string): Observable<ProgrammeTeam> {
    return this.http.post<ProgrammeTeam>(`${one(id)}/teams`, { teamSlug }, INLINE);
  }

  board(id: string): Observable<Board> {
    return this.http.get<Board>(`${one(id)}/board`);
  }

  takeSnapshot(id: string, label: string | undefined): Observable<Snapshot> {
    return this.http.post<Snapshot>(`${one(id)}/snapshots`, label ? { label } : {}, INLINE);
  }

  snapshots(id: string): Observable<SnapshotSummary[]> {
    return this.http.get<SnapshotSummary[]>(`${one(id)}/snapshots`);
  }

  snapshot(id: string, snapshotId: string): Observable<Snapshot> {
    return this.http.get<Snapshot>(`${one(id)}/snapshots/${encodeURIComponent(snapshotId)}`);
  }

  /** The CSV download address of a snapshot (a plain link: the session cookie goes with it). */
  snapshotCsvUrl(id: string, snapshotId: string): string {
    return `${one(id)}/snapshots/${encodeURIComponent(snapshotId)}?format=csv`;
  }

  forTeam(teamId: string): Observable<TeamProgramme[]> {
    return this.http.get<TeamProgramme[]>(`/api/teams/${encodeURIComponent(teamId)}/programmes`);
  }

  decide(teamId: string, programmeId: string, decision: 'accept' | 'decline'): Observable<unknown> {
    return this.http.post(
      `/api/teams/${encodeURIComponent(teamId)}/programmes/${encodeURIComponent(programmeId)}/${decision}`,
      {},
    );
  }
}
