import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import type { Corner } from '../../../../shared/schema/corner';
import type { CadFrame } from '../../../../shared/io/cad-frame';
import type { ImportPreview } from '../../../../shared/api/documents';
import { SHOW_ERRORS_INLINE } from '../../core/http/api-error';

// The answer's type is the server's (shared/api/documents.ts).
export type { ImportPreview } from '../../../../shared/api/documents';

/**
 * Uploads a hardpoint file to the server, which reads it with the shared
 * parser, maps it from the CAD frame and checks the merged corner. The
 * interceptor adds the CSRF header; the browser sets the multipart boundary.
 */
@Injectable({ providedIn: 'root' })
export class HardpointImportApi {
  private readonly http = inject(HttpClient);

  preview(teamId: string, designId: string, file: Blob, fileName: string, frame: CadFrame, workingCorner: Corner): Observable<ImportPreview> {
    const form = new FormData();
    form.append('frame', JSON.stringify(frame));
    form.append('corner', JSON.stringify(workingCorner));
    form.append('file', file, fileName);
    return this.http.post<ImportPreview>(
      `/api/teams/${encodeURIComponent(teamId)}/axle-designs/${encodeURIComponent(designId)}/import`,
      form,
      { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) },
    );
  }
}
