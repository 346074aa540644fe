import { roleAtLeast, type ProjectRole } from '../../../shared/roles';

/** One entry of the project's side navigation. */
export interface NavItem {
  path: string;
  label: string;
  icon: string;
  minRole: ProjectRole;
}

/** The project areas in workflow order, each with the lowest role that may open it. */
export const PROJECT_NAV: readonly NavItem[] = [
  { path: 'overview', label: 'Overview', icon: 'dashboard', minRole: 'volunteer' },
  { path: 'stations', label: 'Stations', icon: 'location_on', minRole: 'volunteer' },
  { path: 'uploads', label: 'Card uploads', icon: 'sd_card', minRole: 'volunteer' },
  { path: 'sort', label: 'Sort', icon: 'filter_list', minRole: 'reviewer' },
  { path: 'identify', label: 'Identify', icon: 'fingerprint', minRole: 'reviewer' },
  { path: 'catalogue', label: 'Catalogue', icon: 'pets', minRole: 'reviewer' },
  { path: 'curate', label: 'Curate', icon: 'merge_type', minRole: 'curator' },
  { path: 'estimates', label: 'Estimates', icon: 'insights', minRole: 'ecologist' },
  { path: 'exports', label: 'Exports', icon: 'ios_share', minRole: 'ecologist' },
  { path: 'team', label: 'Team', icon: 'group', minRole: 'volunteer' },
];

/** The navigation a role sees; admins without a role see only the team page (to grant roles). */
export function navFor(role: ProjectRole | null, isAdmin = false): NavItem[] {
  if (!role) return isAdmin ? PROJECT_NAV.filter((item) => item.path === 'team') : [];
  return PROJECT_NAV.filter((item) => roleAtLeast(role, item.minRole));
}
