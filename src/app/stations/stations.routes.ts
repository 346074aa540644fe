import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';

export const STATIONS_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('volunteer')],
    children: [
      { path: '', loadComponent: () => import('./stations-page').then((m) => m.StationsPage) },
      {
        path: 'deployments/:deploymentId',
        title: 'Deployment · Maculo',
        loadComponent: () => import('./deployment-page').then((m) => m.DeploymentPage),
      },
      {
        path: ':stationId',
        title: 'Station · Maculo',
        loadComponent: () => import('./station-page').then((m) => m.StationPage),
      },
    ],
  },
];
