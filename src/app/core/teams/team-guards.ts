import { inject } from '@angular/core';
import { CanActivateFn, Router } from '@angular/router';
import { catchError, map, of } from 'rxjs';
import { Permission } from '../api-types';
import { AuthService } from '../auth/auth-service';
import { TeamAccess } from './team-access';
import { Notifier } from '../layout/notifier';

const PERMISSION_WORDS: Readonly<Record<Permission, string>> = {
  'team:read': 'read this team',
  'members:manage': 'manage members',
  'vehicle:manage': 'manage vehicles',
  'vehicle:edit': 'edit vehicle data',
  'design:edit': 'edit axle designs',
  'design:propose': 'propose geometry',
  'design:accept': 'accept proposals',
  'review:decide': 'decide reviews',
  'review:submit': 'submit configurations for review',
  'review:comment': 'comment on reviews',
  'study:run': 'run tolerance studies and design sweeps',
};

/**
 * `teams/:teamId`: loads the team (with the caller's permissions) and makes
 * it the current team. Not a member (404) → the team list; the interceptor
 * has already said why.
 */
export const teamMemberGuard: CanActivateFn = (route) => {
  const teamId = route.paramMap.get('teamId') ?? '';
  const access = inject(TeamAccess);
  const auth = inject(AuthService);
  const router = inject(Router);
  return access.load(teamId).pipe(
    map(() => {
      auth.switchTeam(teamId);
      return true;
    }),
    catchError(() => of(router.parseUrl('/teams'))),
  );
};

/**
 * Only users holding `permission` in the route's team; others go back to
 * the team dashboard with a message. Use below `teamMemberGuard`.
 */
export function permissionGuard(permission: Permission): CanActivateFn {
  return (route) => {
    const teamId = route.paramMap.get('teamId') ?? route.parent?.paramMap.get('teamId') ?? '';
    const access = inject(TeamAccess);
    const router = inject(Router);
    const notifier = inject(Notifier);
    return access.load(teamId).pipe(
      map((team) => {
        if (team.permissions.includes(permission)) return true;
        void notifier.error(
          `Your roles in ${team.name} do not allow you to ${PERMISSION_WORDS[permission]}.`,
        );
        return router.createUrlTree(['/teams', teamId]);
      }),
      catchError(() => of(router.parseUrl('/teams'))),
    );
  };
}
