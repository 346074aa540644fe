import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';
import { AreaPlaceholder } from '../ui/area-placeholder';

export const CURATE_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('curator')],
    component: AreaPlaceholder,
    data: {
      title: 'Curate',
      icon: 'merge_type',
      message: 'Curation (disputes, merges and splits) is not in this version of Maculo yet.',
    },
  },
];
