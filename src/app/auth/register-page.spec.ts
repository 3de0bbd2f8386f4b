import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { Router } from '@angular/router';
import { Me } from '../core/api-types';
import { RegisterPage } from './register-page';
import { settle } from '../../testing/settle';

const NEW_USER: Me = {
  user: { id: 'u-new', email: 'new@tallowmere.example', displayName: 'Noor Pell', displayUnits: 'si' },
  memberships: [],
};

describe('RegisterPage', () => {
  let backend: HttpTestingController;

  beforeEach(async () => {
    await TestBed.configureTestingModule({
      imports: [RegisterPage],
      providers: shellTestProviders(fakeNotifier()),
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  async function render() {
    const fixture = TestBed.createComponent(RegisterPage);
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
    return { fixture, fill, submit, errors, alerts };
  }

  it('asks for a long enough password and the same one twice, and sends nothing until then', async () => {
    const { fill, submit, errors, alerts } = await render();
    await fill({ displayName: 'Noor Pell', email: 'new@tallowmere.example', password: 'short', confirm: 'shorter' });
    await submit();
    expect(errors()).toEqual(['Use at least 10 characters.']);
    expect(alerts()).toEqual(['The two passwords differ.']);
    backend.expectNone('/api/auth/register');
  });

  it('registers and goes to the team list of a user without teams', async () => {
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    const { fill, submit } = await render();
    await fill({
      displayName: ' Noor Pell ',
      email: 'new@tallowmere.example',
      password: 'a-long-passphrase',
      confirm: 'a-long-passphrase',
    });
    await submit();
    const request = backend.expectOne('/api/auth/register');
    expect(request.request.body).toEqual({
      email: 'new@tallowmere.example',
      password: 'a-long-passphrase',
      displayName: 'Noor Pell',
    });
    request.flush(NEW_USER, { status: 201, statusText: 'Created' });
    expect(navigate).toHaveBeenCalledWith('/teams');
  });

  it('marks the e-mail field when the address is already registered', async () => {
    const { fill, submit, errors, alerts } = await render();
    await fill({
      displayName: 'Eli Marsh',
      email: 'engineer@tallowmere.example',
      password: 'a-long-passphrase',
      confirm: 'a-long-passphrase',
    });
    await submit();
    backend.expectOne('/api/auth/register').flush(
      { error: { code: 'email_taken', message: 'An account with this e-mail address already exists' } },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
    expect(errors()).toEqual(['An account with this e-mail already exists.']);
    expect(alerts()).toEqual(['An account with this e-mail address already exists']);
  });
});
