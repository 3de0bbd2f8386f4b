import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { Corner } from '../../../shared/schema/corner';
import type { AxleDesign, AxleDesignSummary, Proposal, VehicleRecord } from '../../../shared/api/documents';
import type { RevisionRow } from '../../../shared/api/common';
import { SHOW_ERRORS_INLINE } from '../core/http/api-error';

/** The response types are the server's own (shared/api): docs/api.md, "Vehicles" and "Axle designs". */
export type { AxleDesign, AxleDesignSummary, Proposal, VehicleRecord } from '../../../shared/api/documents';
export type { AxleName } from '../../../shared/schema/axle';
export type { RevisionRow } from '../../../shared/api/common';

/**
 * The author of a document's revision as its revision list names it; the record's last writer (`updatedByName`)
 * until the list is there. They differ when someone else accepted a proposal as that revision: headers say the former.
 */
export function revisionAuthor(doc: { readonly revision: number; readonly updatedByName: string | null } | null, revisions: readonly RevisionRow[]): string | null {
  if (!doc) return null;
  const row = revisions.find((r) => r.revision === doc.revision);
  return row ? row.authorName : doc.updatedByName;
}

const inline = () => ({ context: new HttpContext().set(SHOW_ERRORS_INLINE, true) });

function team(teamId: string): string {
  return `/api/teams/${encodeURIComponent(teamId)}`;
}

/** Vehicles and axle designs of a team (docs/api.md). */
@Injectable({ providedIn: 'root' })
export class FeaturesApi {
  private readonly http = inject(HttpClient);

  vehicle(teamId: string, vehicleId: string): Observable<VehicleRecord> {
    return this.http.get<VehicleRecord>(`${team(teamId)}/vehicles/${encodeURIComponent(vehicleId)}`, inline());
  }

  vehicleRevisions(teamId: string, vehicleId: string): Observable<RevisionRow[]> {
    return this.http.get<RevisionRow[]>(`${team(teamId)}/vehicles/${encodeURIComponent(vehicleId)}/revisions`, inline());
  }

  saveVehicleData(teamId: string, vehicleId: string, data: unknown, baseRevision: number, message?: string): Observable<VehicleRecord> {
    return this.http.put<VehicleRecord>(
      `${team(teamId)}/vehicles/${encodeURIComponent(vehicleId)}/data`,
      { data, baseRevision, ...(message ? { message } : {}) },
      inline(),
    );
  }

  axleDesigns(teamId: string, vehicleId: string): Observable<AxleDesignSummary[]> {
    return this.http.get<AxleDesignSummary[]>(`${team(teamId)}/vehicles/${encodeURIComponent(vehicleId)}/axle-designs`, inline());
  }

  axleDesign(teamId: string, designId: string): Observable<AxleDesign> {
    return this.http.get<AxleDesign>(`${team(teamId)}/axle-designs/${encodeURIComponent(designId)}`, inline());
  }

  axleDesignRevisions(teamId: string, designId: string): Observable<RevisionRow[]> {
    return this.http.get<RevisionRow[]>(`${team(teamId)}/axle-designs/${encodeURIComponent(designId)}/revisions`, inline());
  }

  proposals(teamId: string, designId: string): Observable<Proposal[]> {
    return this.http.get<Proposal[]>(`${team(teamId)}/axle-designs/${encodeURIComponent(designId)}/proposals`, inline());
  }

  proposal(teamId: string, designId: string, proposalId: string): Observable<Proposal> {
    return this.http.get<Proposal>(
      `${team(teamId)}/axle-designs/${encodeURIComponent(designId)}/proposals/${encodeURIComponent(proposalId)}`,
      inline(),
    );
  }

  propose(teamId: string, designId: string, body: { corner: Corner; baseRevision: number; message?: string; origin?: Record<string, unknown> }): Observable<Proposal> {
    return this.http.post<Proposal>(`${team(teamId)}/axle-designs/${encodeURIComponent(designId)}/proposals`, body, inline());
  }

  decideProposal(teamId: string, designId: string, proposalId: string, decision: 'accept' | 'reject', message?: string): Observable<unknown> {
    return this.http.post(
      `${team(teamId)}/axle-designs/${encodeURIComponent(designId)}/proposals/${encodeURIComponent(proposalId)}/${decision}`,
      message ? { message } : {},
      inline(),
    );
  }

  /** `POST /api/compute/balance`: the balance model on the server (request of shared/balance/api.ts). */
  balance<T>(request: unknown): Observable<{ engineVersion: string; result: T }> {
    return this.http.post<{ engineVersion: string; result: T }>('/api/compute/balance', request, inline());
  }

  saveCorner(teamId: string, designId: string, corner: Corner, baseRevision: number, message?: string): Observable<AxleDesign> {
    return this.http.put<AxleDesign>(
      `${team(teamId)}/axle-designs/${encodeURIComponent(designId)}/corner`,
      { corner, baseRevision, ...(message ? { message } : {}) },
      inline(),
    );
  }
}
