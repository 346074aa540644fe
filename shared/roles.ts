/** Project roles, lowest first; a higher role includes every lower one. */
export const PROJECT_ROLES = ['volunteer', 'reviewer', 'curator', 'ecologist'] as const;

/** A role a user holds in one project. */
export type ProjectRole = (typeof PROJECT_ROLES)[number];

/** True when `held` includes everything `needed` may do. */
export function roleAtLeast(held: ProjectRole | null | undefined, needed: ProjectRole): boolean {
  if (!held) return false;
  return PROJECT_ROLES.indexOf(held) >= PROJECT_ROLES.indexOf(needed);
}

/** Human label of a role, for menus and e-mails. */
export const ROLE_LABELS: Record<ProjectRole, string> = {
  volunteer: 'Volunteer',
  reviewer: 'Reviewer',
  curator: 'Curator',
  ecologist: 'Ecologist',
};
