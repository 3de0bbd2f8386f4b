import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { Router } from '@angular/router';
import { Me } from '../core/api-types';
import { SignInPage } from './sign-in-page';
import { settle } from '../../testing/settle';

const ELI: Me = {
  user: { id: 'u-eli', email: 'engineer@tallowmere.example', displayName: 'Eli Marsh', displayUnits: 'si' },
  memberships: [{ teamId: 't-tal', teamName: 'Tallowmere University Racing', teamSlug: 'tallowmere', roles: ['engineer'] }],
};

async function render() {
  const fixture = TestBed.createComponent(SignInPage);
  await settle();
  const root = fixture.nativeElement as HTMLElement;
  const input = (name: string) => root.querySelector<HTMLInputElement>(`input[formcontrolname="${name}"]`)!;
  const type = async (name: string, value: string) => {
    input(name).value = value;
    input(name).dispatchEvent(new Event('input'));
    input(name).dispatchEvent(new Event('blur'));
    await settle();
  };
  const submit = async () => {
    root.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await settle();
  };
  const errors = () => [...root.querySelectorAll('mat-error')].map((e) => e.textContent?.trim());
  return { fixture, root, input, type, submit, errors };
}

describe('SignInPage', () => {
  let backend: HttpTestingController;

  beforeEach(async () => {
    await TestBed.configureTestingModule({
      imports: [SignInPage],
      providers: shellTestProviders(fakeNotifier()),
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  it('labels both inputs', async () => {
    const { root } = await render();
    const labels = [...root.querySelectorAll('mat-label')].map((l) => l.textContent?.trim());
    expect(labels).toEqual(['E-mail', 'Password']);
    // Material ties each label to its input.
    for (const label of root.querySelectorAll('label')) {
      expect(root.querySelector(`#${label.getAttribute('for')}`)?.tagName).toBe('INPUT');
    }
  });

  it('asks for both fields and sends nothing when submitted empty', async () => {
    const { submit, errors } = await render();
    await submit();
    expect(errors()).toEqual(['Enter your e-mail address.', 'Enter your password.']);
    backend.expectNone('/api/auth/sign-in');
  });

  it('rejects something that is not an e-mail address', async () => {
    const { type, submit, errors } = await render();
    await type('email', 'eli-at-tallowmere');
    await type('password', 'demo-pass-2026');
    await submit();
    expect(errors()).toEqual(['This is not an e-mail address.']);
    backend.expectNone('/api/auth/sign-in');
  });

  it('signs in with the trimmed e-mail and goes to the current team', async () => {
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    const { type, submit, errors } = await render();
    await type('email', '  engineer@tallowmere.example ');
    await type('password', 'demo-pass-2026');
    await submit();
    expect(errors()).toEqual([]);
    const request = backend.expectOne('/api/auth/sign-in');
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({ email: 'engineer@tallowmere.example', password: 'demo-pass-2026' });
    expect(request.request.headers.get('X-Rollwise-Request')).toBe('1');
    request.flush(ELI);
    expect(navigate).toHaveBeenCalledWith('/teams/t-tal');
  });

  it("shows the server's refusal inline and clears the password", async () => {
    const { type, submit, root, input } = await render();
    await type('email', 'engineer@tallowmere.example');
    await type('password', 'not-the-password');
    await submit();
    backend.expectOne('/api/auth/sign-in').flush(
      { error: { code: 'invalid_credentials', message: 'E-mail or password is not right.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    await settle();
    expect(root.querySelector('[role="alert"]')?.textContent?.trim()).toBe('E-mail or password is not right.');
    expect(input('password').value).toBe('');
    expect(root.querySelector<HTMLButtonElement>('button[type="submit"]')!.disabled).toBe(false);
  });

  it('offers a password reset, carrying the address typed so far', async () => {
    const { type, root } = await render();
    const forgot = () => [...root.querySelectorAll('a')].find((a) => a.textContent?.trim() === 'Forgot your password?')!;
    expect(forgot().getAttribute('href')).toBe('/forgot-password');
    await type('email', ' designer@tallowmere.example ');
    await settle();
    const href = new URL(forgot().getAttribute('href')!, 'http://127.0.0.1');
    expect(href.pathname).toBe('/forgot-password');
    expect(href.searchParams.get('email')).toBe('designer@tallowmere.example');
  });
});
