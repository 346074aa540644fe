import type { MemberView } from '../../shared/projects';
import { PROJECT_ROLES, type ProjectRole } from '../../shared/roles';
import type { Db } from '../db/database';
import { ApiError } from '../errors/api-error';
import { recordAudit } from './audit.service';
import { nowIso } from './ids';

/** A project's members; e-mails only for those who manage the team. */
export async function listMembers(
  db: Db,
  projectId: string,
  showEmails: boolean,
): Promise<MemberView[]> {
  const rows = await db
    .selectFrom('memberships')
    .innerJoin('users', 'users.id', 'memberships.user_id')
    .select([
      'users.id',
      'users.name',
      'users.email',
      'users.disabled',
      'memberships.role',
      'memberships.created_at',
    ])
    .where('memberships.project_id', '=', projectId)
    .execute();
  const order = (role: string) => -PROJECT_ROLES.indexOf(role as ProjectRole);
  return rows
    .map((r) => ({
      userId: r.id,
      name: r.name,
      email: showEmails ? r.email : null,
      role: r.role as ProjectRole,
      disabled: r.disabled === 1,
      since: r.created_at,
    }))
    .sort((a, b) => order(a.role) - order(b.role) || a.name.localeCompare(b.name));
}

/** Grants or changes a member's role (creates the membership when needed). */
export async function setMemberRole(
  db: Db,
  projectId: string,
  userId: string,
  role: ProjectRole,
  actorId: string,
): Promise<void> {
  const user = await db
    .selectFrom('users')
    .select('id')
    .where('id', '=', userId)
    .executeTakeFirst();
  if (!user) throw new ApiError('not_found', 'This user was not found.');
  await db.transaction().execute(async (trx) => {
    const before = await trx
      .selectFrom('memberships')
      .select('role')
      .where('project_id', '=', projectId)
      .where('user_id', '=', userId)
      .executeTakeFirst();
    await trx
      .insertInto('memberships')
      .values({ project_id: projectId, user_id: userId, role, created_at: nowIso() })
      .onConflict((oc) => oc.columns(['project_id', 'user_id']).doUpdateSet({ role }))
      .execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId,
      action: before ? 'change-role' : 'grant-role',
      entity: 'membership',
      entityId: userId,
      before: before ? { role: before.role } : null,
      after: { role },
    });
  });
}

/** Removes a member from a project. */
export async function removeMember(
  db: Db,
  projectId: string,
  userId: string,
  actorId: string,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const result = await trx
      .deleteFrom('memberships')
      .where('project_id', '=', projectId)
      .where('user_id', '=', userId)
      .returning('role')
      .executeTakeFirst();
    if (!result) throw new ApiError('not_found', 'This person is not a member of the project.');
    await recordAudit(trx, {
      userId: actorId,
      projectId,
      action: 'remove-member',
      entity: 'membership',
      entityId: userId,
      before: { role: result.role },
    });
  });
}
