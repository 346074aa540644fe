import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';
import { AreaPlaceholder } from '../ui/area-placeholder';

export const IDENTIFY_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('reviewer')],
    component: AreaPlaceholder,
    data: {
      title: 'Identify',
      icon: 'fingerprint',
      message:
        'Matching sightings to individuals is not in this version of Maculo yet. There are no sightings.',
    },
  },
];
