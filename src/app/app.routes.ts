import { Routes } from '@angular/router';
import { homeRedirectGuard, signedInGuard, signedOutGuard } from './core/auth/auth-guards';
import { NotFoundPage } from './core/layout/not-found-page';
import { permissionGuard, teamMemberGuard } from './core/teams/team-guards';

/**
 * Every screen loads lazily. Team screens live under `teams/:teamId`, whose
 * guard loads the team with the caller's permissions (TeamAccess) first; the
 * vehicle and axle-design screens come from features/feature.routes.ts.
 */
export const routes: Routes = [
  { path: '', pathMatch: 'full', canActivate: [homeRedirectGuard], children: [] },
  {
    path: 'sign-in',
    title: 'Sign in · Rollwise',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./auth/sign-in-page').then((m) => m.SignInPage),
  },
  {
    path: 'register',
    title: 'Create an account · Rollwise',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./auth/register-page').then((m) => m.RegisterPage),
  },
  {
    path: 'account',
    title: 'Account · Rollwise',
    canActivate: [signedInGuard],
    loadComponent: () => import('./account/account-page').then((m) => m.AccountPage),
  },
  {
    path: 'teams',
    title: 'Your teams · Rollwise',
    pathMatch: 'full',
    canActivate: [signedInGuard],
    loadComponent: () => import('./teams/team-list-page').then((m) => m.TeamListPage),
  },
  {
    path: 'teams/:teamId',
    canActivate: [signedInGuard, teamMemberGuard],
    children: [
      {
        path: '',
        pathMatch: 'full',
        title: 'Vehicles · Rollwise',
        loadComponent: () =>
          import('./teams/team-dashboard-page').then((m) => m.TeamDashboardPage),
      },
      {
        path: 'members',
        title: 'Members · Rollwise',
        canActivate: [permissionGuard('members:manage')],
        loadComponent: () => import('./teams/members-page').then((m) => m.MembersPage),
      },
      {
        // Vehicle, axle-design, balance, compare and report screens.
        path: '',
        loadChildren: () => import('./features/feature.routes').then((m) => m.FEATURE_ROUTES),
      },
    ],
  },
  { path: '**', title: 'Page not found · Rollwise', component: NotFoundPage },
];
