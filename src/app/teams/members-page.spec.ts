import { HttpTestingController } from '@angular/common/http/testing';
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
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    backend.expectOne('/api/teams/t-tal/members').flush(MEMBERS);
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

  it('adds an existing user by e-mail with the chosen roles', async () => {
    const { fixture, root } = await render();
    const email = root.querySelector<HTMLInputElement>('input[formcontrolname="email"]')!;
    email.value = ' viewer@tallowmere.example ';
    email.dispatchEvent(new Event('input'));
    root.querySelector<HTMLButtonElement>('.add-form button[type="submit"]')!.click();
    await fixture.whenStable();
    const add = backend.expectOne({ method: 'POST', url: '/api/teams/t-tal/members' });
    expect(add.request.body).toEqual({ email: 'viewer@tallowmere.example', roles: ['viewer'] });
    add.flush({ userId: 'u-vera', email: 'viewer@tallowmere.example', displayName: 'Vera Nyman', roles: ['viewer'] });
    await fixture.whenStable();
    backend.expectOne('/api/teams/t-tal/members').flush([
      ...MEMBERS,
      { userId: 'u-vera', email: 'viewer@tallowmere.example', displayName: 'Vera Nyman', roles: ['viewer'] },
    ]);
    await fixture.whenStable();
    expect(root.textContent).toContain('Vera Nyman');
  });

  it('refuses to send an add request without a valid e-mail', async () => {
    const { fixture, root } = await render();
    root.querySelector<HTMLButtonElement>('.add-form button[type="submit"]')!.click();
    await fixture.whenStable();
    expect(root.querySelector('.add-form mat-error')?.textContent?.trim()).toBe(
      "Enter the member's e-mail address.",
    );
    backend.expectNone({ method: 'POST', url: '/api/teams/t-tal/members' });
  });

  it('shows an unknown e-mail refusal beside the form', async () => {
    const { fixture, root } = await render();
    const email = root.querySelector<HTMLInputElement>('input[formcontrolname="email"]')!;
    email.value = 'nobody@tallowmere.example';
    email.dispatchEvent(new Event('input'));
    root.querySelector<HTMLButtonElement>('.add-form button[type="submit"]')!.click();
    await fixture.whenStable();
    backend.expectOne({ method: 'POST', url: '/api/teams/t-tal/members' }).flush(
      { error: { code: 'user_not_found', message: 'No Rollwise account uses this e-mail.' } },
      { status: 404, statusText: 'Not Found' },
    );
    await fixture.whenStable();
    expect(root.querySelector('.add-member [role="alert"]')?.textContent?.trim()).toBe(
      'No Rollwise account uses this e-mail.',
    );
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('saves a role added with a chip', async () => {
    const { fixture, chip } = await render();
    chip('Eli Marsh', 'reviewer').click();
    await fixture.whenStable();
    const patch = backend.expectOne({ method: 'PATCH', url: '/api/teams/t-tal/members/u-eli' });
    expect(patch.request.body).toEqual({ roles: ['engineer', 'reviewer'] });
    patch.flush({ ...MEMBERS[1], roles: ['engineer', 'reviewer'] });
    await fixture.whenStable();
    expect(notifier.info).toHaveBeenCalledWith('Roles of Eli Marsh saved.');
    backend.expectOne('/api/teams/t-tal/members').flush(MEMBERS);
  });

  it('keeps at least one role and shows the stored roles again after a refusal', async () => {
    const { fixture, chip, selectedRoles } = await render();
    chip('Eli Marsh', 'engineer').click();
    await fixture.whenStable();
    backend.expectNone({ method: 'PATCH' });
    expect(notifier.error).toHaveBeenCalledWith(
      'Eli Marsh needs at least one role. To take them off the team, use Remove.',
    );
    backend.expectOne('/api/teams/t-tal/members').flush(MEMBERS);
    await fixture.whenStable();
    expect(selectedRoles('Eli Marsh')).toEqual(['engineer']);
  });
});
