import { Routes } from '@angular/router';

/**
 * Team screens below `teams/:teamId` (vehicle, axle design, …), lazily
 * loaded by app.routes.ts. Owned by the screens work (issue 6).
 */
export const FEATURE_ROUTES: Routes = [];
