import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';

export const SORT_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('reviewer')],
    children: [
      { path: '', loadComponent: () => import('./sort-page').then((m) => m.SortPage) },
      {
        path: 'batch',
        title: 'Batch sort · Maculo',
        loadComponent: () => import('./batch-page').then((m) => m.BatchPage),
      },
      {
        path: 'sorted',
        title: 'Sorted events · Maculo',
        loadComponent: () => import('./sorted-page').then((m) => m.SortedPage),
      },
    ],
  },
];
