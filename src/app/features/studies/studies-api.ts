import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { StudyRequest, StudyResult, StudyTarget } from '../../../../shared/study/index';
import { SHOW_ERRORS_INLINE } from '../../core/http/api-error';

export type StudyStatus = 'queued' | 'running' | 'completed' | 'failed' | 'cancelled';

/** `StudyView` of docs/api.md ("Studies"). */
export interface StudyView {
  readonly id: string;
  readonly kind: 'tolerance' | 'sweep';
  readonly label: string | null;
  readonly status: StudyStatus;
  readonly progress: { readonly doneChunks: number; readonly totalChunks: number; readonly doneSamples: number; readonly totalSamples: number };
  readonly etaSeconds: number | null;
  readonly error: { readonly code: string; readonly message: string } | null;
  readonly target: StudyTarget;
  readonly createdAt: string;
  readonly createdBy: { readonly id: string; readonly displayName: string } | null;
  readonly result?: StudyResult;
}

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

  csv(teamId: string, id: string): Observable<string> {
    return this.http.get(`${this.base(teamId, id)}/csv`, { ...inline(), responseType: 'text' });
  }

  openVariant(teamId: string, id: string, index: number): Observable<{ proposal: { id: string } }> {
    return this.http.post<{ proposal: { id: string } }>(`${this.base(teamId, id)}/variants/${index}/proposal`, {}, inline());
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
