import { HttpClient, HttpContext } from '@angular/common/http';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../../testing/shell-testing';
import { Router } from '@angular/router';
import { AuthService } from '../auth/auth-service';
import { LoadingIndicator } from '../layout/loading-indicator';
import { SHOW_ERRORS_INLINE } from './api-error';
import { CSRF_HEADER } from './rollwise-interceptor';

describe('rollwiseInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(() => {
    notifier = fakeNotifier();
    TestBed.configureTestingModule({
      providers: shellTestProviders(notifier),
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  it('adds the CSRF header to state-changing requests only', () => {
    http.get('/api/teams').subscribe();
    http.post('/api/teams', {}).subscribe();
    http.patch('/api/auth/me', {}).subscribe();
    http.delete('/api/teams/t1/members/u1').subscribe();

    const get = backend.expectOne({ method: 'GET', url: '/api/teams' });
    expect(get.request.headers.has(CSRF_HEADER)).toBe(false);
    for (const method of ['POST', 'PATCH', 'DELETE']) {
      const request = backend.expectOne((r) => r.method === method);
      expect(request.request.headers.get(CSRF_HEADER)).toBe('1');
      request.flush({});
    }
    get.flush([]);
  });

  it("shows the API's error message in a snackbar and still fails the request", () => {
    let failed = false;
    http.post('/api/teams', {}).subscribe({ error: () => (failed = true) });
    backend.expectOne('/api/teams').flush(
      { error: { code: 'forbidden', message: 'Your roles do not allow this.' } },
      { status: 403, statusText: 'Forbidden' },
    );
    expect(notifier.error).toHaveBeenCalledWith('Your roles do not allow this.');
    expect(failed).toBe(true);
  });

  it('falls back to a plain message when the body is not the API error shape', () => {
    http.get('/api/health').subscribe({ error: () => undefined });
    backend.expectOne('/api/health').flush('<html>proxy error</html>', {
      status: 502,
      statusText: 'Bad Gateway',
    });
    expect(notifier.error).toHaveBeenCalledWith('The server answered 502 Bad Gateway.');
  });

  it('stays quiet when the caller shows the error inline', () => {
    const context = new HttpContext().set(SHOW_ERRORS_INLINE, true);
    http.post('/api/auth/sign-in', {}, { context }).subscribe({ error: () => undefined });
    backend.expectOne('/api/auth/sign-in').flush(
      { error: { code: 'invalid_credentials', message: 'E-mail or password is wrong.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('sends the user to sign in when the session has ended', () => {
    const router = TestBed.inject(Router);
    const navigate = vi.spyOn(router, 'navigate').mockResolvedValue(true);
    const forget = vi.spyOn(TestBed.inject(AuthService), 'forget');
    http.get('/api/teams').subscribe({ error: () => undefined });
    backend.expectOne('/api/teams').flush(
      { error: { code: 'unauthenticated', message: 'Sign in first.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    expect(forget).toHaveBeenCalled();
    expect(navigate).toHaveBeenCalledWith(['/sign-in'], { queryParams: { returnUrl: '/' } });
    expect(notifier.error).toHaveBeenCalledWith('Your session has ended. Please sign in again.');
  });

  it('counts requests in flight for the loading indicator', () => {
    const loading = TestBed.inject(LoadingIndicator);
    http.get('/api/teams').subscribe();
    http.get('/api/auth/me').subscribe();
    expect(loading.busy()).toBe(true);
    backend.expectOne('/api/teams').flush([]);
    expect(loading.busy()).toBe(true);
    backend.expectOne('/api/auth/me').flush({});
    expect(loading.busy()).toBe(false);
  });
});
