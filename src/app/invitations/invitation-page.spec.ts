import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router } from '@angular/router';
import { Me } from '../core/api-types';
import { AuthService } from '../core/auth/auth-service';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { InvitationPage } from './invitation-page';
import { InvitationInfo } from './invitations-api';

const TOKEN = 'eyJpZCI6Imludi0xIn0.c2lnbmF0dXJl';
const LINK = `/api/invitations/${TOKEN}`;
const INVITATION: InvitationInfo = {
  teamId: 't-tal',
  teamName: 'Tallowmere University Racing',
  email: 'noor@tallowmere.example',
  roles: ['designer', 'reviewer'],
  invitedByName: 'Ana Ferreira',
  expiresAt: '2026-12-05T09:00:00.000Z',
};
const NOOR: Me = {
  user: { id: 'u-noor', email: 'noor@tallowmere.example', displayName: 'Noor Pell', displayUnits: 'si', emailVerified: true },
  memberships: [],
};
const NOOR_IN_TEAM: Me = {
  ...NOOR,
  memberships: [{ teamId: 't-tal', teamName: 'Tallowmere University Racing', teamSlug: 'tallowmere', roles: ['designer', 'reviewer'] }],
};
const ELI: Me = {
  user: { id: 'u-eli', email: 'engineer@tallowmere.example', displayName: 'Eli Marsh', displayUnits: 'si' },
  memberships: [],
};

