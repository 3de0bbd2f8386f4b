import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { TrackProfileId } from '../../../../shared/tracks/profiles';
import type {
  ApprovalDetail,
  ApprovalSummary,
  CommentThread,
  CompareAnswer,
  Configuration,
  ConfigurationRevision,
  GatesAnswer,
  LatestPreviewAnswer,
  ResultsAnswer,
  ReviewAction,
  ReviewComment,
  TransitionRow,
} from '../../../../shared/api/configurations';
import type { DesignRevisionRecord, VehicleRevisionRecord } from '../../../../shared/api/documents';
import { SHOW_ERRORS_INLINE } from '../../core/http/api-error';
import type { DisplayUnits } from '../../core/api-types';
import type { AxleName } from '../../../../shared/schema/axle';

/** The response types are the server's own (shared/api): docs/api.md, "Configurations and review". */
export type {
  ApprovalDetail,
  ApprovalSummary,
  CommentThread,
  CompareAnswer,
  Configuration,
  ConfigurationRefs,
  ConfigurationResults,
  ConfigurationRevision,
  ConfigurationStatus,
  CriticalCaution,
  GatesAnswer,
  LatestPreviewAnswer,
  ResultsAnswer,
  ReviewAction,
  ReviewComment,
  TransitionRow,
} from '../../../../shared/api/configurations';
export type { Difference } from '../../../../shared/api/common';
export type { DesignRevisionRecord, VehicleRevisionRecord } from '../../../../shared/api/documents';

export interface NewConfiguration {
  readonly name: string;
  readonly vehicleId: string;
  readonly vehicleRevision?: number;
  readonly frontDesignId: string;
  readonly frontDesignRevision?: number;
  readonly rearDesignId: string;
  readonly rearDesignRevision?: number;
  readonly trackProfile: TrackProfileId;
  readonly message?: string;
}

export interface ConfigurationChange {
  readonly baseRevision: number;
  readonly name?: string;
  readonly vehicleId?: string;
  readonly vehicleRevision?: number;
  readonly frontDesignId?: string;
  readonly frontDesignRevision?: number;
  readonly rearDesignId?: string;
  readonly rearDesignRevision?: number;
  readonly trackProfile?: TrackProfileId;
  readonly message?: string;
}

/** A stored revision of a vehicle or axle design (only the fields these screens read). */

/** What a reviewer sends with a step: reasons for Critical cautions (sign-off) or rig waivers (validated). */
export interface GateBody {
  readonly acknowledgements?: readonly { readonly axle: AxleName; readonly code: string; readonly reason: string }[];
  readonly waivers?: readonly { readonly axle: AxleName; readonly reason: string }[];
}

const inline = () => ({ context: new HttpContext().set(SHOW_ERRORS_INLINE, true) });
const e = encodeURIComponent;

/** The configurations and review API (docs/api.md, "Configurations and review"). */
@Injectable({ providedIn: 'root' })
export class ConfigurationsApi {
  private readonly http = inject(HttpClient);

  private base(teamId: string, id?: string): string {
    return `/api/teams/${e(teamId)}/configurations${id === undefined ? '' : `/${e(id)}`}`;
  }

  list(teamId: string, archived = false): Observable<Configuration[]> {
    return this.http.get<Configuration[]>(this.base(teamId), { ...inline(), params: archived ? { archived: 'true' } : {} });
  }

  get(teamId: string, id: string): Observable<Configuration> {
    return this.http.get<Configuration>(this.base(teamId, id), inline());
  }

  create(teamId: string, body: NewConfiguration): Observable<Configuration> {
    return this.http.post<Configuration>(this.base(teamId), body, inline());
  }

  revise(teamId: string, id: string, change: ConfigurationChange): Observable<Configuration> {
    return this.http.put<Configuration>(this.base(teamId, id), change, inline());
  }

  setArchived(teamId: string, id: string, archived: boolean): Observable<Configuration> {
    return this.http.patch<Configuration>(this.base(teamId, id), { archived }, inline());
  }

