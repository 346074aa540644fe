import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';

export const CATALOGUE_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('reviewer')],
    children: [
      { path: '', loadComponent: () => import('./catalogue-page').then((m) => m.CataloguePage) },
      {
        path: ':idOrCode',
        title: 'Individual · Maculo',
        loadComponent: () => import('./individual-page').then((m) => m.IndividualPage),
      },
    ],
  },
];
