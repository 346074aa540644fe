import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';
import { AreaPlaceholder } from '../ui/area-placeholder';

export const UPLOADS_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('volunteer')],
    component: AreaPlaceholder,
    data: {
      title: 'Card uploads',
      icon: 'sd_card',
      message:
        'Uploading memory cards is not in this version of Maculo yet. No photos have been uploaded.',
    },
  },
];
