import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { fakeNotifier, FakeNotifier, shellTestProviders } from '../../../testing/shell-testing';
import {
  ActivatedRouteSnapshot,
  convertToParamMap,
  Router,
  RouterStateSnapshot,
  UrlTree,
} from '@angular/router';
import { firstValueFrom, isObservable, Observable, of } from 'rxjs';
import { TeamDetail } from '../api-types';
import { AuthService } from '../auth/auth-service';
import { permissionGuard, teamMemberGuard } from './team-guards';

const VIEWER_TEAM: TeamDetail = {
  id: 't-tal',
  name: 'Tallowmere University Racing',
  slug: 'tallowmere',
  roles: ['viewer'],
  permissions: ['team:read'],
};

function routeFor(teamId: string): ActivatedRouteSnapshot {
  return { paramMap: convertToParamMap({ teamId }) } as ActivatedRouteSnapshot;
}

async function run(guard: typeof teamMemberGuard, teamId: string): Promise<boolean | UrlTree> {
  const result = TestBed.runInInjectionContext(() =>
    guard(routeFor(teamId), { url: `/teams/${teamId}` } as RouterStateSnapshot),
  );
  const value$ = isObservable(result) ? result : of(result);
  return (await firstValueFrom(value$ as Observable<unknown>)) as boolean | UrlTree;
}

describe('team guards', () => {
  let backend: HttpTestingController;
  let notifier: FakeNotifier;

  beforeEach(() => {
    localStorage.clear();
    notifier = fakeNotifier();
    TestBed.configureTestingModule({
      providers: shellTestProviders(notifier),
    });
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  it('lets a member in and makes the team current', async () => {
    const switchTeam = vi.spyOn(TestBed.inject(AuthService), 'switchTeam');
    const verdict = run(teamMemberGuard, 't-tal');
    backend.expectOne('/api/teams/t-tal').flush(VIEWER_TEAM);
    expect(await verdict).toBe(true);
    expect(switchTeam).toHaveBeenCalledWith('t-tal');
  });

  it('sends a non-member (404) to the team list', async () => {
    const verdict = run(teamMemberGuard, 't-other');
    backend.expectOne('/api/teams/t-other').flush(
      { error: { code: 'not_found', message: 'Team not found' } },
      { status: 404, statusText: 'Not Found' },
    );
    const router = TestBed.inject(Router);
    expect(router.serializeUrl((await verdict) as UrlTree)).toBe('/teams');
  });

  it('turns away a member without the permission, back to the team page, and says why', async () => {
    const verdict = run(permissionGuard('members:manage'), 't-tal');
    backend.expectOne('/api/teams/t-tal').flush(VIEWER_TEAM);
    const router = TestBed.inject(Router);
    expect(router.serializeUrl((await verdict) as UrlTree)).toBe('/teams/t-tal');
    expect(notifier.error).toHaveBeenCalledWith(
      'Your roles in Tallowmere University Racing do not allow you to manage members.',
    );
  });

  it('lets a member holding the permission through, reusing the loaded team', async () => {
    const first = run(teamMemberGuard, 't-tal');
    backend.expectOne('/api/teams/t-tal').flush(VIEWER_TEAM);
    await first;
    expect(await run(permissionGuard('team:read'), 't-tal')).toBe(true);
    backend.expectNone('/api/teams/t-tal');
  });
});
