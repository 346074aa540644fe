import type { MeResponse, SessionUser } from '../../shared/auth';
import type { AdminUserView } from '../../shared/admin';
import type { ProjectRole } from '../../shared/roles';
import { hashPassword } from '../auth/passwords';
import type { Db } from '../db/database';
import type { UsersTable } from '../db/schema/users.table';
import { ApiError } from '../errors/api-error';
import { recordAudit } from './audit.service';
import { newId, nowIso } from './ids';

/** The API view of a user row. */
export function toSessionUser(
  row: Pick<UsersTable, 'id' | 'email' | 'name' | 'is_admin'>,
): SessionUser {
  return { id: row.id, email: row.email, name: row.name, isAdmin: row.is_admin === 1 };
}

/** The signed-in user with their memberships (answer of sign-in and `/auth/me`). */
export async function meFor(db: Db, userId: string): Promise<MeResponse> {
  const user = await db
    .selectFrom('users')
    .selectAll()
    .where('id', '=', userId)
    .executeTakeFirstOrThrow();
  const memberships = await db
    .selectFrom('memberships')
    .innerJoin('projects', 'projects.id', 'memberships.project_id')
    .select(['projects.slug as projectSlug', 'memberships.role'])
    .where('memberships.user_id', '=', userId)
    .orderBy('projects.name')
    .execute();
  return {
    user: toSessionUser(user),
    memberships: memberships.map((m) => ({
      projectSlug: m.projectSlug,
      role: m.role as ProjectRole,
    })),
  };
}

/** Creates an account; the e-mail must be new. */
export async function createUser(
  db: Db,
  input: { email: string; name: string; password?: string | null; isAdmin?: boolean },
  actorId: string | null,
): Promise<UsersTable> {
  const email = input.email.trim().toLowerCase();
  const existing = await db
    .selectFrom('users')
    .select('id')
    .where('email', '=', email)
    .executeTakeFirst();
  if (existing) throw new ApiError('conflict', 'An account with this e-mail already exists.');
  const row: UsersTable = {
    id: newId(),
    email,
    name: input.name.trim(),
    password_hash: input.password ? await hashPassword(input.password) : null,
    is_admin: input.isAdmin ? 1 : 0,
    disabled: 0,
    created_at: nowIso(),
    last_login_at: null,
  };
  await db.transaction().execute(async (trx) => {
    await trx.insertInto('users').values(row).execute();
    await recordAudit(trx, {
      userId: actorId,
      action: 'create',
      entity: 'user',
      entityId: row.id,
      after: { email: row.email, name: row.name, isAdmin: row.is_admin === 1 },
    });
  });
  return row;
}

/** Every account with its memberships, for the admin pages. */
export async function listUsers(db: Db): Promise<AdminUserView[]> {
  const users = await db.selectFrom('users').selectAll().orderBy('name').execute();
  const memberships = await db
    .selectFrom('memberships')
    .innerJoin('projects', 'projects.id', 'memberships.project_id')
    .select(['memberships.user_id', 'projects.slug', 'memberships.role'])
    .execute();
  return users.map((u) => ({
    id: u.id,
    email: u.email,
    name: u.name,
    isAdmin: u.is_admin === 1,
    disabled: u.disabled === 1,
    createdAt: u.created_at,
    lastLoginAt: u.last_login_at,
    memberships: memberships
      .filter((m) => m.user_id === u.id)
      .map((m) => ({ projectSlug: m.slug, role: m.role })),
  }));
}

/** Changes name, admin flag or disabled state; disabling ends the user's sessions at once. */
export async function updateUser(
  db: Db,
  userId: string,
  patch: { name?: string; isAdmin?: boolean; disabled?: boolean },
  actorId: string,
): Promise<void> {
  const before = await db
    .selectFrom('users')
    .selectAll()
    .where('id', '=', userId)
    .executeTakeFirst();
  if (!before) throw new ApiError('not_found', 'This user was not found.');
  if (userId === actorId && (patch.disabled === true || patch.isAdmin === false)) {
    throw new ApiError('conflict', 'You cannot disable yourself or remove your own admin rights.');
  }
  const set: Partial<UsersTable> = {};
  if (patch.name !== undefined) set.name = patch.name;
  if (patch.isAdmin !== undefined) set.is_admin = patch.isAdmin ? 1 : 0;
  if (patch.disabled !== undefined) set.disabled = patch.disabled ? 1 : 0;
  if (Object.keys(set).length === 0) return;
  await db.transaction().execute(async (trx) => {
    await trx.updateTable('users').set(set).where('id', '=', userId).execute();
    if (patch.disabled) await trx.deleteFrom('sessions').where('user_id', '=', userId).execute();
    await recordAudit(trx, {
      userId: actorId,
      action: 'update',
      entity: 'user',
      entityId: userId,
      before: {
        name: before.name,
        isAdmin: before.is_admin === 1,
        disabled: before.disabled === 1,
      },
      after: patch,
    });
  });
}

/** Sets a new password hash and ends the user's other sessions. */
export async function setPassword(
  db: Db,
  userId: string,
  password: string,
  keepSid?: string,
): Promise<void> {
  const hash = await hashPassword(password);
  await db.transaction().execute(async (trx) => {
    await trx.updateTable('users').set({ password_hash: hash }).where('id', '=', userId).execute();
    let ended = trx.deleteFrom('sessions').where('user_id', '=', userId);
    if (keepSid) ended = ended.where('sid', '!=', keepSid);
    await ended.execute();
    await recordAudit(trx, { userId, action: 'change-password', entity: 'user', entityId: userId });
  });
}