  revisions(teamId: string, id: string): Observable<ConfigurationRevision[]> {
    return this.http.get<ConfigurationRevision[]>(`${this.base(teamId, id)}/revisions`, inline());
  }

  history(teamId: string, id: string): Observable<TransitionRow[]> {
    return this.http.get<TransitionRow[]>(`${this.base(teamId, id)}/history`, inline());
  }

  results(teamId: string, id: string, revision?: number): Observable<ResultsAnswer> {
    return this.http.get<ResultsAnswer>(`${this.base(teamId, id)}/results`, { ...inline(), params: revision ? { revision } : {} });
  }

  /** A review step; `revision` is the one the caller looked at (a newer one is 409 stale_revision). */
  act(teamId: string, id: string, action: ReviewAction, revision: number, message?: string, gate: GateBody = {}): Observable<Configuration> {
    return this.http.post<Configuration>(`${this.base(teamId, id)}/${action}`, { revision, ...(message ? { message } : {}), ...gate }, inline());
  }

  /** What the sign-off and validated gates ask for on a revision (default the current one). */
  gates(teamId: string, id: string): Observable<GatesAnswer> {
    return this.http.get<GatesAnswer>(`${this.base(teamId, id)}/gates`, inline());
  }

  /** What re-pointing at the latest vehicle and design revisions would change; nothing is saved. */
  latestPreview(teamId: string, id: string): Observable<LatestPreviewAnswer> {
    return this.http.get<LatestPreviewAnswer>(`${this.base(teamId, id)}/latest-preview`, inline());
  }

  /** Addresses of the review record's printable page and its PDF (same origin; the session cookie goes with them). */
  /** The record document or its PDF, its figures in the given unit system (the fingerprint is of the SI values either way). */
  recordUrl(teamId: string, id: string, kind: 'html' | 'pdf', units: DisplayUnits): string {
    return `${this.base(teamId, id)}/record.${kind}?units=${units}`;
  }

  approvals(teamId: string, id: string): Observable<ApprovalSummary[]> {
    return this.http.get<ApprovalSummary[]>(`${this.base(teamId, id)}/approvals`, inline());
  }

  approval(teamId: string, id: string, approvalId: string): Observable<ApprovalDetail> {
    return this.http.get<ApprovalDetail>(`${this.base(teamId, id)}/approvals/${e(approvalId)}`, inline());
  }

  compare(teamId: string, a: { id: string; revision?: number }, b: { id: string; revision?: number }): Observable<CompareAnswer> {
    const params: Record<string, string | number> = { a: a.id, b: b.id };
    if (a.revision) params['aRevision'] = a.revision;
    if (b.revision) params['bRevision'] = b.revision;
    return this.http.get<CompareAnswer>(`${this.base(teamId)}/compare`, { ...inline(), params });
  }

  comments(teamId: string, id: string): Observable<CommentThread[]> {
    return this.http.get<CommentThread[]>(`${this.base(teamId, id)}/comments`, inline());
  }

  addComment(teamId: string, id: string, body: { body: string; resultRef?: string; parentId?: string }): Observable<ReviewComment> {
    return this.http.post<ReviewComment>(`${this.base(teamId, id)}/comments`, body, inline());
  }

  setResolved(teamId: string, id: string, commentId: string, resolved: boolean): Observable<unknown> {
    return this.http.post(`${this.base(teamId, id)}/comments/${e(commentId)}/${resolved ? 'resolve' : 'reopen'}`, {}, inline());
  }

  vehicleRevision(teamId: string, vehicleId: string, revision: number): Observable<VehicleRevisionRecord> {
    return this.http.get<VehicleRevisionRecord>(`/api/teams/${e(teamId)}/vehicles/${e(vehicleId)}/revisions/${revision}`, inline());
  }

  designRevision(teamId: string, designId: string, revision: number): Observable<DesignRevisionRecord> {
    return this.http.get<DesignRevisionRecord>(`/api/teams/${e(teamId)}/axle-designs/${e(designId)}/revisions/${revision}`, inline());
  }
}
