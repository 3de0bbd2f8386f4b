import { computed, inject, Injectable, Signal, signal } from '@angular/core';
import { Observable, of, shareReplay, tap } from 'rxjs';
import { Permission, TeamDetail } from '../api-types';
import { TeamsApi } from './teams-api';

/**
 * The team in the current URL (`/teams/:teamId/…`) with the caller's own
 * roles and permissions from `GET /api/teams/:teamId`. Screens read
 * `can('vehicle:manage')` (or `permission(...)` for a signal) to show only
 * the controls a user can use; the server still enforces every one.
 */
@Injectable({ providedIn: 'root' })
export class TeamAccess {
  private readonly api = inject(TeamsApi);
  private readonly current = signal<TeamDetail | null>(null);
  private pending: { teamId: string; detail$: Observable<TeamDetail> } | null = null;

  /** The loaded team, or null before the first team route. */
  readonly team = this.current.asReadonly();
  readonly permissions = computed<ReadonlySet<Permission>>(
    () => new Set(this.current()?.permissions ?? []),
  );

  /** True when the caller holds `permission` in the current team (reactive in templates). */
  can(permission: Permission): boolean {
    return this.permissions().has(permission);
  }

  /** A signal of one permission, for components that keep it as a field. */
  permission(permission: Permission): Signal<boolean> {
    return computed(() => this.permissions().has(permission));
  }

  /** Loads (once per team, unless `reload`) and makes it current. */
  load(teamId: string, reload = false): Observable<TeamDetail> {
    const loaded = this.current();
    if (!reload && loaded?.id === teamId) return of(loaded);
    if (!reload && this.pending?.teamId === teamId) return this.pending.detail$;
    const detail$ = this.api.get(teamId).pipe(
      tap({
        next: (detail) => this.current.set(detail),
        finalize: () => {
          if (this.pending?.detail$ === detail$) this.pending = null;
        },
      }),
      shareReplay(1),
    );
    this.pending = { teamId, detail$ };
    return detail$;
  }

  /** Forgets the loaded team (sign-out, or after one's own roles changed). */
  clear(): void {
    this.current.set(null);
    this.pending = null;
  }
}
