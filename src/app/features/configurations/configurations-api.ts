import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { BalanceResponse } from '../../../../shared/balance/api';
import type { ToeFit } from '../../../../shared/kinematics/fit';
import type { Corner } from '../../../../shared/schema/corner';
import type { TrackProfileId } from '../../../../shared/intent/profiles';
import { SHOW_ERRORS_INLINE } from '../../core/http/api-error';

/** `status` of a configuration (docs/workflow.md). */
export type ConfigurationStatus = 'draft' | 'in_review' | 'approved' | 'changes_requested' | 'released' | 'validated';

/** The review steps of the server's state machine (POST …/configurations/:id/<action>). */
export type ReviewAction = 'submit' | 'withdraw' | 'approve' | 'request-changes' | 'release' | 'validate';

/** `Configuration` of docs/api.md. */
export interface Configuration {
  readonly id: string;
  readonly name: string;
  readonly status: ConfigurationStatus;
  readonly revision: number;
  readonly archived: boolean;
  readonly vehicle: { readonly id: string; readonly name: string; readonly revision: number };
  readonly front: { readonly designId: string; readonly name: string; readonly revision: number };
  readonly rear: { readonly designId: string; readonly name: string; readonly revision: number };
  readonly trackProfile: TrackProfileId;
  readonly updatedAt: string;
  readonly updatedByName: string | null;
  readonly createdAt: string;
}

export interface ConfigurationRefs {
  readonly vehicleId: string;
  readonly vehicleRevision: number;
  readonly frontDesignId: string;
  readonly frontDesignRevision: number;
  readonly rearDesignId: string;
  readonly rearDesignRevision: number;
  readonly trackProfile: TrackProfileId;
}

export interface ConfigurationRevision extends ConfigurationRefs {
  readonly revision: number;
  readonly name: string;
  readonly message: string | null;
  readonly authorName: string | null;
  readonly createdAt: string;
}

export interface TransitionRow {
  readonly revision: number;
  readonly fromStatus: ConfigurationStatus;
  readonly toStatus: ConfigurationStatus;
  readonly message: string | null;
  readonly actorName: string | null;
  readonly createdAt: string;
}

/** What the engines compute for a configuration (the balance with both corners linked; each corner's fit over the profile's travel). */
export interface ConfigurationResults {
  readonly balance: BalanceResponse;
  readonly bumpSteer: { readonly front: ToeFit; readonly rear: ToeFit; readonly travelMm: readonly [number, number] };
}

export interface ResultsAnswer {
  readonly revision: number;
  readonly refs: ConfigurationRefs;
  readonly engineVersion: string;
  readonly results: ConfigurationResults;
}

/** `Difference` of docs/api.md: a changed value at a dotted path; `change` = b − a for numbers. */
export interface Difference {
  readonly path: string;
  readonly a: unknown;
  readonly b: unknown;
  readonly change?: number;
}

export interface ApprovalSummary {
  readonly id: string;
  readonly revision: number;
  readonly engineVersion: string;
  readonly message: string | null;
  readonly approvedByName: string | null;
  readonly approvedAt: string;
}

export interface ApprovalDetail extends ApprovalSummary {
  readonly inputs: { readonly refs: ConfigurationRefs; readonly vehicle: unknown; readonly frontCorner: Corner; readonly rearCorner: Corner; readonly trackProfile: TrackProfileId };
  readonly results: ConfigurationResults;
  readonly recompute:
    | { readonly engineVersion: string; readonly differences: readonly Difference[] }
    | { readonly engineVersion: string; readonly error: { readonly code: string; readonly message: string } };
}

export interface CompareAnswer {
  readonly engineVersion: string;
  readonly a: { readonly configurationId: string; readonly revision: number; readonly refs: ConfigurationRefs };
  readonly b: { readonly configurationId: string; readonly revision: number; readonly refs: ConfigurationRefs };
  readonly inputs: readonly Difference[];
  readonly results: readonly Difference[];
}

export interface ReviewComment {
  readonly id: string;
  readonly revision: number;
  readonly parentId: string | null;
  readonly resultRef: string | null;
  readonly body: string;
  readonly authorName: string | null;
  readonly createdAt: string;
  readonly resolvedAt: string | null;
}

export interface CommentThread extends ReviewComment {
  readonly resolved: boolean;
  readonly replies: readonly ReviewComment[];
}

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
export interface VehicleRevisionRecord {
  readonly revision: number;
  readonly name: string;
  readonly data: unknown;
}
export interface DesignRevisionRecord {
  readonly revision: number;
  readonly name: string;
  readonly corner: Corner;
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
  act(teamId: string, id: string, action: ReviewAction, revision: number, message?: string): Observable<Configuration> {
    return this.http.post<Configuration>(`${this.base(teamId, id)}/${action}`, { revision, ...(message ? { message } : {}) }, inline());
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