describe('InvitationPage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(async () => {
    localStorage.clear();
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({
      imports: [InvitationPage],
      providers: shellTestProviders(notifier),
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  function signInAs(me: Me): void {
    TestBed.inject(AuthService).signIn(me.user.email, 'a-long-passphrase').subscribe();
    backend.expectOne('/api/auth/sign-in').flush(me);
  }

  async function render(invitation: InvitationInfo | null = INVITATION) {
    const fixture = TestBed.createComponent(InvitationPage);
    fixture.componentRef.setInput('token', TOKEN);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    if (invitation) {
      const get = backend.expectOne({ method: 'GET', url: LINK });
      get.flush(invitation);
      await fixture.whenStable();
    }
    const fill = async (values: Record<string, string>) => {
      for (const [name, value] of Object.entries(values)) {
        const input = root.querySelector<HTMLInputElement>(`input[formcontrolname="${name}"], input[name="${name}"]`)!;
        input.value = value;
        input.dispatchEvent(new Event('input'));
        input.dispatchEvent(new Event('blur'));
      }
      await fixture.whenStable();
    };
    const button = (label: string) =>
      [...root.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.includes(label));
    const click = async (label: string) => {
      button(label)!.click();
      await fixture.whenStable();
    };
    const errors = () => [...root.querySelectorAll('mat-error')].map((e) => e.textContent?.trim());
    const alerts = () => [...root.querySelectorAll('[role="alert"]')].map((e) => e.textContent?.trim());
    return { fixture, root, fill, button, click, errors, alerts };
  }

  it('shows the team, the inviter and the roles offered', async () => {
    const { root } = await render();
    expect(root.querySelector('h1')?.textContent?.trim()).toBe('Join Tallowmere University Racing');
    expect(root.textContent).toContain('Ana Ferreira invites noor@tallowmere.example');
    const roles = [...root.querySelectorAll('.roles li')].map((li) => li.textContent?.trim());
    expect(roles).toEqual([
      'designer — Hardpoints and axle designs; accepts proposals',
      'reviewer — Reads everything; approves or requests changes',
    ]);
  });

  for (const [code, status, title] of [
    ['invitation_expired', 410, 'This invitation has expired'],
    ['invitation_used', 410, 'This invitation was already accepted'],
    ['invitation_invalid', 404, 'This invitation link is not valid'],
  ] as const) {
    it(`explains a link that cannot be used (${code})`, async () => {
      const { fixture, root, alerts } = await render(null);
      backend.expectOne(LINK).flush(
        { error: { code, message: `Server says ${code}; ask the team owner for a new one` } },
        { status, statusText: 'Gone' },
      );
      await fixture.whenStable();
      expect(root.querySelector('h1')?.textContent?.trim()).toBe(title);
      expect(alerts()).toEqual([`Server says ${code}; ask the team owner for a new one`]);
      expect(root.querySelector('form')).toBeNull();
      expect(root.querySelector('button')).toBeNull();
      expect(notifier.error).not.toHaveBeenCalled();
    });
  }

  it('a new person: validates the form and sends nothing until it is right', async () => {
    const { fill, click, errors, alerts, root } = await render();
    expect(root.querySelector<HTMLInputElement>('input[readonly]')?.value).toBe('noor@tallowmere.example');
    await click('Create account and join');
    expect(errors()).toEqual(['Enter the name your team knows you by.', 'Choose a password.', 'Repeat the password.']);
    await fill({ displayName: 'Noor Pell', password: 'short', confirm: 'shorter' });
    await click('Create account and join');
    expect(errors()).toEqual(['Use at least 10 characters.']);
    expect(alerts()).toEqual(['The two passwords differ.']);
    backend.expectNone(`${LINK}/accept`);
  });

  it('a new person registers straight into the team, is signed in and lands on the team', async () => {
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    const { fill, click } = await render();
    await fill({ displayName: ' Noor Pell ', password: 'a-long-passphrase', confirm: 'a-long-passphrase' });
    await click('Create account and join');
    const accept = backend.expectOne(`${LINK}/accept`);
    expect(accept.request.method).toBe('POST');
    expect(accept.request.body).toEqual({ displayName: 'Noor Pell', password: 'a-long-passphrase' });
    expect(accept.request.headers.get('X-Rollwise-Request')).toBe('1');
    accept.flush({ teamId: 't-tal', me: NOOR_IN_TEAM });
    const signIn = backend.expectOne('/api/auth/sign-in');
    expect(signIn.request.body).toEqual({ email: 'noor@tallowmere.example', password: 'a-long-passphrase' });
    signIn.flush(NOOR_IN_TEAM);
    const auth = TestBed.inject(AuthService);
    expect(auth.currentTeam()?.teamId).toBe('t-tal');
    expect(navigate).toHaveBeenCalledWith(['/teams', 't-tal']);
    expect(notifier.info).toHaveBeenCalledWith('Welcome to Tallowmere University Racing.');
  });

  it('signed out: offers signing in (and coming back here) and creating an account alike, never saying which applies', async () => {
    const { root } = await render(INVITATION);
    expect(root.querySelector('form')).not.toBeNull();
    const signIn = [...root.querySelectorAll('a')].find((a) => a.textContent?.includes('Sign in to accept'));
    expect(signIn?.getAttribute('href')).toBe('/sign-in?returnUrl=%2Finvitations%2F' + encodeURIComponent(TOKEN));
    expect(root.textContent).not.toMatch(/already has a Rollwise account|has no account/);
  });

  it('signed in with the invited address not yet confirmed: asks to confirm it first and offers no accept', async () => {
    signInAs({ ...NOOR, user: { ...NOOR.user, emailVerified: false } });
    const { root } = await render(INVITATION);
    expect(root.querySelector('[role="status"]')?.textContent).toContain('Confirm your e-mail address first');
    expect([...root.querySelectorAll('button')].some((b) => b.textContent?.includes('Accept'))).toBe(false);
    backend.expectNone(`${LINK}/accept`);
  });

  it('the invited person signed in accepts with a POST and the app re-reads its memberships', async () => {
    signInAs(NOOR);
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    const { click, fixture } = await render(INVITATION);
    await click('Accept and join Tallowmere University Racing');
    const accept = backend.expectOne(`${LINK}/accept`);
    expect(accept.request.body).toEqual({});
    accept.flush({ teamId: 't-tal', me: NOOR_IN_TEAM });
    backend.expectOne('/api/auth/me').flush(NOOR_IN_TEAM);
    await fixture.whenStable();
    expect(TestBed.inject(AuthService).isMemberOf('t-tal')).toBe(true);
    expect(navigate).toHaveBeenCalledWith(['/teams', 't-tal']);
  });

  it('signed in as someone else: says so, offers to sign out, and never accepts', async () => {
    signInAs(ELI);
    const { root, click, fixture } = await render(INVITATION);
    expect(root.querySelector('[role="status"]')?.textContent).toContain(
      'You are signed in as engineer@tallowmere.example, but this invitation is for noor@tallowmere.example',
    );
    expect([...root.querySelectorAll('button')].some((b) => b.textContent?.includes('Accept'))).toBe(false);
    await click('Sign out');
    backend.expectOne('/api/auth/sign-out').flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(root.textContent).toContain('Sign in to accept');
    backend.expectNone(`${LINK}/accept`);
  });

  it('shows a refusal of the accept inline and lets the person try again', async () => {
    signInAs(NOOR);
    const { click, fixture, alerts, button } = await render(INVITATION);
    await click('Accept and join');
    backend.expectOne(`${LINK}/accept`).flush(
      { error: { code: 'already_member', message: 'You are already a member of this team' } },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    expect(alerts()).toEqual(['You are already a member of this team']);
    expect(button('Accept and join')?.disabled).toBe(false);
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('turns to the expired message when the link expires before accepting', async () => {
    const { fill, click, fixture, root } = await render();
    await fill({ displayName: 'Noor Pell', password: 'a-long-passphrase', confirm: 'a-long-passphrase' });
    await click('Create account and join');
    backend.expectOne(`${LINK}/accept`).flush(
      { error: { code: 'invitation_expired', message: 'This invitation has expired; ask the team owner for a new one' } },
      { status: 410, statusText: 'Gone' },
    );
    await fixture.whenStable();
    expect(root.querySelector('h1')?.textContent?.trim()).toBe('This invitation has expired');
    expect(root.querySelector('form')).toBeNull();
  });
});
