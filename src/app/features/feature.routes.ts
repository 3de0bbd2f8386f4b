import { Routes } from '@angular/router';
import { permissionGuard } from '../core/teams/team-guards';
import { unsavedChangesGuard } from './unsaved-changes';

/**
 * Team screens below `teams/:teamId` (vehicle, axle design, …), lazily
 * loaded by app.routes.ts. Owned by the screens work (issue 6).
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
];
