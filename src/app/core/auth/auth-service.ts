import { HttpClient, HttpContext, HttpErrorResponse } from '@angular/common/http';
import { computed, inject, Injectable, signal } from '@angular/core';
import { catchError, map, Observable, of, shareReplay, tap } from 'rxjs';
import { DisplayUnits, Me, Membership } from '../api-types';
import { SHOW_ERRORS_INLINE } from '../http/api-error';

/** localStorage key of the team the user last worked in. */
export const CURRENT_TEAM_STORAGE_KEY = 'rollwise.currentTeamId';

function inlineErrors(): { context: HttpContext } {
  return { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };
}

function readStoredTeam(): string | null {
  try {
    return globalThis.localStorage?.getItem(CURRENT_TEAM_STORAGE_KEY) ?? null;
  } catch {
    return null; // storage disabled: the choice just is not remembered
  }
}

function storeTeam(teamId: string): void {
  try {
    globalThis.localStorage?.setItem(CURRENT_TEAM_STORAGE_KEY, teamId);
  } catch {
    // storage disabled or full: keep the choice for this page only
  }
}

/**
 * Who is signed in, their team memberships and the team they are working in.
 * State lives in signals; requests are HttpClient observables.
 */
@Injectable({ providedIn: 'root' })
export class AuthService {
  private readonly http = inject(HttpClient);
  private readonly state = signal<Me | null>(null);
  private readonly selectedTeamId = signal<string | null>(readStoredTeam());
  private initial$: Observable<Me | null> | null = null;

  /** The whole `Me` document, or null when signed out. */
  readonly me = this.state.asReadonly();
  readonly user = computed(() => this.state()?.user ?? null);
  readonly memberships = computed<readonly Membership[]>(() => this.state()?.memberships ?? []);
  readonly signedIn = computed(() => this.state() !== null);
  readonly displayUnits = computed<DisplayUnits>(() => this.state()?.user.displayUnits ?? 'si');

  /** The team being worked in: the last one chosen if still a member, else the first. */
  readonly currentTeam = computed<Membership | null>(() => {
    const memberships = this.memberships();
    const chosen = this.selectedTeamId();
    return memberships.find((m) => m.teamId === chosen) ?? memberships[0] ?? null;
  });

  /**
   * Asks the server once per page load who is signed in (401 means nobody).
   * Guards wait on this before deciding.
   */
  ensureLoaded(): Observable<Me | null> {
    this.initial$ ??= this.refresh().pipe(shareReplay(1));
    return this.initial$;
  }

  /** Re-reads `GET /api/auth/me`; resolves to null when the session has ended. */
  refresh(): Observable<Me | null> {
    return this.http.get<Me>('/api/auth/me', inlineErrors()).pipe(
      catchError((error: unknown) => {
        if (error instanceof HttpErrorResponse && error.status === 401) return of(null);
        throw error;
      }),
      tap((me) => this.state.set(me)),
    );
  }

  /** Errors (401 invalid_credentials, 429 rate_limited) are left to the form. */
  signIn(email: string, password: string): Observable<Me> {
    return this.http
      .post<Me>('/api/auth/sign-in', { email, password }, inlineErrors())
      .pipe(tap((me) => this.adopt(me)));
  }

  /** Errors (409 email_taken, 400 field issues) are left to the form. */
  register(email: string, password: string, displayName: string): Observable<Me> {
    return this.http
      .post<Me>('/api/auth/register', { email, password, displayName }, inlineErrors())
      .pipe(tap((me) => this.adopt(me)));
  }

  signOut(): Observable<void> {
    return this.http.post<void>('/api/auth/sign-out', {}).pipe(tap(() => this.forget()));
  }

  updateProfile(patch: { displayName?: string; displayUnits?: DisplayUnits }): Observable<Me> {
    return this.http
      .patch<Me>('/api/auth/me', patch, inlineErrors())
      .pipe(tap((me) => this.state.set(me)));
  }

  /** Ends the user's other sessions; this one stays signed in. */
  changePassword(currentPassword: string, newPassword: string): Observable<void> {
    return this.http
      .post<void>('/api/auth/change-password', { currentPassword, newPassword }, inlineErrors())
      .pipe(map(() => undefined));
  }

  /** Makes `teamId` the current team and remembers it for the next visit. */
  switchTeam(teamId: string): void {
    this.selectedTeamId.set(teamId);
    storeTeam(teamId);
  }

  isMemberOf(teamId: string): boolean {
    return this.memberships().some((m) => m.teamId === teamId);
  }

  /** Called when the server reports the session has ended (401). */
  forget(): void {
    this.state.set(null);
    this.initial$ = of(null);
  }

  private adopt(me: Me): void {
    this.state.set(me);
    this.initial$ = of(me);
  }
}
