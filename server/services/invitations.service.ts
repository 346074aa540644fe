import type { InvitationPreview } from '../../shared/auth';
import type { InvitationView } from '../../shared/projects';
import { ROLE_LABELS, roleAtLeast, type ProjectRole } from '../../shared/roles';
import { hashPassword, verifyPassword } from '../auth/passwords';
import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import type { Mailer } from '../mail/mailer';
import { invitationMail } from '../mail/templates';
import { recordAudit } from './audit.service';
import { hashToken, newId, newToken, nowIso } from './ids';

const INVITATION_DAYS = 7;

/** Invites an e-mail address to a project with a role and sends the link. */
export async function inviteToProject(
  db: Db,
  mailer: Mailer,
  input: {
    project: ProjectsTable;
    email: string;
    role: ProjectRole;
    inviter: Express.User;
    inviterRole: ProjectRole | null;
    publicUrl: string;
  },
): Promise<InvitationView> {
  const { project, email, role, inviter } = input;
  if (!inviter.isAdmin && !roleAtLeast(input.inviterRole, role)) {
    throw new ApiError('forbidden', 'You can only invite people to a role at or below your own.');
  }
  const member = await db
    .selectFrom('memberships')
    .innerJoin('users', 'users.id', 'memberships.user_id')
    .select('users.id')
    .where('memberships.project_id', '=', project.id)
    .where('users.email', '=', email)
    .executeTakeFirst();
  if (member) throw new ApiError('conflict', 'This person is already a member of the project.');

  const token = newToken();
  const createdAt = nowIso();
  const expiresAt = nowIso(new Date(Date.now() + INVITATION_DAYS * 86_400_000));
  const id = newId();
  await db.transaction().execute(async (trx) => {
    await trx
      .insertInto('invitations')
      .values({
        id,
        project_id: project.id,
        email,
        role,
        token_hash: hashToken(token),
        invited_by: inviter.id,
        created_at: createdAt,
        expires_at: expiresAt,
        accepted_at: null,
        accepted_by: null,
      })
      .execute();
    await recordAudit(trx, {
      userId: inviter.id,
      projectId: project.id,
      action: 'invite',
      entity: 'invitation',
      entityId: id,
      after: { email, role },
    });
  });
  await mailer.send(
    invitationMail({
      to: email,
      inviterName: inviter.name,
      projectName: project.name,
      roleLabel: ROLE_LABELS[role],
      link: `${input.publicUrl}/invitations/${token}`,
      expiresAt,
    }),
  );
  return { id, email, role, invitedBy: inviter.name, createdAt, expiresAt, acceptedAt: null };
}

/** Pending and past invitations of a project, newest first. */
export async function listInvitations(db: Db, projectId: string): Promise<InvitationView[]> {
  const rows = await db
    .selectFrom('invitations')
    .innerJoin('users', 'users.id', 'invitations.invited_by')
    .select([
      'invitations.id',
      'invitations.email',
      'invitations.role',
      'users.name as invitedBy',
      'invitations.created_at',
      'invitations.expires_at',
      'invitations.accepted_at',
    ])
    .where('invitations.project_id', '=', projectId)
    .orderBy('invitations.created_at', 'desc')
    .execute();
  return rows.map((r) => ({
    id: r.id,
    email: r.email,
    role: r.role as ProjectRole,
    invitedBy: r.invitedBy,
    createdAt: r.created_at,
    expiresAt: r.expires_at,
    acceptedAt: r.accepted_at,
  }));
}

async function usableInvitation(db: Db, token: string) {
  const row = await db
    .selectFrom('invitations')
    .innerJoin('projects', 'projects.id', 'invitations.project_id')
    .select([
      'invitations.id',
      'invitations.email',
      'invitations.role',
      'invitations.expires_at',
      'invitations.accepted_at',
      'invitations.project_id',
      'projects.slug',
      'projects.name',
    ])
    .where('invitations.token_hash', '=', hashToken(token))
    .executeTakeFirst();
  if (!row)
    throw new ApiError('not_found', 'This invitation link is not valid. Ask for a new invitation.');
  if (row.accepted_at)
    throw new ApiError('gone', 'This invitation has already been used. Sign in instead.');
  if (row.expires_at <= nowIso())
    throw new ApiError('gone', 'This invitation has expired. Ask for a new one.');
  return row;
}

/** What the invitation page shows before the person accepts. */
export async function previewInvitation(db: Db, token: string): Promise<InvitationPreview> {
  const row = await usableInvitation(db, token);
  const account = await db
    .selectFrom('users')
    .select('id')
    .where('email', '=', row.email)
    .executeTakeFirst();
  return {
    email: row.email,
    projectSlug: row.slug,
    projectName: row.name,
    role: row.role as ProjectRole,
    expiresAt: row.expires_at,
    accountExists: Boolean(account),
  };
}

/**
 * Accepts an invitation: a new person sets their name and password; someone who already has an
 * account proves it with their password. Returns the user id to sign in.
 */
export async function acceptInvitation(
  db: Db,
  token: string,
  input: { name: string; password: string },
): Promise<string> {
  const invitation = await usableInvitation(db, token);
  const existing = await db
    .selectFrom('users')
    .selectAll()
    .where('email', '=', invitation.email)
    .executeTakeFirst();
  if (existing) {
    const ok = await verifyPassword(existing.password_hash, input.password);
    if (!ok || existing.disabled) {
      throw new ApiError(
        'invalid_credentials',
        'Wrong password for the existing account with this e-mail.',
      );
    }
  } else if (input.password.length < 10) {
    throw new ApiError('validation_failed', 'Use at least 10 characters for a password.');
  }
  const hash = existing ? null : await hashPassword(input.password);
  return db.transaction().execute(async (trx) => {
    const now = nowIso();
    let userId = existing?.id;
    if (!userId) {
      userId = newId();
      await trx
        .insertInto('users')
        .values({
          id: userId,
          email: invitation.email,
          name: input.name,
          password_hash: hash,
          is_admin: 0,
          disabled: 0,
          created_at: now,
          last_login_at: null,
        })
        .execute();
    }
    const claimed = await trx
      .updateTable('invitations')
      .set({ accepted_at: now, accepted_by: userId })
      .where('id', '=', invitation.id)
      .where('accepted_at', 'is', null)
      .executeTakeFirst();
    if (Number(claimed.numUpdatedRows) !== 1) {
      throw new ApiError('gone', 'This invitation has already been used. Sign in instead.');
    }
    await trx
      .insertInto('memberships')
      .values({
        project_id: invitation.project_id,
        user_id: userId,
        role: invitation.role,
        created_at: now,
      })
      .onConflict((oc) =>
        oc.columns(['project_id', 'user_id']).doUpdateSet({ role: invitation.role }),
      )
      .execute();
    await recordAudit(trx, {
      userId,
      projectId: invitation.project_id,
      action: 'accept-invitation',
      entity: 'invitation',
      entityId: invitation.id,
      after: { role: invitation.role, newAccount: !existing },
    });
    return userId;
  });
}
