import passport, { type PassportStatic } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { SessionUser } from '../../shared/auth';
import type { Db } from '../db/database';
import { verifyPassword } from './passwords';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

/** A passport instance bound to one database: local strategy by e-mail, sessions by user id. */
export function createPassport(db: Db): PassportStatic {
  const instance = new passport.Passport();

  instance.use(
    new LocalStrategy(
      { usernameField: 'email', passwordField: 'password' },
      (email, password, done) => {
        db.selectFrom('users')
          .selectAll()
          .where('email', '=', email.trim().toLowerCase())
          .executeTakeFirst()
          .then(async (row) => {
            const ok = await verifyPassword(row?.password_hash ?? null, password);
            if (!row || !ok || row.disabled) return done(null, false);
            done(null, {
              id: row.id,
              email: row.email,
              name: row.name,
              isAdmin: row.is_admin === 1,
            });
          })
          .catch(done);
      },
    ),
  );

  instance.serializeUser((user, done) => done(null, user.id));

  // Runs on every request: a disabled or deleted account stops working at once.
  instance.deserializeUser((id: unknown, done) => {
    if (typeof id !== 'string') return done(null, false);
    db.selectFrom('users')
      .select(['id', 'email', 'name', 'is_admin', 'disabled'])
      .where('id', '=', id)
      .executeTakeFirst()
      .then((row) => {
        if (!row || row.disabled) return done(null, false);
        done(null, { id: row.id, email: row.email, name: row.name, isAdmin: row.is_admin === 1 });
      })
      .catch(done);
  });

  return instance as unknown as PassportStatic;
}
