import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';
import { AreaPlaceholder } from '../ui/area-placeholder';

export const SORT_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('reviewer')],
    component: AreaPlaceholder,
    data: {
      title: 'Sort',
      icon: 'filter_list',
      message: 'Sorting events is not in this version of Maculo yet. There are no events to sort.',
    },
  },
];
