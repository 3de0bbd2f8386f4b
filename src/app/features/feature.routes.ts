import { Routes } from '@angular/router';
import { permissionGuard } from '../core/teams/team-guards';
import { unsavedChangesGuard } from './unsaved-changes';

/**
 * Team screens below `teams/:teamId` (vehicle, axle design, …), lazily
 * loaded by app.routes.ts. Owned by the screens work (issues 6 and 7).
 */
export const FEATURE_ROUTES: Routes = [
  {
    path: 'vehicles/:vehicleId',
    pathMatch: 'full',
    title: 'Vehicle · Rollwise',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./vehicle/vehicle-page').then((m) => m.VehiclePage),
  },
  {
    path: 'vehicles/:vehicleId/balance',
    title: 'Balance · Rollwise',
    loadComponent: () => import('./balance/balance-page').then((m) => m.BalancePage),
  },
  {
    path: 'vehicles/:vehicleId/compare',
    title: 'Compare axle designs · Rollwise',
    loadComponent: () => import('./compare/compare-page').then((m) => m.ComparePage),
  },
  {
    path: 'vehicles/:vehicleId/axle-designs/:designId',
    title: 'Axle design · Rollwise',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./axle-design/axle-design-page').then((m) => m.AxleDesignPage),
  },
  {
    path: 'vehicles/:vehicleId/axle-designs/:designId/report',
    title: 'Axle design report · Rollwise',
    loadComponent: () => import('./report/design-report-page').then((m) => m.DesignReportPage),
  },
  {
    path: 'vehicles/:vehicleId/axle-designs/:designId/intent',
    title: 'Handling intent · Rollwise',
    canActivate: [permissionGuard('design:propose')],
    loadComponent: () => import('./intent/intent-page').then((m) => m.IntentPage),
  },
  {
    // Configurations (vehicle revision + both axle design revisions + track profile) and their review (issue 7).
    path: 'configurations',
    pathMatch: 'full',
    title: 'Configurations · Rollwise',
    loadComponent: () => import('./configurations/configurations-page').then((m) => m.ConfigurationsPage),
  },
  {
    // Tolerance studies and design sweeps (issue 16): the team's list, a new study, one study's progress and results.
    path: 'studies',
    pathMatch: 'full',
    title: 'Studies · Rollwise',
    loadComponent: () => import('./studies/studies-page').then((m) => m.StudiesPage),
  },
  {
    path: 'studies/:studyId',
    title: 'Study · Rollwise',
    loadComponent: () => import('./studies/study-page').then((m) => m.StudyPage),
  },
  {
    // The configuration review record, laid out for filing (print and PDF).
    path: 'configurations/:configurationId/record',
    title: 'Review record · Rollwise',
    loadComponent: () => import('./report/review-record-page').then((m) => m.ReviewRecordPage),
  },
  {
    // The page review mail links to (PUBLIC_URL/teams/:teamId/configurations/:id).
    path: 'configurations/:configurationId',
    title: 'Configuration · Rollwise',
    loadComponent: () => import('./configurations/configuration-page').then((m) => m.ConfigurationPage),
  },
];
