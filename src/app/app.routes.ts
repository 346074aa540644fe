import type { Routes } from '@angular/router';
import { adminGuard, homeRedirectGuard, projectRoleGuard, signedInGuard } from './core/guards';
import { NotFoundPage } from './not-found/not-found-page';
import { ProjectLayout } from './projects/project-layout';
import { AppShell } from './shell/app-shell';

export const routes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · Maculo',
    loadComponent: () => import('./auth/sign-in-page').then((m) => m.SignInPage),
  },
  {
    path: 'forgot-password',
    title: 'Reset password · Maculo',
    loadComponent: () => import('./auth/forgot-password-page').then((m) => m.ForgotPasswordPage),
  },
  {
    path: 'reset-password/:token',
    title: 'New password · Maculo',
    loadComponent: () => import('./auth/reset-password-page').then((m) => m.ResetPasswordPage),
  },
  {
    path: 'invitations/:token',
    title: 'Invitation · Maculo',
    loadComponent: () =>
      import('./auth/accept-invitation-page').then((m) => m.AcceptInvitationPage),
  },
  {
    path: '',
    component: AppShell,
    canActivate: [signedInGuard],
    children: [
      { path: '', pathMatch: 'full', canActivate: [homeRedirectGuard], children: [] },
      {
        path: 'projects',
        title: 'Projects · Maculo',
        loadComponent: () => import('./projects/projects-page').then((m) => m.ProjectsPage),
      },
      {
        path: 'account',
        title: 'Account · Maculo',
        loadComponent: () => import('./auth/account-page').then((m) => m.AccountPage),
      },
      {
        path: 'admin',
        canMatch: [adminGuard],
        loadChildren: () => import('./admin/admin.routes').then((m) => m.ADMIN_ROUTES),
      },
      { path: 'not-allowed', component: NotFoundPage, data: { kind: 'not-allowed' } },
      {
        path: 'p/:slug',
        component: ProjectLayout,
        children: [
          { path: '', pathMatch: 'full', redirectTo: 'overview' },
          {
            path: 'overview',
            title: 'Overview · Maculo',
            canActivate: [projectRoleGuard('volunteer')],
            loadChildren: () => import('./projects/overview.routes').then((m) => m.OVERVIEW_ROUTES),
          },
          {
            path: 'settings',
            title: 'Settings · Maculo',
            canActivate: [projectRoleGuard('ecologist', { allowAdmin: true })],
            loadComponent: () =>
              import('./projects/project-settings-page').then((m) => m.ProjectSettingsPage),
          },
          {
            path: 'stations',
            title: 'Stations · Maculo',
            loadChildren: () => import('./stations/stations.routes').then((m) => m.STATIONS_ROUTES),
          },
          {
            path: 'uploads',
            title: 'Card uploads · Maculo',
            loadChildren: () => import('./uploads/uploads.routes').then((m) => m.UPLOADS_ROUTES),
          },
          {
            path: 'sort',
            title: 'Sort · Maculo',
            loadChildren: () => import('./sort/sort.routes').then((m) => m.SORT_ROUTES),
          },
          {
            path: 'identify',
            title: 'Identify · Maculo',
            loadChildren: () => import('./identify/identify.routes').then((m) => m.IDENTIFY_ROUTES),
          },
          {
            path: 'catalogue',
            title: 'Catalogue · Maculo',
            loadChildren: () =>
              import('./catalogue/catalogue.routes').then((m) => m.CATALOGUE_ROUTES),
          },
          {
            path: 'curate',
            title: 'Curate · Maculo',
            loadChildren: () => import('./curate/curate.routes').then((m) => m.CURATE_ROUTES),
          },
          {
            path: 'estimates',
            title: 'Estimates · Maculo',
            loadChildren: () =>
              import('./estimates/estimates.routes').then((m) => m.ESTIMATES_ROUTES),
          },
          {
            path: 'exports',
            title: 'Exports · Maculo',
            loadChildren: () => import('./exports/exports.routes').then((m) => m.EXPORTS_ROUTES),
          },
          {
            path: 'team',
            title: 'Team · Maculo',
            canActivate: [projectRoleGuard('volunteer', { allowAdmin: true })],
            loadChildren: () => import('./team/team.routes').then((m) => m.TEAM_ROUTES),
          },
        ],
      },
    ],
  },
  { path: '**', title: 'Not found · Maculo', component: NotFoundPage },
];
