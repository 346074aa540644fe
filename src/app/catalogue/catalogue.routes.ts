import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';
import { AreaPlaceholder } from '../ui/area-placeholder';

export const CATALOGUE_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('reviewer')],
    component: AreaPlaceholder,
    data: {
      title: 'Catalogue',
      icon: 'pets',
      message:
        'The catalogue of individuals is not in this version of Maculo yet. No individuals are catalogued.',
    },
  },
];
