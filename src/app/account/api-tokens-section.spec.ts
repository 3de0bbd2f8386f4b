import { Clipboard } from '@angular/cdk/clipboard';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { Me } from '../core/api-types';
import { AuthService } from '../core/auth/auth-service';
import { ApiToken } from './api-tokens-api';
import { ApiTokensSection } from './api-tokens-section';
import { settle } from '../../testing/settle';

const ELI: Me = {
  user: { id: 'u-eli', email: 'engineer@tallowmere.example', displayName: 'Eli Marsh', displayUnits: 'si' },
  memberships: [
    { teamId: 't-tal', teamName: 'Tallowmere University Racing', teamSlug: 'tallowmere', roles: ['engineer'] },
    { teamId: 't-br', teamName: 'Brackenfield Road Programme', teamSlug: 'brackenfield', roles: ['engineer'] },
  ],
};
const TOKEN: ApiToken = {
  id: 'k1',
  name: 'Nightly sweep',
  teamId: 't-tal',
  teamName: 'Tallowmere University Racing',
  scope: 'read',
  prefix: 'rw_abcdefg',
  expiresAt: null,
  lastUsedAt: null,
  revokedAt: null,
  createdAt: '2026-12-01T10:00:00.000Z',
};
const SECRET = 'rw_' + 'x'.repeat(43);

describe('ApiTokensSection', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;
  let copy: ReturnType<typeof vi.fn>;

  beforeEach(async () => {
    notifier = fakeNotifier();
    copy = vi.fn(() => true);
    await TestBed.configureTestingModule({
      imports: [ApiTokensSection],
      providers: [
        ...shellTestProviders(notifier),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: Clipboard, useValue: { copy } },
      ],
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(AuthService).refresh().subscribe();
    backend.expectOne('/api/auth/me').flush(ELI);
  });
  afterEach(() => {
    backend.verify();
    document.querySelectorAll('.cdk-overlay-container').forEach((e) => (e.innerHTML = ''));
  });

  async function render(list: ApiToken[] = [TOKEN]) {
    const fixture = TestBed.createComponent(ApiTokensSection);
    await settle();
    backend.expectOne('/api/auth/tokens').flush(list);
    await settle();
    return { fixture, root: fixture.nativeElement as HTMLElement };
  }

  it('lists tokens with team, access, prefix and state', async () => {
    const { root } = await render([TOKEN, { ...TOKEN, id: 'k2', name: 'Old script', scope: 'write', revokedAt: '2026-12-01T11:00:00.000Z' }]);
    const items = [...root.querySelectorAll('.tokens li')];
    expect(items[0]!.textContent).toContain('rw_abcdefg…');
    expect(items[0]!.textContent).toContain('Tallowmere University Racing · Read');
    expect(items[0]!.textContent).toContain('Active, no expiry');
    expect(items[0]!.textContent).toContain('never used');
    expect(items[1]!.textContent).toContain('Revoked');
    // A revoked token has nothing left to revoke.
    expect(items[1]!.querySelector('button')).toBeNull();
  });

  it('creates a token for the chosen team and shows its secret once, with a warning and a copy button', async () => {
    const { root } = await render([]);
    expect(root.textContent).toContain('You have no API tokens.');
    const name = root.querySelector<HTMLInputElement>('input[formcontrolname="name"]')!;
    name.value = 'Batch study';
    name.dispatchEvent(new Event('input'));
    root.querySelector<HTMLInputElement>('mat-radio-button[value="write"] input')!.click();
    root.querySelector<HTMLButtonElement>('.token-form button[type="submit"]')!.click();
    await settle();
    const post = backend.expectOne({ method: 'POST', url: '/api/auth/tokens' });
    // The current team (the first membership) is preselected; 90 days is the default expiry.
    expect(post.request.body).toEqual({ name: 'Batch study', teamId: 't-tal', scope: 'write', expiresInDays: 90 });
    post.flush({ ...TOKEN, id: 'k3', name: 'Batch study', scope: 'write', token: SECRET });
    await settle();
    backend.expectOne('/api/auth/tokens').flush([{ ...TOKEN, id: 'k3', name: 'Batch study', scope: 'write' }]);
    await settle();
    // The emptied form shows no error after the token was made.
    expect(root.querySelector('.token-form mat-error')).toBeNull();
    const secret = root.querySelector('.secret')!;
    expect(secret.textContent).toContain('This is the only time Rollwise shows it');
    expect(secret.querySelector<HTMLInputElement>('input')!.value).toBe(SECRET);
    [...secret.querySelectorAll('button')].find((b) => b.textContent?.includes('Copy token'))!.click();
    await settle();
    expect(copy).toHaveBeenCalledWith(SECRET);
    expect(secret.textContent).toContain('Copied');
    [...secret.querySelectorAll('button')].find((b) => b.textContent?.includes('I have stored it'))!.click();
    await settle();
    expect(root.querySelector('.secret')).toBeNull();
    expect(root.textContent).not.toContain(SECRET);
  });

  it('refuses to create a token without a name', async () => {
    const { root } = await render([]);
    root.querySelector<HTMLButtonElement>('.token-form button[type="submit"]')!.click();
    await settle();
    expect(root.querySelector('mat-error')?.textContent?.trim()).toBe('Name the token so you can tell it apart later.');
    backend.expectNone({ method: 'POST', url: '/api/auth/tokens' });
  });

  it('sends no expiry when "Never" is chosen, and shows a refusal beside the form', async () => {
    const { fixture, root } = await render([]);
    const name = root.querySelector<HTMLInputElement>('input[formcontrolname="name"]')!;
    name.value = 'Forever';
    name.dispatchEvent(new Event('input'));
    const cmp = fixture.componentInstance as unknown as { form: { controls: { expiresInDays: { setValue(v: number): void } } } };
    cmp.form.controls.expiresInDays.setValue(0);
    root.querySelector<HTMLButtonElement>('.token-form button[type="submit"]')!.click();
    await settle();
    const post = backend.expectOne({ method: 'POST', url: '/api/auth/tokens' });
    expect(post.request.body).toEqual({ name: 'Forever', teamId: 't-tal', scope: 'read' });
    post.flush({ error: { code: 'not_found', message: 'Team not found' } }, { status: 404, statusText: 'Not Found' });
    await settle();
    expect(root.querySelector('.rw-form-error')?.textContent?.trim()).toBe('Team not found');
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('revokes only after confirmation', async () => {
    const { root } = await render();
    root.querySelector<HTMLButtonElement>('[aria-label="Revoke token Nightly sweep"]')!.click();
    await settle();
    expect(document.querySelector('mat-dialog-content')?.textContent).toContain('stops working at once');
    [...document.querySelectorAll<HTMLButtonElement>('mat-dialog-actions button')].find((b) => b.textContent?.trim() === 'Revoke token')!.click();
    await settle();
    backend.expectOne({ method: 'DELETE', url: '/api/auth/tokens/k1' }).flush(null, { status: 204, statusText: 'No Content' });
    await settle();
    expect(notifier.info).toHaveBeenCalledWith('Token "Nightly sweep" revoked.');
    backend.expectOne('/api/auth/tokens').flush([{ ...TOKEN, revokedAt: '2026-12-02T10:00:00.000Z' }]);
  });
});
