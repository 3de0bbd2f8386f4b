import { HttpClient, HttpContext, HttpErrorResponse } from '@angular/common/http';
import { computed, inject, Injectable, signal } from '@angular/core';
import { catchError, map, Observable, of, shareReplay, tap } from 'rxjs';
import { DisplayUnits, Me, Membership } from '../api-types';
import { SHOW_ERRORS_INLINE } from '../http/api-error';

/** localStorage key of the team the user last worked in. */
export const CURRENT_TEAM_STORAGE_KEY = 'rollwise.currentTeamId';

/**
 * localStorage key set while this browser holds a session. Without it the
 * app does not ask `GET /api/auth/me` (whose 401 the browser would log as a
 * console error on every visit to the sign-in page). The cookie itself is
 * httpOnly, so this is only a hint: the server still decides.
 */
export const SESSION_HINT_STORAGE_KEY = 'rollwise.session';

function inlineErrors(): { context: HttpContext } {
  return { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };
}

function readStored(key: string): string | null {
  try {
    return globalThis.localStorage?.getItem(key) ?? null;
  } catch {
    return null; // storage disabled: nothing is remembered
  }
}

function store(key: string, value: string | null): void {
  try {
    if (value === null) globalThis.localStorage?.removeItem(key);
    else globalThis.localStorage?.setItem(key, value);
  } catch {
    // storage disabled or full: the value lasts for this page only
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
  private readonly selectedTeamId = signal<string | null>(readStored(CURRENT_TEAM_STORAGE_KEY));
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
   * Guards wait on this before deciding. A browser that never signed in
   * (no session hint) is known to be signed out without asking.
   */
  ensureLoaded(): Observable<Me | null> {
    this.initial$ ??= readStored(SESSION_HINT_STORAGE_KEY)
      ? this.refresh().pipe(shareReplay(1))
      : of(null);
    return this.initial$;
  }

  /** Re-reads `GET /api/auth/me`; resolves to null when the session has ended. */
  refresh(): Observable<Me | null> {
    return this.http.get<Me>('/api/auth/me', inlineErrors()).pipe(
      catchError((error: unknown) => {
        if (error instanceof HttpErrorResponse && error.status === 401) return of(null);
        throw error;
      }),
      tap((me) => {
        this.state.set(me);
        store(SESSION_HINT_STORAGE_KEY, me ? '1' : null);
      }),
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
    store(CURRENT_TEAM_STORAGE_KEY, teamId);
  }

  isMemberOf(teamId: string): boolean {
    return this.memberships().some((m) => m.teamId === teamId);
  }

  /** Called when the server reports the session has ended (401). */
  forget(): void {
    this.state.set(null);
    this.initial$ = of(null);
    store(SESSION_HINT_STORAGE_KEY, null);
  }

  private adopt(me: Me): void {
    this.state.set(me);
    this.initial$ = of(me);
    store(SESSION_HINT_STORAGE_KEY, '1');
  }
}
