import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { ForgotPasswordPage } from './forgot-password-page';
import { settle } from '../../testing/settle';

describe('ForgotPasswordPage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  async function setUp(query: Record<string, string> = {}) {
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({
      imports: [ForgotPasswordPage],
      providers: [
        ...shellTestProviders(notifier),
      ],
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(ForgotPasswordPage);
    // The router binds `?email=` to the input of that name.
    if (query['email'] !== undefined) fixture.componentRef.setInput('email', query['email']);
    await settle();
    const root = fixture.nativeElement as HTMLElement;
    const email = () => root.querySelector<HTMLInputElement>('input[formcontrolname="email"]')!;
    const type = async (value: string) => {
      email().value = value;
      email().dispatchEvent(new Event('input'));
      email().dispatchEvent(new Event('blur'));
      await settle();
    };
    const submit = async () => {
      root.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
      await settle();
    };
    const errors = () => [...root.querySelectorAll('mat-error')].map((e) => e.textContent?.trim());
    return { fixture, root, email, type, submit, errors };
  }

  afterEach(() => backend.verify());

  it('asks for an address and sends nothing for an empty or malformed one', async () => {
    const { type, submit, errors } = await setUp();
    await submit();
    expect(errors()).toEqual(['Enter your e-mail address.']);
    await type('dana-at-tallowmere');
    await submit();
    expect(errors()).toEqual(['This is not an e-mail address.']);
    backend.expectNone('/api/auth/password-reset');
  });

  it('starts with the address typed on the sign-in page', async () => {
    const { email } = await setUp({ email: 'designer@tallowmere.example' });
    expect(email().value).toBe('designer@tallowmere.example');
  });

  it('requests the link with the trimmed address and answers without saying whether it has an account', async () => {
    const { type, submit, root } = await setUp();
    await type('  designer@tallowmere.example ');
    await submit();
    const request = backend.expectOne('/api/auth/password-reset');
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({ email: 'designer@tallowmere.example' });
    expect(request.request.headers.get('X-Rollwise-Request')).toBe('1');
    request.flush({ status: 'If an account uses that address, a reset link is on its way.' }, { status: 202, statusText: 'Accepted' });
    await settle();
    const status = root.querySelector('[role="status"]')?.textContent ?? '';
    expect(status).toContain('If an account uses designer@tallowmere.example');
    expect(root.querySelector('form')).toBeNull();
  });

  it('shows a refusal (rate limit) inline, not in a snackbar, and keeps the form', async () => {
    const { type, submit, root } = await setUp();
    await type('designer@tallowmere.example');
    await submit();
    backend.expectOne('/api/auth/password-reset').flush(
      { error: { code: 'rate_limited', message: 'Too many reset requests. Please wait a few minutes and try again.' } },
      { status: 429, statusText: 'Too Many Requests' },
    );
    await settle();
    expect(root.querySelector('[role="alert"]')?.textContent?.trim()).toBe(
      'Too many reset requests. Please wait a few minutes and try again.',
    );
    expect(notifier.error).not.toHaveBeenCalled();
    expect(root.querySelector('form')).not.toBeNull();
  });
});
