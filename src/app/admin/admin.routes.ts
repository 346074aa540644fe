import type { Routes } from '@angular/router';
import { AdminLayout } from './admin-layout';

export const ADMIN_ROUTES: Routes = [
  {
    path: '',
    component: AdminLayout,
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'users' },
      {
        path: 'users',
        title: 'Users · Maculo',
        loadComponent: () => import('./users-page').then((m) => m.UsersPage),
      },
      {
        path: 'projects',
        title: 'Projects · Maculo',
        loadComponent: () => import('./projects-admin-page').then((m) => m.ProjectsAdminPage),
      },
      {
        path: 'memberships',
        title: 'Memberships · Maculo',
        loadComponent: () => import('./memberships-page').then((m) => m.MembershipsPage),
      },
      {
        path: 'data',
        title: 'Backup and import · Maculo',
        loadComponent: () => import('./data-page').then((m) => m.DataPage),
      },
      {
        path: 'outbox',
        title: 'Outbox · Maculo',
        loadComponent: () => import('./outbox-page').then((m) => m.OutboxPage),
      },
    ],
  },
];
