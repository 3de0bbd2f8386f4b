import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Me } from '../core/api-types';
import { AuthService } from '../core/auth/auth-service';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { VerifyEmailPage } from './verify-email-page';

const TOKEN = 'eyJ2ZXJpZnkiOnRydWV9.signature';
const NOOR: Me = {
  user: { id: 'u-new', email: 'new@tallowmere.example', displayName: 'Noor Pell', displayUnits: 'si', emailVerified: false },
  memberships: [],
};

describe('VerifyEmailPage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(async () => {
    localStorage.clear();
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({
      imports: [VerifyEmailPage],
      providers: shellTestProviders(notifier),
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  async function render() {
    const fixture = TestBed.createComponent(VerifyEmailPage);
    fixture.componentRef.setInput('token', TOKEN);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    const text = (selector: string) => root.querySelector(selector)?.textContent?.trim();
    return { fixture, root, text };
  }

  function signInNoor(): void {
    TestBed.inject(AuthService).signIn(NOOR.user.email, 'a-long-passphrase').subscribe();
    backend.expectOne('/api/auth/sign-in').flush(NOOR);
  }

  it('confirms the address as the page opens and says so', async () => {
    const { fixture, text } = await render();
    expect(text('[role="status"]')).toBe('Confirming your address…');
    const request = backend.expectOne('/api/auth/verify-email');
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({ token: TOKEN });
    request.flush({ verified: true });
    await fixture.whenStable();
    expect(text('[role="status"]')).toBe('Thank you: your e-mail address is confirmed.');
    expect(text('a[href="/sign-in"]')).toBe('Sign in');
  });

  it('shows why a tampered link failed, inline', async () => {
    const { fixture, text, root } = await render();
    backend.expectOne('/api/auth/verify-email').flush(
      { error: { code: 'verification_invalid', message: 'This confirmation link is not valid' } },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(text('[role="alert"]')).toBe('This confirmation link is not valid');
    expect(notifier.error).not.toHaveBeenCalled();
    // Signed out: no resend button, a way to sign in and come back.
    expect(root.querySelector('button')).toBeNull();
    expect(root.querySelector('a')?.getAttribute('href')).toBe(
      '/sign-in?returnUrl=%2Fverify-email%2F' + encodeURIComponent(TOKEN),
    );
  });

  it('lets a signed-in user replace an expired link', async () => {
    signInNoor();
    const { fixture, text, root } = await render();
    backend.expectOne('/api/auth/verify-email').flush(
      { error: { code: 'verification_expired', message: 'This confirmation link has expired; ask for a new one from your account page' } },
      { status: 410, statusText: 'Gone' },
    );
    await fixture.whenStable();
    expect(text('[role="alert"]')).toContain('has expired');
    root.querySelector<HTMLButtonElement>('button')!.click();
    await fixture.whenStable();
    const resend = backend.expectOne('/api/auth/verify-email/resend');
    expect(resend.request.method).toBe('POST');
    resend.flush({ status: 'A new confirmation link is on its way.' }, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(text('[role="status"]')).toBe('A new confirmation link is on its way to new@tallowmere.example.');
  });

  it('re-reads the signed-in account after confirming, so the app knows it is verified', async () => {
    signInNoor();
    const { fixture } = await render();
    backend.expectOne('/api/auth/verify-email').flush({ verified: true });
    await fixture.whenStable();
    backend.expectOne('/api/auth/me').flush({ ...NOOR, user: { ...NOOR.user, emailVerified: true } });
    expect(TestBed.inject(AuthService).user()?.emailVerified).toBe(true);
  });
});
