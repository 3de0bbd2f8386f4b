import { HttpClient, HttpParams } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { ActivityEntry } from '../../../shared/api/teams';

// The answers' type is the server's (shared/api/teams.ts).
export type { ActivityEntry } from '../../../shared/api/teams';

/** Entries per request (the API allows 1–5000). */
export const ACTIVITY_PAGE_SIZE = 100;

function path(teamId: string, designId?: string | null): string {
  const team = `/api/teams/${encodeURIComponent(teamId)}`;
  return designId ? `${team}/axle-designs/${encodeURIComponent(designId)}/activity` : `${team}/activity`;
}

/** A team's (or one axle design's) activity log. */
@Injectable({ providedIn: 'root' })
export class ActivityApi {
  private readonly http = inject(HttpClient);

  /** Newest first; `after` (the last entry shown) pages to the entries older than it. */
  list(teamId: string, designId: string | null, after?: ActivityEntry): Observable<ActivityEntry[]> {
    let params = new HttpParams().set('limit', ACTIVITY_PAGE_SIZE);
    if (after) params = params.set('before', after.at).set('beforeId', after.id);
    return this.http.get<ActivityEntry[]>(path(teamId, designId), { params });
  }

  /** The CSV download address, with a local-time column in `timeZone`. */
  csvUrl(teamId: string, designId: string | null, timeZone: string): string {
    return `${path(teamId, designId)}?${new HttpParams().set('format', 'csv').set('timeZone', timeZone).toString()}`;
  }
}
