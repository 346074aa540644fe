import type { Routes } from '@angular/router';
import { TeamPage } from './team-page';

export const TEAM_ROUTES: Routes = [{ path: '', component: TeamPage }];
