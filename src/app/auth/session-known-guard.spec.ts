import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { ActivatedRouteSnapshot, RouterStateSnapshot } from '@angular/router';
import { firstValueFrom, isObservable, Observable, of } from 'rxjs';
import { SESSION_HINT_STORAGE_KEY, AuthService } from '../core/auth/auth-service';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { sessionKnownGuard } from './session-known-guard';

function run(): Promise<unknown> {
  const result = TestBed.runInInjectionContext(() =>
    sessionKnownGuard({} as ActivatedRouteSnapshot, { url: '/reset-password/x' } as RouterStateSnapshot),
  );
  return firstValueFrom((isObservable(result) ? result : of(result)) as Observable<unknown>);
}

describe('sessionKnownGuard', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(() => {
    localStorage.clear();
    notifier = fakeNotifier();
    TestBed.configureTestingModule({ providers: shellTestProviders(notifier) });
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  it('learns who is signed in before the page opens', async () => {
    localStorage.setItem(SESSION_HINT_STORAGE_KEY, '1');
    const verdict = run();
    backend.expectOne('/api/auth/me').flush({
      user: { id: 'u-ana', email: 'owner@tallowmere.example', displayName: 'Ana Ferreira', displayUnits: 'si' },
      memberships: [],
    });
    expect(await verdict).toBe(true);
    expect(TestBed.inject(AuthService).user()?.displayName).toBe('Ana Ferreira');
  });

  it('lets a visitor whose session ended through, quietly', async () => {
    localStorage.setItem(SESSION_HINT_STORAGE_KEY, '1');
    const verdict = run();
    backend.expectOne('/api/auth/me').flush(
      { error: { code: 'unauthenticated', message: 'Sign in first.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    expect(await verdict).toBe(true);
    expect(TestBed.inject(AuthService).signedIn()).toBe(false);
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('does not ask the server in a browser that never signed in', async () => {
    expect(await run()).toBe(true);
    backend.expectNone('/api/auth/me');
  });
});
