import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';

export const CURATE_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('curator')],
    loadComponent: () => import('./curate-page').then((m) => m.CuratePage),
  },
];
