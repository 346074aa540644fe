import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';

export const UPLOADS_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('volunteer')],
    children: [
      { path: '', loadComponent: () => import('./uploads-page').then((m) => m.UploadsPage) },
      {
        path: 'new',
        title: 'Upload a card · Maculo',
        loadComponent: () => import('./new-upload-page').then((m) => m.NewUploadPage),
      },
      {
        path: ':uploadId',
        title: 'Card · Maculo',
        loadComponent: () => import('./upload-page').then((m) => m.UploadPage),
      },
    ],
  },
];
