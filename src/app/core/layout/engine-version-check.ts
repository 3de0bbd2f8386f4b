import { HttpClient, HttpContext, HttpErrorResponse } from '@angular/common/http';
import { computed, inject, Injectable, signal } from '@angular/core';
import { ENGINE_VERSION } from '../../../../shared/version';
import { SHOW_ERRORS_INLINE } from '../http/api-error';

interface HealthBody {
  readonly engineVersion?: unknown;
}

/**
 * The engineering core runs in the browser and on the server; results only
 * agree when both are the same version. The server's version comes from
 * `GET /api/health` at start and from every compute response (`report`).
 */
@Injectable({ providedIn: 'root' })
export class EngineVersionCheck {
  private readonly http = inject(HttpClient);
  private readonly serverVersion = signal<string | null>(null);

  readonly browserVersion = ENGINE_VERSION;
  readonly server = this.serverVersion.asReadonly();
  /** True once the server has said it runs another engine version than this page. */
  readonly mismatch = computed(() => {
    const server = this.serverVersion();
    return server !== null && server !== ENGINE_VERSION;
  });

  /** Record the `engineVersion` a server response carried. */
  report(serverEngineVersion: string): void {
    this.serverVersion.set(serverEngineVersion);
  }

  /** Asks `GET /api/health`; a degraded (503) answer still names the version. */
  check(): void {
    const context = new HttpContext().set(SHOW_ERRORS_INLINE, true);
    this.http.get<HealthBody>('/api/health', { context }).subscribe({
      next: (body) => this.take(body),
      error: (error: unknown) => {
        if (error instanceof HttpErrorResponse) this.take(error.error as HealthBody | null);
      },
    });
  }

  private take(body: HealthBody | null): void {
    if (typeof body?.engineVersion === 'string') this.report(body.engineVersion);
  }
}
