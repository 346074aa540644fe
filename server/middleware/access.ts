import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { slugSchema } from '../../shared/ids';
import { ROLE_LABELS, roleAtLeast, type ProjectRole } from '../../shared/roles';
import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';

/** What a route requires; every API route carries exactly one guard with this tag. */
export type AccessRule =
  | { kind: 'public' }
  | { kind: 'signedIn' }
  | { kind: 'admin' }
  | { kind: 'project'; role: ProjectRole; allowAdmin: boolean }
  | { kind: 'photo'; role: ProjectRole };

/** A middleware that enforces an access rule and says which one (the access test reads it). */
export type Guard = RequestHandler & { access: AccessRule };

/** The project a project route works in, resolved by the guard before anything else. */
export interface ProjectContext {
  row: ProjectsTable;
  role: ProjectRole | null;
  /** True when an admin passes a guard that lets admins in without membership. */
  viaAdmin: boolean;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      project?: ProjectContext;
    }
  }
}

function tag(handler: RequestHandler, access: AccessRule): Guard {
  return Object.assign(handler, { access });
}

function requireUser(req: Request): Express.User {
  if (!req.user) throw new ApiError('unauthenticated', 'Please sign in first.');
  return req.user;
}

/** Marks a route as open to everyone (health, sign-in, invitation links). */
export function publicRoute(): Guard {
  return tag((_req, _res, next) => next(), { kind: 'public' });
}

/** Any signed-in user. */
export function signedIn(): Guard {
  return tag(
    (req, _res, next) => {
      requireUser(req);
      next();
    },
    { kind: 'signedIn' },
  );
}

/** Global admins only. */
export function adminOnly(): Guard {
  return tag(
    (req, _res, next) => {
      const user = requireUser(req);
      if (!user.isAdmin) throw new ApiError('forbidden', 'Only an administrator may do this.');
      next();
    },
    { kind: 'admin' },
  );
}

/** The project's role row for a user, or null when they are not a member. */
export async function membershipRole(
  db: Db,
  projectId: string,
  userId: string,
): Promise<ProjectRole | null> {
  const row = await db
    .selectFrom('memberships')
    .select('role')
    .where('project_id', '=', projectId)
    .where('user_id', '=', userId)
    .executeTakeFirst();
  return (row?.role as ProjectRole | undefined) ?? null;
}

/**
 * Project routes: resolves `:slug`, then checks sign-in, membership and role, before anything else.
 * `allowAdmin` lets global admins in without a membership (settings, members, invitations).
 */
export function projectRole(
  db: Db,
  role: ProjectRole,
  options: { allowAdmin?: boolean } = {},
): Guard {
  const allowAdmin = options.allowAdmin ?? false;
  const handler = async (req: Request, _res: Response, next: NextFunction) => {
    const user = requireUser(req);
    const slug = slugSchema.safeParse(req.params['slug']);
    if (!slug.success) throw new ApiError('bad_request', 'This project address is not valid.');
    const row = await db
      .selectFrom('projects')
      .selectAll()
      .where('slug', '=', slug.data)
      .executeTakeFirst();
    if (!row) throw new ApiError('not_found', `There is no project "${slug.data}".`);
    const held = await membershipRole(db, row.id, user.id);
    const viaAdmin = allowAdmin && user.isAdmin;
    if (!held && !viaAdmin)
      throw new ApiError('forbidden', 'You are not a member of this project.');
    if (!viaAdmin && !roleAtLeast(held, role)) {
      throw new ApiError(
        'forbidden',
        `This needs the ${ROLE_LABELS[role].toLowerCase()} role (or higher) in this project.`,
      );
    }
    req.project = { row, role: held, viaAdmin: viaAdmin && !roleAtLeast(held, role) };
    next();
  };
  return tag(handler as RequestHandler, { kind: 'project', role, allowAdmin });
}

/** The resolved project of a project route (the guard guarantees it). */
export function projectOf(req: Request): ProjectContext {
  if (!req.project) throw new Error('projectOf() used on a route without a project guard');
  return req.project;
}

/** The signed-in user of a guarded route. */
export function userOf(req: Request): Express.User {
  return requireUser(req);
}
