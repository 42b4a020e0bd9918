import { Router } from 'express';
import type { AppContext } from '../../app-context.js';
import { ChangePasswordRequestSchema, LoginRequestSchema, type PublicUser } from '../../../shared/schemas/user.js';
import { HttpError } from '../http-error.js';
import { issueCsrfToken } from '../csrf.js';
import { parseBody } from '../validate.js';
import { endUserSessions } from '../../auth/end-sessions.js';
import { createLoginRateLimit, createPasswordChangeLimit } from '../../auth/login-rate-limit.js';
import { requireSignedIn } from '../../auth/guards.js';
import { hashPassword, verifyPassword } from '../../auth/password.js';
import { SESSION_COOKIE } from '../../auth/session.js';

/** /api/auth: csrf, login, logout, me, password. */
export function createAuthRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/csrf', (req, res) => {
    res.json({ csrfToken: issueCsrfToken(req) });
  });

  router.post('/login', ...createLoginRateLimit(ctx.config), (req, res, next) => {
    req.body = parseBody(LoginRequestSchema, req.body);
    ctx.passport.authenticate('local', (error: unknown, user: PublicUser | false) => {
      if (error) return next(error);
      if (!user) return next(new HttpError(401, 'Wrong e-mail or password'));
      // Passport regenerates the session on login (no fixation); the new session gets a new token.
      req.logIn(user, (loginError) => {
        if (loginError) return next(loginError);
        res.json({ user, csrfToken: issueCsrfToken(req) });
      });
    })(req, res, next);
  });

  router.post('/logout', (req, res, next) => {
    const sid = req.sessionID;
    req.session.destroy((error) => {
      if (error) return next(error);
      // A live view left open in another tab stops streaming once its session is gone.
      ctx.services.closeSessionSockets?.(sid);
      res.clearCookie(SESSION_COOKIE, { httpOnly: true, sameSite: 'lax', secure: ctx.config.cookieSecure });
      res.status(204).end();
    });
  });

  router.get('/me', requireSignedIn, (req, res) => {
    res.json({ user: req.user });
  });

  // Who is signed in, for the client's start-up: signed out is an answer (null), not an
  // error, so the sign-in page does not log a failed request on every load.
  router.get('/session', (req, res) => {
    res.json({ user: req.user ?? null });
  });

  router.post('/password', requireSignedIn, createPasswordChangeLimit(ctx.config), async (req, res) => {
    const body = parseBody(ChangePasswordRequestSchema, req.body);
    const row = await ctx.models.User.findByPk(req.user!.id);
    if (!row || !(await verifyPassword(body.currentPassword, row.passwordHash))) {
      throw new HttpError(400, 'The current password is wrong', { currentPassword: ['wrong password'] });
    }
    await row.update({ passwordHash: await hashPassword(body.newPassword) });
    // Whoever else holds this account (a stolen cookie, another device) has to sign in again.
    await endUserSessions(ctx, row.id, req.sessionID);
    res.status(204).end();
  });

  return router;
}
