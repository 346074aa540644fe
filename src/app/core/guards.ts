import { inject } from '@angular/core';
import { Router, type CanActivateFn, type CanMatchFn } from '@angular/router';
import { roleAtLeast, type ProjectRole } from '../../../shared/roles';
import { AuthStore } from './auth-store';

/** Pages for signed-in people; others go to the sign-in page and come back after. */
export const signedInGuard: CanActivateFn = async (_route, state) => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  const me = await auth.ensureLoaded();
  return me ? true : router.createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } });
};

/** Admin pages (the server refuses non-admins anyway; this only keeps the menu honest). */
export const adminGuard: CanMatchFn = async () => {
  const auth = inject(AuthStore);
  const me = await auth.ensureLoaded();
  return me?.user.isAdmin ? true : inject(Router).createUrlTree(['/not-allowed']);
};

/** A project page that needs at least `role` in the project named by the `:slug` parameter. */
export function projectRoleGuard(
  role: ProjectRole,
  options: { allowAdmin?: boolean } = {},
): CanActivateFn {
  return async (route) => {
    const auth = inject(AuthStore);
    const router = inject(Router);
    const me = await auth.ensureLoaded();
    let slug: string | undefined;
    for (let r: typeof route | null = route; r && !slug; r = r.parent)
      slug = r.paramMap.get('slug') ?? undefined;
    if (!me || !slug) return router.createUrlTree(['/sign-in']);
    const held = auth.roleIn(slug);
    if (roleAtLeast(held, role) || (options.allowAdmin && me.user.isAdmin)) return true;
    return router.createUrlTree(['/not-allowed']);
  };
}

/** The first page after sign-in: the only project, or the list to choose from. */
export const homeRedirectGuard: CanActivateFn = async () => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  const me = await auth.ensureLoaded();
  if (!me) return router.createUrlTree(['/sign-in']);
  // An administrator reaches every project, so their home is always the list.
  if (!me.user.isAdmin && me.memberships.length === 1)
    return router.createUrlTree(['/p', me.memberships[0]!.projectSlug]);
  return router.createUrlTree(['/projects']);
};
