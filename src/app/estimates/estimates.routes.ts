import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';
import { provideCharts } from '../ui/charts';
import { EstimatesLayout } from './estimates-layout';

export const ESTIMATES_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('ecologist')],
    component: EstimatesLayout,
    providers: [provideCharts()],
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'histories' },
      {
        path: 'histories',
        title: 'Capture histories · Estimates · Maculo',
        loadComponent: () => import('./histories-calculator').then((m) => m.HistoriesCalculator),
      },
      {
        path: 'secr',
        title: 'SECR density · Estimates · Maculo',
        loadComponent: () => import('./secr-calculator').then((m) => m.SecrCalculator),
      },
      {
        path: 'two-samples',
        title: 'Two samples · Estimates · Maculo',
        loadComponent: () => import('./two-sample-calculator').then((m) => m.TwoSampleCalculator),
      },
      {
        path: 'plots',
        title: 'Plot counts · Estimates · Maculo',
        loadComponent: () => import('./plots-calculator').then((m) => m.PlotsCalculator),
      },
      {
        path: 'catalogue',
        title: "From this project's catalogue · Estimates · Maculo",
        loadComponent: () => import('./session-builder').then((m) => m.SessionBuilder),
      },
      {
        path: 'analyses',
        title: 'Saved analyses · Estimates · Maculo',
        loadComponent: () => import('./analyses-list').then((m) => m.AnalysesList),
      },
      {
        path: 'analyses/:id',
        title: 'Analysis · Estimates · Maculo',
        loadComponent: () => import('./analysis-page').then((m) => m.AnalysisPage),
      },
      {
        path: 'analyses/:id/report',
        title: 'Analysis report · Estimates · Maculo',
        loadComponent: () => import('./analysis-report').then((m) => m.AnalysisReport),
      },
    ],
  },
];
