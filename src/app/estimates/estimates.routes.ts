import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';
import { AreaPlaceholder } from '../ui/area-placeholder';

export const ESTIMATES_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('ecologist')],
    component: AreaPlaceholder,
    data: {
      title: 'Estimates',
      icon: 'insights',
      message: 'Abundance and density estimates are not in this version of Maculo yet.',
    },
  },
];
