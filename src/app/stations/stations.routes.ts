import type { Routes } from '@angular/router';
import { projectRoleGuard } from '../core/guards';
import { AreaPlaceholder } from '../ui/area-placeholder';

export const STATIONS_ROUTES: Routes = [
  {
    path: '',
    canActivate: [projectRoleGuard('volunteer')],
    component: AreaPlaceholder,
    data: {
      title: 'Stations',
      icon: 'location_on',
      message:
        'Stations and deployments are not in this version of Maculo yet. Nothing has been recorded here.',
    },
  },
];
