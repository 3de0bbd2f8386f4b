import { HttpTestingController } from '@angular/common/http/testing';
import { settle } from '../../testing/settle';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { Me, TeamMember } from '../core/api-types';
import { AuthService } from '../core/auth/auth-service';
import { MembersPage } from './members-page';

const ANA: Me = {
  user: { id: 'u-ana', email: 'owner@tallowmere.example', displayName: 'Ana Ferreira', displayUnits: 'si' },
  memberships: [{ teamId: 't-tal', teamName: 'Tallowmere University Racing', teamSlug: 'tallowmere', roles: ['owner'] }],
};
const MEMBERS: TeamMember[] = [
  { userId: 'u-ana', email: 'owner@tallowmere.example', displayName: 'Ana Ferreira', roles: ['owner'] },
  { userId: 'u-eli', email: 'engineer@tallowmere.example', displayName: 'Eli Marsh', roles: ['engineer'] },
  { userId: 'u-dana', email: 'designer@tallowmere.example', displayName: 'Dana Quist', roles: ['designer', 'reviewer'] },
];

const INVITATIONS = [
  { id: 'i-1', email: 'noor@tallowmere.example', roles: ['designer'], expiresAt: '2999-01-01T00:00:00.000Z', acceptedAt: null, invitedByName: 'Ana Ferreira' },
  { id: 'i-2', email: 'late@tallowmere.example', roles: ['viewer'], expiresAt: '2000-01-01T00:00:00.000Z', acceptedAt: null, invitedByName: 'Ana Ferreira' },
  { id: 'i-3', email: 'eli@tallowmere.example', roles: ['engineer'], expiresAt: '2999-01-01T00:00:00.000Z', acceptedAt: '2026-01-01T00:00:00.000Z', invitedByName: 'Ana Ferreira' },
];

