import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';

export const EXPORTS_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('ecologist', { allowAdmin: true })],
    loadComponent: () => import('./exports-page').then((m) => m.ExportsPage),
  },
];
