import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { TrackProfileId } from '../../../shared/tracks/profiles';
import { SHOW_ERRORS_INLINE } from '../core/http/api-error';
import type { Board, Programme, ProgrammeDetail, ProgrammeTeam, Snapshot, SnapshotSummary, TeamProgramme } from '../../../shared/api/programmes';

/** For requests made from a form that shows the error beside itself. */
const INLINE = { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };

// The answers' types are the server's (shared/api/programmes.ts).
export type {
  Board,
  BoardRow,
  KeyFigures,
  Programme,
  ProgrammeDetail,
  ProgrammeTeam,
  ProgrammeTeamStatus,
  Snapshot,
  SnapshotSummary,
  TeamProgramme,
} from '../../../shared/api/programmes';

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
