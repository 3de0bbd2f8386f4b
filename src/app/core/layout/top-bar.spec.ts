import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, shellTestProviders } from '../../../testing/shell-testing';
import { Me, TeamDetail } from '../api-types';
import { AuthService } from '../auth/auth-service';
import { TeamAccess } from '../teams/team-access';
import { TopBar } from './top-bar';

const team = (roles: TeamDetail['roles'], permissions: TeamDetail['permissions']): TeamDetail => ({
  id: 't-tal',
  name: 'Tallowmere University Racing',
  slug: 'tallowmere',
  roles,
  permissions,
});
const me = (instructor: boolean, roles: TeamDetail['roles']): Me => ({
  user: { id: 'u1', email: 'someone@tallowmere.example', displayName: 'Someone', displayUnits: 'si', instructor },
  memberships: roles.length ? [{ teamId: 't-tal', teamName: 'Tallowmere University Racing', teamSlug: 'tallowmere', roles }] : [],
});

describe('TopBar links', () => {
  let backend: HttpTestingController;

  async function render(who: Me, detail: TeamDetail | null) {
    await TestBed.configureTestingModule({ imports: [TopBar], providers: shellTestProviders(fakeNotifier()) }).compileComponents();
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(AuthService).refresh().subscribe();
    backend.expectOne('/api/auth/me').flush(who);
    if (detail) {
      TestBed.inject(TeamAccess).load('t-tal').subscribe();
      backend.expectOne('/api/teams/t-tal').flush(detail);
    }
    const fixture = TestBed.createComponent(TopBar);
    await fixture.whenStable();
    // Owners' bars ask once whether the development mail page exists.
    backend.match((r) => r.method === 'HEAD').forEach((r) => r.flush(null, { status: 404, statusText: 'Not Found' }));
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    const links = (label: string) =>
      [...root.querySelectorAll(`nav[aria-label="${label}"] a`)].map((a) => [a.textContent?.trim(), a.getAttribute('href')]);
    return { root, links };
  }

  afterEach(() => backend.verify());

  it('gives owners Activity, Members and Programmes of the team', async () => {
    const { links } = await render(me(false, ['owner']), team(['owner'], ['team:read', 'members:manage']));
    expect(links('Team sections')).toEqual([
      ['Vehicles', '/teams/t-tal'],
      ['Activity', '/teams/t-tal/activity'],
      ['Members', '/teams/t-tal/members'],
      ['Programmes', '/teams/t-tal/programmes'],
    ]);
    expect(links('Instructor')).toEqual([]);
  });

  it('gives a viewer Vehicles and Activity only', async () => {
    const { links } = await render(me(false, ['viewer']), team(['viewer'], ['team:read']));
    expect(links('Team sections')).toEqual([
      ['Vehicles', '/teams/t-tal'],
      ['Activity', '/teams/t-tal/activity'],
    ]);
  });

  it('gives an instructor without a team the programmes link', async () => {
    const { links } = await render(me(true, []), null);
    expect(links('Instructor')).toEqual([['My programmes', '/programmes']]);
    expect(links('Team sections')).toEqual([]);
  });
});
