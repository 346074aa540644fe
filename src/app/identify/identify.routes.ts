import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';

export const IDENTIFY_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('reviewer')],
    loadComponent: () => import('./identify-page').then((m) => m.IdentifyPage),
  },
];