describe('MembersPage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(async () => {
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({
      imports: [MembersPage],
      providers: shellTestProviders(notifier),
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(AuthService).refresh().subscribe();
    backend.expectOne('/api/auth/me').flush(ANA);
  });

  afterEach(() => backend.verify());

  async function render() {
    const fixture = TestBed.createComponent(MembersPage);
    fixture.componentRef.setInput('teamId', 't-tal');
    await settle();
    const root = fixture.nativeElement as HTMLElement;
    backend.expectOne('/api/teams/t-tal/members').flush(MEMBERS);
    backend.expectOne('/api/teams/t-tal/invitations').flush(INVITATIONS);
    await settle();
    await fixture.whenStable();
    const row = (name: string) =>
      [...root.querySelectorAll<HTMLElement>('tr[mat-row]')].find((tr) => tr.textContent?.includes(name))!;
    const selectedRoles = (name: string) =>
      [...row(name).querySelectorAll('mat-chip-option')]
        .filter((chip) => chip.classList.contains('mat-mdc-chip-selected'))
        .map((chip) => chip.textContent?.trim());
    const chip = (name: string, role: string) =>
      [...row(name).querySelectorAll<HTMLElement>('mat-chip-option')]
        .find((c) => c.textContent?.trim() === role)!
        .querySelector<HTMLElement>('.mat-mdc-chip-action')!;
    return { fixture, root, row, selectedRoles, chip };
  }

  it('lists the members with their roles selected, and marks the user', async () => {
    const { row, selectedRoles } = await render();
    expect(row('Ana Ferreira').textContent).toContain('(you)');
    expect(selectedRoles('Eli Marsh')).toEqual(['engineer']);
    expect(selectedRoles('Dana Quist')).toEqual(['designer', 'reviewer']);
    expect(row('Eli Marsh').querySelector('[aria-label="Remove Eli Marsh"]')).not.toBeNull();
    expect(row('Ana Ferreira').querySelector('[aria-label="Leave the team"]')).not.toBeNull();
  });

  it('invites by e-mail with the chosen roles: nobody is added until they accept', async () => {
    const { root } = await render();
    const email = root.querySelector<HTMLInputElement>('input[formcontrolname="email"]')!;
    email.value = ' viewer@tallowmere.example ';
    email.dispatchEvent(new Event('input'));
    root.querySelector<HTMLButtonElement>('.add-form button[type="submit"]')!.click();
    await settle();
    backend.expectNone({ method: 'POST', url: '/api/teams/t-tal/members' });
    const invite = backend.expectOne({ method: 'POST', url: '/api/teams/t-tal/invitations' });
    expect(invite.request.body).toEqual({ email: 'viewer@tallowmere.example', roles: ['viewer'] });
    invite.flush({ id: 'i-4', email: 'viewer@tallowmere.example', roles: ['viewer'], expiresAt: '2999-01-01T00:00:00.000Z', acceptedAt: null });
    await settle();
    expect(notifier.info).toHaveBeenCalledWith('Invitation sent to viewer@tallowmere.example. They join the team when they accept it.');
    backend.expectOne('/api/teams/t-tal/members').flush(MEMBERS);
    backend.expectOne('/api/teams/t-tal/invitations').flush([
      { id: 'i-4', email: 'viewer@tallowmere.example', roles: ['viewer'], expiresAt: '2999-01-01T00:00:00.000Z', acceptedAt: null },
      ...INVITATIONS,
    ]);
    await settle();
    expect(root.querySelector('.open-invitations')?.textContent).toContain('viewer@tallowmere.example');
    expect(root.querySelectorAll('tr[mat-row]').length).toBe(MEMBERS.length);
  });

  it('lists the invitations still waiting, marking the expired ones, not the accepted', async () => {
    const { root } = await render();
    const items = [...root.querySelectorAll('.open-invitations li')].map((li) => li.textContent?.replace(/\s+/g, ' ').trim());
    expect(items).toHaveLength(2);
    expect(items[0]).toContain('noor@tallowmere.example as designer');
    expect(items[0]).toContain('until');
    expect(items[1]).toContain('late@tallowmere.example as viewer');
    expect(items[1]).toContain('expired');
  });

  it('refuses to send an invitation without a valid e-mail', async () => {
    const { root } = await render();
    root.querySelector<HTMLButtonElement>('.add-form button[type="submit"]')!.click();
    await settle();
    expect(root.querySelector('.add-form mat-error')?.textContent?.trim()).toBe('Enter the e-mail address to invite.');
    backend.expectNone({ method: 'POST', url: '/api/teams/t-tal/invitations' });
  });

  it('shows a refusal beside the form', async () => {
    const { root } = await render();
    const email = root.querySelector<HTMLInputElement>('input[formcontrolname="email"]')!;
    email.value = 'eli@tallowmere.example';
    email.dispatchEvent(new Event('input'));
    root.querySelector<HTMLButtonElement>('.add-form button[type="submit"]')!.click();
    await settle();
    backend.expectOne({ method: 'POST', url: '/api/teams/t-tal/invitations' }).flush(
      { error: { code: 'already_member', message: 'That address belongs to a member of this team already' } },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
    expect(root.querySelector('.add-member [role="alert"]')?.textContent?.trim()).toBe('That address belongs to a member of this team already');
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('saves a role added with a chip', async () => {
    const { chip } = await render();
    chip('Eli Marsh', 'reviewer').click();
    await settle();
    const patch = backend.expectOne({ method: 'PATCH', url: '/api/teams/t-tal/members/u-eli' });
    expect(patch.request.body).toEqual({ roles: ['engineer', 'reviewer'] });
    patch.flush({ ...MEMBERS[1], roles: ['engineer', 'reviewer'] });
    await settle();
    expect(notifier.info).toHaveBeenCalledWith('Roles of Eli Marsh saved.');
    backend.expectOne('/api/teams/t-tal/members').flush(MEMBERS);
    backend.expectOne('/api/teams/t-tal/invitations').flush(INVITATIONS);
  });

  it('keeps at least one role and shows the stored roles again after a refusal', async () => {
    const { fixture, chip, selectedRoles } = await render();
    chip('Eli Marsh', 'engineer').click();
    await settle();
    backend.expectNone({ method: 'PATCH' });
    expect(notifier.error).toHaveBeenCalledWith(
      'Eli Marsh needs at least one role. To take them off the team, use Remove.',
    );
    // The stored roles are shown again at once, without a round trip.
    backend.expectNone('/api/teams/t-tal/members');
    await fixture.whenStable();
    expect(selectedRoles('Eli Marsh')).toEqual(['engineer']);
  });
});
