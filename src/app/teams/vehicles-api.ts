import { HttpClient, HttpParams } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import { VehicleSummary } from '../core/api-types';

function vehiclesPath(teamId: string): string {
  return `/api/teams/${encodeURIComponent(teamId)}/vehicles`;
}

/** A team's vehicle list and the create / rename / archive commands. */
@Injectable({ providedIn: 'root' })
export class VehiclesApi {
  private readonly http = inject(HttpClient);

  list(teamId: string, includeArchived: boolean): Observable<VehicleSummary[]> {
    const params = includeArchived ? new HttpParams().set('archived', 'true') : new HttpParams();
    return this.http.get<VehicleSummary[]>(vehiclesPath(teamId), { params });
  }

  create(teamId: string, name: string): Observable<VehicleSummary> {
    return this.http.post<VehicleSummary>(vehiclesPath(teamId), { name });
  }

  /** Rename or (un)archive; a stale `baseRevision` is refused with 409. */
  update(
    teamId: string,
    vehicle: Pick<VehicleSummary, 'id' | 'revision'>,
    change: { name?: string; archived?: boolean },
  ): Observable<VehicleSummary> {
    return this.http.patch<VehicleSummary>(
      `${vehiclesPath(teamId)}/${encodeURIComponent(vehicle.id)}`,
      { ...change, baseRevision: vehicle.revision },
    );
  }
}
