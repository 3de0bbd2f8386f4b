import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { StudyRequest } from '../../../../shared/study/index';
import type { AttachedStudy, ProgrammeStudies, StudyStatus, StudyView } from '../../../../shared/api/studies';
import { SHOW_ERRORS_INLINE } from '../../core/http/api-error';
import type { DisplayUnits } from '../../core/api-types';

// The answers' types are the server's (shared/api/studies.ts).
export type { AttachedStudy, ProgrammeStudies, StudyStatus, StudyView } from '../../../../shared/api/studies';

const inline = () => ({ context: new HttpContext().set(SHOW_ERRORS_INLINE, true) });
const e = encodeURIComponent;

/** The studies API (docs/api.md, "Studies"): start, list, watch, cancel, export, open a sweep variant as a proposal. */
@Injectable({ providedIn: 'root' })
export class StudiesApi {
  private readonly http = inject(HttpClient);

  private base(teamId: string, id?: string): string {
    return `/api/teams/${e(teamId)}/studies${id === undefined ? '' : `/${e(id)}`}`;
  }

  list(teamId: string): Observable<{ studies: StudyView[] }> {
    return this.http.get<{ studies: StudyView[] }>(this.base(teamId), inline());
  }

  get(teamId: string, id: string): Observable<{ study: StudyView }> {
    return this.http.get<{ study: StudyView }>(this.base(teamId, id), inline());
  }

  start(teamId: string, body: StudyRequest): Observable<{ study: StudyView }> {
    return this.http.post<{ study: StudyView }>(this.base(teamId), body, inline());
  }

  cancel(teamId: string, id: string): Observable<{ study: StudyView }> {
    return this.http.delete<{ study: StudyView }>(this.base(teamId, id), inline());
  }

  /** The result as CSV in `units` (the user's display choice: figures converted, every numeric column naming its unit). */
  csv(teamId: string, id: string, units: DisplayUnits): Observable<string> {
    return this.http.get(`${this.base(teamId, id)}/csv`, { ...inline(), params: { units }, responseType: 'text' });
  }

  openVariant(teamId: string, id: string, index: number): Observable<{ proposal: { id: string } }> {
    return this.http.post<{ proposal: { id: string } }>(`${this.base(teamId, id)}/variants/${index}/proposal`, {}, inline());
  }

  attach(teamId: string, id: string, configurationId: string, note: string): Observable<{ attachment: AttachedStudy }> {
    return this.http.put<{ attachment: AttachedStudy }>(`${this.base(teamId, id)}/attachments/${e(configurationId)}`, { note }, inline());
  }

  detach(teamId: string, id: string, configurationId: string): Observable<void> {
    return this.http.delete<void>(`${this.base(teamId, id)}/attachments/${e(configurationId)}`, inline());
  }

  attachedTo(teamId: string, configurationId: string): Observable<{ attachments: AttachedStudy[] }> {
    return this.http.get<{ attachments: AttachedStudy[] }>(this.base(teamId), { ...inline(), params: { attachedTo: configurationId } });
  }

  programmeStudies(programmeId: string): Observable<ProgrammeStudies> {
    return this.http.get<ProgrammeStudies>(`/api/programmes/${e(programmeId)}/studies`, inline());
  }
}

/** Words for a study's status. */
export const STATUS_WORDS: Readonly<Record<StudyStatus, string>> = {
  queued: 'Waiting for a worker',
  running: 'Running',
  completed: 'Completed',
  failed: 'Failed',
  cancelled: 'Cancelled',
};

/** "about 2 min 10 s left" from seconds. */
export function etaWords(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds)) return 'estimating the time left';
  const s = Math.max(0, Math.round(seconds));
  if (s < 60) return `about ${s} s left`;
  const m = Math.floor(s / 60);
  return `about ${m} min ${s % 60} s left`;

}
