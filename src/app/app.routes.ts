import { Routes } from '@angular/router';
import { sessionKnownGuard } from './auth/session-known-guard';
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
    path: 'forgot-password',
    title: 'Reset your password · Rollwise',
    canActivate: [signedOutGuard],
    loadComponent: () =>
      import('./auth/forgot-password-page').then((m) => m.ForgotPasswordPage),
  },
  // The links Rollwise mails (server/services: PUBLIC_URL/reset-password/<token>,
  // /verify-email/<token>, /invitations/<token>). Open to everyone: the token
  // is the credential, and each page adapts to whoever is signed in (so the
  // guard first learns whether this browser holds a session).
  {
    path: 'reset-password/:token',
    canActivate: [sessionKnownGuard],
    title: 'Choose a new password · Rollwise',
    loadComponent: () => import('./auth/reset-password-page').then((m) => m.ResetPasswordPage),
  },
  {
    path: 'verify-email/:token',
    canActivate: [sessionKnownGuard],
    title: 'Confirm your e-mail address · Rollwise',
    loadComponent: () => import('./auth/verify-email-page').then((m) => m.VerifyEmailPage),
  },
  {
    path: 'invitations/:token',
    canActivate: [sessionKnownGuard],
    title: 'Team invitation · Rollwise',
    loadComponent: () => import('./invitations/invitation-page').then((m) => m.InvitationPage),
  },
  {
    // One's own mail, on development servers only (the API route is absent in production).
    path: 'dev-mail',
    title: 'Development mail · Rollwise',
    canActivate: [signedInGuard],
    loadComponent: () => import('./dev-mail/dev-mail-page').then((m) => m.DevMailPage),
  },
  {
    path: 'account',
    title: 'Account · Rollwise',
    canActivate: [signedInGuard],
    loadComponent: () => import('./account/account-page').then((m) => m.AccountPage),
  },
  // Programmes (instructors): the page itself tells anyone else what they are.
  {
    path: 'programmes',
    title: 'Programmes · Rollwise',
    pathMatch: 'full',
    canActivate: [signedInGuard],
    loadComponent: () => import('./programmes/programme-list-page').then((m) => m.ProgrammeListPage),
  },
  {
    path: 'programmes/:programmeId',
    title: 'Programme · Rollwise',
    pathMatch: 'full',
    canActivate: [signedInGuard],
    loadComponent: () => import('./programmes/programme-page').then((m) => m.ProgrammePage),
  },
  {
    path: 'programmes/:programmeId/snapshots/:snapshotId',
    title: 'Programme snapshot · Rollwise',
    canActivate: [signedInGuard],
    loadComponent: () => import('./programmes/snapshot-page').then((m) => m.SnapshotPage),
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
        path: 'programmes',
        title: 'Programmes · Rollwise',
        canActivate: [permissionGuard('members:manage')],
        loadComponent: () =>
          import('./programmes/team-programmes-page').then((m) => m.TeamProgrammesPage),
      },
      {
        path: 'activity',
        title: 'Activity · Rollwise',
        loadComponent: () => import('./activity/activity-page').then((m) => m.ActivityPage),
      },
      {
        path: 'activity/axle-designs/:designId',
        title: 'Axle design activity · Rollwise',
        loadComponent: () => import('./activity/activity-page').then((m) => m.ActivityPage),
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
