import type { Routes } from '@angular/router';
import { provideCharts } from '../ui/charts';

export const OVERVIEW_ROUTES: Routes = [
  {
    path: '',
    providers: [provideCharts()],
    loadComponent: () => import('./overview-page').then((m) => m.OverviewPage),
  },
];
