import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { ResetPasswordPage } from './reset-password-page';
import { settle } from '../../testing/settle';

const TOKEN = 'q6l0Zr0wXbS1_reset-token-from-mail';

describe('ResetPasswordPage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(async () => {
    localStorage.clear();
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({
      imports: [ResetPasswordPage],
      providers: shellTestProviders(notifier),
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  async function render() {
    const fixture = TestBed.createComponent(ResetPasswordPage);
    fixture.componentRef.setInput('token', TOKEN);
    await settle();
    const root = fixture.nativeElement as HTMLElement;
    const fill = async (values: Record<string, string>) => {
      for (const [name, value] of Object.entries(values)) {
        const input = root.querySelector<HTMLInputElement>(`input[formcontrolname="${name}"], input[name="${name}"]`)!;
        input.value = value;
        input.dispatchEvent(new Event('input'));
        input.dispatchEvent(new Event('blur'));
      }
      await settle();
    };
    const submit = async () => {
      root.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
      await settle();
    };
    const errors = () => [...root.querySelectorAll('mat-error')].map((e) => e.textContent?.trim());
    const alerts = () => [...root.querySelectorAll('[role="alert"]')].map((e) => e.textContent?.trim());
    return { fixture, root, fill, submit, errors, alerts };
  }

  it('needs a long enough password, twice the same, before sending anything', async () => {
    const { fill, submit, errors, alerts } = await render();
    await submit();
    expect(errors()).toEqual(['Choose a password.', 'Repeat the password.']);
    await fill({ password: 'short', confirm: 'short' });
    await submit();
    expect(errors()).toEqual(['Use at least 10 characters.']);
    await fill({ password: 'a-new-passphrase', confirm: 'another-passphrase' });
    await submit();
    expect(alerts()).toEqual(['The two passwords differ.']);
    backend.expectNone('/api/auth/password-reset/confirm');
  });

  it('sends the token from the link with the new password and says to sign in', async () => {
    const { fill, submit, root } = await render();
    await fill({ password: 'a-new-passphrase', confirm: 'a-new-passphrase' });
    await submit();
    const request = backend.expectOne('/api/auth/password-reset/confirm');
    expect(request.request.body).toEqual({ token: TOKEN, newPassword: 'a-new-passphrase' });
    expect(request.request.headers.get('X-Rollwise-Request')).toBe('1');
    request.flush(null, { status: 204, statusText: 'No Content' });
    await settle();
    expect(root.querySelector('[role="status"]')?.textContent).toContain('Your password is changed');
    expect(root.querySelector('a[href="/sign-in"]')).not.toBeNull();
    // Nobody was signed in here, so nothing else is asked.
    backend.expectNone('/api/auth/me');
  });

  it('explains a used or expired link and offers a new one, without a snackbar', async () => {
    const { fill, submit, root, alerts } = await render();
    await fill({ password: 'a-new-passphrase', confirm: 'a-new-passphrase' });
    await submit();
    backend.expectOne('/api/auth/password-reset/confirm').flush(
      { error: { code: 'reset_link_invalid', message: 'This reset link is not valid, was already used or has expired; ask for a new one' } },
      { status: 400, statusText: 'Bad Request' },
    );
    await settle();
    expect(alerts()).toEqual(['This reset link is not valid, was already used or has expired; ask for a new one']);
    expect(root.querySelector('form')).toBeNull();
    expect(root.querySelector('a[href="/forgot-password"]')?.textContent?.trim()).toBe('Ask for a new link');
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('keeps the form for a refused password (field issues)', async () => {
    const { fill, submit, root, alerts } = await render();
    await fill({ password: 'ééééééééééééééééééééééééééééééééééééé', confirm: 'ééééééééééééééééééééééééééééééééééééé' });
    await submit();
    backend.expectOne('/api/auth/password-reset/confirm').flush(
      { error: { code: 'invalid_input', message: 'newPassword: must be at most 72 bytes', details: { fields: [{ path: 'newPassword', message: 'must be at most 72 bytes' }] } } },
      { status: 400, statusText: 'Bad Request' },
    );
    await settle();
    expect(alerts()).toEqual(['newPassword: must be at most 72 bytes']);
    expect(root.querySelector('form')).not.toBeNull();
  });
});
