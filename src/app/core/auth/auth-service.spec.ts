import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Me } from '../api-types';
import { AuthService, CURRENT_TEAM_STORAGE_KEY, SESSION_HINT_STORAGE_KEY } from './auth-service';

const ELI: Me = {
  user: { id: 'u-eli', email: 'engineer@tallowmere.example', displayName: 'Eli Marsh', displayUnits: 'si' },
  memberships: [
    { teamId: 't-brk', teamName: 'Brackenfield Road Programme', teamSlug: 'brackenfield', roles: ['engineer'] },
    { teamId: 't-tal', teamName: 'Tallowmere University Racing', teamSlug: 'tallowmere', roles: ['engineer'] },
  ],
};

describe('AuthService', () => {
  let backend: HttpTestingController;

  function setUp(): AuthService {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    return TestBed.inject(AuthService);
  }

  beforeEach(() => localStorage.clear());
  afterEach(() => backend.verify());

  it('knows a browser that never signed in is signed out, without asking the server', () => {
    const auth = setUp();
    let result: Me | null | undefined;
    auth.ensureLoaded().subscribe((me) => (result = me));
    backend.expectNone('/api/auth/me');
    expect(result).toBeNull();
    expect(auth.signedIn()).toBe(false);
  });

  it('asks the server once when a session may exist, and forgets it on 401', () => {
    localStorage.setItem(SESSION_HINT_STORAGE_KEY, '1');
    const auth = setUp();
    const seen: (Me | null)[] = [];
    auth.ensureLoaded().subscribe((me) => seen.push(me));
    auth.ensureLoaded().subscribe((me) => seen.push(me));
    backend.expectOne('/api/auth/me').flush(
      { error: { code: 'unauthenticated', message: 'Sign in first.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    expect(seen).toEqual([null, null]);
    expect(localStorage.getItem(SESSION_HINT_STORAGE_KEY)).toBeNull();
  });

  it('signs in, picks the first team, and remembers a switched team', () => {
    const auth = setUp();
    auth.signIn('engineer@tallowmere.example', 'demo-pass-2026').subscribe();
    backend.expectOne('/api/auth/sign-in').flush(ELI);
    expect(auth.user()?.displayName).toBe('Eli Marsh');
    expect(auth.currentTeam()?.teamId).toBe('t-brk');
    expect(localStorage.getItem(SESSION_HINT_STORAGE_KEY)).toBe('1');

    auth.switchTeam('t-tal');
    expect(auth.currentTeam()?.teamName).toBe('Tallowmere University Racing');
    expect(localStorage.getItem(CURRENT_TEAM_STORAGE_KEY)).toBe('t-tal');
  });

  it('falls back to the first team when the remembered one is no longer a membership', () => {
    localStorage.setItem(CURRENT_TEAM_STORAGE_KEY, 't-gone');
    const auth = setUp();
    auth.signIn('engineer@tallowmere.example', 'demo-pass-2026').subscribe();
    backend.expectOne('/api/auth/sign-in').flush(ELI);
    expect(auth.currentTeam()?.teamId).toBe('t-brk');
  });

  it('signs out and drops the session hint', () => {
    const auth = setUp();
    auth.signIn('engineer@tallowmere.example', 'demo-pass-2026').subscribe();
    backend.expectOne('/api/auth/sign-in').flush(ELI);
    auth.signOut().subscribe();
    backend.expectOne('/api/auth/sign-out').flush(null, { status: 204, statusText: 'No Content' });
    expect(auth.signedIn()).toBe(false);
    expect(localStorage.getItem(SESSION_HINT_STORAGE_KEY)).toBeNull();
  });
});
