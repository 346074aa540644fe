import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';
import { AreaPlaceholder } from '../ui/area-placeholder';

export const EXPORTS_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('ecologist')],
    component: AreaPlaceholder,
    data: {
      title: 'Exports',
      icon: 'ios_share',
      message: 'Data exports are not in this version of Maculo yet.',
    },
  },
];
