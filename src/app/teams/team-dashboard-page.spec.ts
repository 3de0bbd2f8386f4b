import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../testing/shell-testing';
import { Permission, TeamDetail, VehicleSummary } from '../core/api-types';
import { TeamAccess } from '../core/teams/team-access';
import { TeamDashboardPage } from './team-dashboard-page';
import { settle } from '../../testing/settle';

const VEHICLES: VehicleSummary[] = [
  { id: 'v-ember', name: 'TUR-26 Ember', archived: false, revision: 2, updatedAt: '2026-11-30T09:15:00.000Z', updatedByName: 'Eli Marsh' },
  { id: 'v-cinder', name: 'TUR-25 Cinder', archived: false, revision: 7, updatedAt: '2026-10-01T12:00:00.000Z', updatedByName: null },
];

function team(roles: TeamDetail['roles'], permissions: Permission[]): TeamDetail {
  return { id: 't-tal', name: 'Tallowmere University Racing', slug: 'tallowmere', roles, permissions };
}

describe('TeamDashboardPage', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(async () => {
    notifier = fakeNotifier();
    await TestBed.configureTestingModule({
      imports: [TeamDashboardPage],
      providers: shellTestProviders(notifier),
    }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  async function render(detail: TeamDetail) {
    TestBed.inject(TeamAccess).load(detail.id).subscribe();
    backend.expectOne('/api/teams/t-tal').flush(detail);
    const fixture = TestBed.createComponent(TeamDashboardPage);
    fixture.componentRef.setInput('teamId', 't-tal');
    await settle();
    return { fixture, root: fixture.nativeElement as HTMLElement };
  }

  it('shows a loading state, then the vehicles, to a viewer without any command', async () => {
    const { root } = await render(team(['viewer'], ['team:read']));
    expect(root.querySelector('[role="status"]')?.textContent).toContain('Loading vehicles');
    backend.expectOne('/api/teams/t-tal/vehicles').flush(VEHICLES);
    await settle();
    expect([...root.querySelectorAll('a.vehicle-link')].map((a) => a.textContent?.trim())).toEqual([
      'TUR-26 Ember',
      'TUR-25 Cinder',
    ]);
    const buttonTexts = [...root.querySelectorAll('button')].map((b) => b.textContent?.trim());
    expect(buttonTexts.some((t) => t?.includes('New vehicle'))).toBe(false);
    expect(root.querySelector('[aria-label^="Rename"]')).toBeNull();
  });

  it('links every member to the team’s configurations and their review', async () => {
    const { root } = await render(team(['viewer'], ['team:read']));
    backend.expectOne('/api/teams/t-tal/vehicles').flush(VEHICLES);
    await settle();
    const link = [...root.querySelectorAll('a')].find((a) => a.textContent?.trim() === 'Configurations and review');
    expect(link?.getAttribute('href')).toBe('/teams/t-tal/configurations');
  });

  it('gives an engineer the new-vehicle, rename and archive commands', async () => {
    const { root } = await render(
      team(['engineer'], ['team:read', 'vehicle:manage', 'vehicle:edit', 'design:propose']),
    );
    backend.expectOne('/api/teams/t-tal/vehicles').flush(VEHICLES);
    await settle();
    const buttonTexts = [...root.querySelectorAll('button')].map((b) => b.textContent?.trim());
    expect(buttonTexts.some((t) => t?.includes('New vehicle'))).toBe(true);
    expect(root.querySelector('[aria-label="Rename TUR-26 Ember"]')).not.toBeNull();
    expect(root.querySelector('[aria-label="Archive TUR-25 Cinder"]')).not.toBeNull();
  });

  it('asks for archived vehicles too when "Show archived" is on', async () => {
    const { root } = await render(team(['viewer'], ['team:read']));
    backend.expectOne('/api/teams/t-tal/vehicles').flush([]);
    await settle();
    expect(root.textContent).toContain('No vehicles in use.');
    root.querySelector<HTMLButtonElement>('mat-slide-toggle button')!.click();
    await settle();
    const request = backend.expectOne((r) => r.url === '/api/teams/t-tal/vehicles');
    expect(request.request.params.get('archived')).toBe('true');
    request.flush([]);
  });

  it('shows an error state with a retry when the list fails', async () => {
    const { root } = await render(team(['viewer'], ['team:read']));
    backend.expectOne('/api/teams/t-tal/vehicles').flush(
      { error: { code: 'database_unavailable', message: 'The database is not reachable.' } },
      { status: 503, statusText: 'Service Unavailable' },
    );
    await settle();
    expect(root.querySelector('[role="alert"]')?.textContent).toContain('The database is not reachable.');
    [...root.querySelectorAll('button')].find((b) => b.textContent?.includes('Try again'))!.click();
    await settle();
    backend.expectOne('/api/teams/t-tal/vehicles').flush(VEHICLES);
    await settle();
    expect(root.querySelectorAll('a.vehicle-link').length).toBe(2);
  });
});
