import { Router, type NextFunction, type Request, type Response } from 'express';
import type { PassportStatic } from 'passport';
import {
  acceptInvitationBodySchema,
  changePasswordBodySchema,
  loginBodySchema,
  resetConfirmBodySchema,
  resetRequestBodySchema,
} from '../../shared/auth';
import { verifyPassword } from '../auth/passwords';
import type { AppDeps } from '../app';
import { ApiError } from '../errors/api-error';
import { publicRoute, signedIn, userOf } from '../middleware/access';
import { loginLimiter, mailLimiter } from '../middleware/rate-limits';
import { parseWith } from '../middleware/validate';
import { acceptInvitation, previewInvitation } from '../services/invitations.service';
import { confirmPasswordReset, requestPasswordReset } from '../services/password-resets.service';
import { nowIso } from '../services/ids';
import { meFor, setPassword, toSessionUser } from '../services/users.service';

function logIn(req: Request, user: Express.User): Promise<void> {
  return new Promise((resolve, reject) =>
    req.logIn(user, (err: unknown) => (err ? reject(err) : resolve())),
  );
}

function authenticate(passport: PassportStatic, req: Request, res: Response, next: NextFunction) {
  return new Promise<Express.User | false>((resolve, reject) => {
    passport.authenticate('local', (err: unknown, user: Express.User | false) =>
      err ? reject(err) : resolve(user),
    )(req, res, next);
  });
}

const tokenParam = (req: Request): string => {
  const token = req.params['token'];
  if (typeof token !== 'string' || !/^[A-Za-z0-9_-]{20,200}$/.test(token)) {
    throw new ApiError('bad_request', 'This link is not valid.');
  }
  return token;
};

/** Sign-in, sign-out, the current user, passwords, and invitation links. */
export function authRoutes({ db, config, mailer }: AppDeps, passport: PassportStatic): Router {
  const router = Router();
  const limitLogins = loginLimiter(config.loginRateLimit);
  const limitMail = mailLimiter(Math.max(5, config.loginRateLimit));

  router.post('/auth/login', publicRoute(), limitLogins, async (req, res, next) => {
    req.body = parseWith(loginBodySchema, req.body);
    const user = await authenticate(passport, req, res, next);
    if (!user) throw new ApiError('invalid_credentials', 'Wrong e-mail or password.');
    await logIn(req, user);
    await db
      .updateTable('users')
      .set({ last_login_at: nowIso() })
      .where('id', '=', user.id)
      .execute();
    res.json(await meFor(db, user.id));
  });

  router.post('/auth/logout', publicRoute(), async (req, res) => {
    await new Promise<void>((resolve, reject) =>
      req.logout((err: unknown) => (err ? reject(err) : resolve())),
    );
    await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
    res.clearCookie('maculo.sid', { path: '/' });
    res.status(204).end();
  });

  router.get('/auth/me', signedIn(), async (req, res) => {
    res.json(await meFor(db, userOf(req).id));
  });

  router.post('/auth/password', signedIn(), async (req, res) => {
    const body = parseWith(changePasswordBodySchema, req.body);
    const user = userOf(req);
    const row = await db
      .selectFrom('users')
      .select('password_hash')
      .where('id', '=', user.id)
      .executeTakeFirstOrThrow();
    if (!(await verifyPassword(row.password_hash, body.currentPassword))) {
      throw new ApiError('invalid_credentials', 'Your current password is not right.');
    }
    await setPassword(db, user.id, body.newPassword, req.sessionID);
    res.status(204).end();
  });

  router.post('/auth/password-reset', publicRoute(), limitMail, async (req, res) => {
    const body = parseWith(resetRequestBodySchema, req.body);
    await requestPasswordReset(db, mailer, body.email, config.publicUrl);
    res.status(202).json({
      message: 'If an account uses this e-mail, a link to reset its password is on its way.',
    });
  });

  router.post('/auth/password-reset/confirm', publicRoute(), limitMail, async (req, res) => {
    const body = parseWith(resetConfirmBodySchema, req.body);
    await confirmPasswordReset(db, body.token, body.newPassword);
    res.status(204).end();
  });

  router.get('/invitations/:token', publicRoute(), limitMail, async (req, res) => {
    res.json(await previewInvitation(db, tokenParam(req)));
  });

  router.post('/invitations/:token/accept', publicRoute(), limitMail, async (req, res) => {
    const token = tokenParam(req);
    const body = parseWith(acceptInvitationBodySchema, req.body);
    const userId = await acceptInvitation(db, token, body);
    const row = await db
      .selectFrom('users')
      .selectAll()
      .where('id', '=', userId)
      .executeTakeFirstOrThrow();
    await logIn(req, toSessionUser(row));
    res.json(await meFor(db, userId));
  });

  return router;
}
