import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { RigMapping } from '../../../../shared/io/rig-measurement';
import type { RigBasis, RigTolerance } from '../../../../shared/rig/compare';
import type { CreatedRigMeasurement, RigMeasurementDetail, RigMeasurementSummary, RigPreviewAnswer, RigToleranceView } from '../../../../shared/api/rig';
import { SHOW_ERRORS_INLINE } from '../../core/http/api-error';
import type { AxleName } from '../../../../shared/schema/axle';

/** What a measurement is compared with (docs/rig-measurements.md). */
export type RigTarget =
  | { readonly kind: 'configuration'; readonly configurationId: string; readonly configurationRevision?: number; readonly axle: AxleName }
  | { readonly kind: 'baseline'; readonly designId: string; readonly designRevision?: number };

export interface RigOptions {
  readonly name?: string;
  readonly note?: string;
  readonly side: 'left' | 'right';
  readonly rackMm: number;
  readonly basis: RigBasis;
}

// The answers' types are the server's (shared/api/rig.ts).
export type { RigMeasurementDetail, RigMeasurementSummary, RigPreviewAnswer, RigToleranceView } from '../../../../shared/api/rig';

const inline = () => ({ context: new HttpContext().set(SHOW_ERRORS_INLINE, true) });

/** The rig measurement routes; errors are shown by the panel itself (bad lines, refusals). */
@Injectable({ providedIn: 'root' })
export class RigApi {
  private readonly http = inject(HttpClient);

  private base(teamId: string): string {
    return `/api/teams/${encodeURIComponent(teamId)}`;
  }

  preview(teamId: string, file: Blob, fileName: string): Observable<RigPreviewAnswer> {
    const form = new FormData();
    form.append('file', file, fileName);
    return this.http.post<RigPreviewAnswer>(`${this.base(teamId)}/rig-measurements/preview`, form, inline());
  }

  create(teamId: string, file: Blob, fileName: string, mapping: RigMapping, target: RigTarget, options: RigOptions): Observable<CreatedRigMeasurement> {
    const form = new FormData();
    form.append('mapping', JSON.stringify(mapping));
    form.append('target', JSON.stringify(target));
    form.append('options', JSON.stringify(options));
    form.append('file', file, fileName);
    return this.http.post<CreatedRigMeasurement>(`${this.base(teamId)}/rig-measurements`, form, inline());
  }

  list(teamId: string, filter: { configurationId?: string; designId?: string }): Observable<RigMeasurementSummary[]> {
    const params: Record<string, string> = {};
    if (filter.configurationId) params['configurationId'] = filter.configurationId;
    else if (filter.designId) params['designId'] = filter.designId;
    return this.http.get<RigMeasurementSummary[]>(`${this.base(teamId)}/rig-measurements`, { params, ...inline() });
  }

  get(teamId: string, id: string): Observable<RigMeasurementDetail> {
    return this.http.get<RigMeasurementDetail>(`${this.base(teamId)}/rig-measurements/${encodeURIComponent(id)}`, inline());
  }

  remove(teamId: string, id: string): Observable<void> {
    return this.http.delete<void>(`${this.base(teamId)}/rig-measurements/${encodeURIComponent(id)}`, inline());
  }

  tolerance(teamId: string): Observable<RigToleranceView> {
    return this.http.get<RigToleranceView>(`${this.base(teamId)}/rig-tolerance`, inline());
  }

  setTolerance(teamId: string, t: RigTolerance): Observable<RigToleranceView> {
    return this.http.put<RigToleranceView>(`${this.base(teamId)}/rig-tolerance`, t, inline());
  }
}
