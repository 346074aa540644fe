import type { Db } from '../db/database';
import { ApiError } from '../errors/api-error';
import type { Mailer } from '../mail/mailer';
import { accountCreatedMail, passwordResetMail } from '../mail/templates';
import { hashToken, newId, newToken, nowIso } from './ids';
import { setPassword } from './users.service';

const RESET_MINUTES = 60;
const NEW_ACCOUNT_MINUTES = 72 * 60;

async function issueToken(db: Db, userId: string, minutes: number): Promise<string> {
  const token = newToken();
  await db
    .insertInto('password_resets')
    .values({
      id: newId(),
      user_id: userId,
      token_hash: hashToken(token),
      created_at: nowIso(),
      expires_at: nowIso(new Date(Date.now() + minutes * 60_000)),
      used_at: null,
    })
    .execute();
  return token;
}

/**
 * Sends a reset link when the address belongs to an active account. The caller answers the same
 * way whatever happens here, so nobody can learn which addresses have accounts.
 */
export async function requestPasswordReset(
  db: Db,
  mailer: Mailer,
  email: string,
  publicUrl: string,
): Promise<void> {
  const user = await db
    .selectFrom('users')
    .selectAll()
    .where('email', '=', email)
    .executeTakeFirst();
  if (!user || user.disabled) return;
  const token = await issueToken(db, user.id, RESET_MINUTES);
  await mailer.send(
    passwordResetMail({
      to: user.email,
      name: user.name,
      link: `${publicUrl}/reset-password/${token}`,
      minutes: RESET_MINUTES,
    }),
  );
}

/** Mails a new account's owner a link to choose their password. */
export async function sendAccountCreated(
  db: Db,
  mailer: Mailer,
  user: { id: string; email: string; name: string },
  publicUrl: string,
): Promise<void> {
  const token = await issueToken(db, user.id, NEW_ACCOUNT_MINUTES);
  await mailer.send(
    accountCreatedMail({
      to: user.email,
      name: user.name,
      link: `${publicUrl}/reset-password/${token}`,
      minutes: NEW_ACCOUNT_MINUTES,
    }),
  );
}

/** Uses a reset token once to set a new password; every session of the account ends. */
export async function confirmPasswordReset(
  db: Db,
  token: string,
  newPassword: string,
): Promise<void> {
  const now = nowIso();
  const row = await db
    .selectFrom('password_resets')
    .innerJoin('users', 'users.id', 'password_resets.user_id')
    .select([
      'password_resets.id',
      'password_resets.user_id',
      'password_resets.expires_at',
      'password_resets.used_at',
      'users.disabled',
    ])
    .where('password_resets.token_hash', '=', hashToken(token))
    .executeTakeFirst();
  if (!row || row.used_at || row.expires_at <= now || row.disabled) {
    throw new ApiError('bad_request', 'This reset link is not valid any more. Ask for a new one.');
  }
  const claimed = await db
    .updateTable('password_resets')
    .set({ used_at: now })
    .where('id', '=', row.id)
    .where('used_at', 'is', null)
    .executeTakeFirst();
  if (Number(claimed.numUpdatedRows) !== 1) {
    throw new ApiError('bad_request', 'This reset link is not valid any more. Ask for a new one.');
  }
  await setPassword(db, row.user_id, newPassword);
}
