// /api/auth: sign in and out, who am I, own password and preferences, accepting an invitation.
import { originOf } from '../mail/origin';
import type { NextFunction, Request, Response } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { z } from 'zod';
import { PERMISSIONS, can, type Permission } from '../../../src/shared/permissions';
import { AcceptInviteInput, ChangePasswordInput, LoginInput, UpdateProfileInput, type SessionUser } from '../../../src/shared/schemas/auth';
import { ResetConfirmInput, ResetRequestInput, ResetTokenParam } from '../../../src/shared/schemas/cases';
import { AppError } from '../../lib/app-error';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { AuthService } from './auth.service';
import type { SessionUsers } from './session-store';

export function configurePassport(auth: AuthService, sessionUsers?: SessionUsers) {
  const p = new passport.Passport();
  p.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      auth.authenticate(email, password).then((u) => done(null, u ?? false), done);
    }),
  );
  p.serializeUser((user, done) => done(null, (user as SessionUser).id));
  // Read on every request, so a deactivated user or a changed role takes effect at once.
  // The session store usually read the user in the same statement as the session (session-store.ts).
  p.deserializeUser((req: Request, id: number, done: (err: unknown, user?: SessionUser | false) => void) => {
    if (!Number.isSafeInteger(Number(id))) return done(null, false);
    const read = sessionUsers?.takeUser(req, Number(id));
    if (read !== undefined) return done(null, read ?? false);
    auth.loadSessionUser(Number(id)).then((u) => done(null, u ?? false), done);
  });
  return p;
}

export function mePayload(user: SessionUser) {
  const permissions = (Object.keys(PERMISSIONS) as Permission[]).filter((p) => can(user.roles, p));
  return { user, permissions };
}

function signIn(req: Request, user: SessionUser): Promise<void> {
  // passport's login regenerates the session id, so a fixed id from before sign-in is useless.
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

/** The one answer to a reset request, whether or not the address has an account. */
export const RESET_ANSWER = 'If this address belongs to a Beadpath account, a link to choose a new password is on its way. It works once, for an hour.';

export function authRoutes(deps: { auth: AuthService; passport: passport.Authenticator; loginLimit: number; resetLimit?: number }) {
  const r = new ApiRouter('/api/auth');

  const loginLimiter = rateLimit({
    windowMs: 15 * 60 * 1000,
    limit: deps.loginLimit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '').toLowerCase()}`,
    handler: (_req, _res, next) => next(new AppError('rate_limited', 'Too many failed sign-ins for this e-mail. Wait 15 minutes and try again.')),
  });

  r.post('/login', 'public', loginLimiter, validate('body', LoginInput), (req: Request, res: Response, next: NextFunction) => {
    req.body = res.locals.body;
    deps.passport.authenticate('local', (err: unknown, user: SessionUser | false) => {
      if (err) return next(err);
      if (!user) return next(AppError.unauthenticated('E-mail or password is not correct'));
      signIn(req, user)
        .then(() => res.json(mePayload(user)))
        .catch(next);
    })(req, res, next);
  });

  r.post('/logout', 'public', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy((e) => {
        if (e) return next(e);
        res.clearCookie('beadpath.sid');
        res.status(204).end();
      });
    });
  });

  // Public so that the client can ask "am I signed in?" without a failed request in the console.
  r.get('/me', 'public', (req, res) => {
    res.json(req.user ? mePayload(req.user) : { user: null, permissions: [] });
  });

  r.patch('/me', 'signedIn', validate('body', UpdateProfileInput), async (req, res) => {
    const user = await deps.auth.updateProfile(req.user!.id, res.locals.body);
    res.json(mePayload(user));
  });

  r.post('/password', 'signedIn', validate('body', ChangePasswordInput), async (req, res) => {
    const { currentPassword, newPassword } = res.locals.body as z.output<typeof ChangePasswordInput>;
    await deps.auth.changePassword(req.user!.id, currentPassword, newPassword, req.sessionID);
    res.status(204).end();
  });

  r.get('/invite/:token', 'public', validate('params', z.object({ token: z.string().min(20).max(200) })), async (_req, res) => {
    res.json(await deps.auth.inviteInfo(res.locals.params.token));
  });

  r.post('/invite/accept', 'public', validate('body', AcceptInviteInput), async (req, res) => {
    const { token, password } = res.locals.body as z.output<typeof AcceptInviteInput>;
    const user = await deps.auth.acceptInvite(token, password);
    await signIn(req, user);
    res.json(mePayload(user));
  });

  // Per address and per e-mail, so nobody can fill a colleague's mailbox or probe at speed; the
  // limit applies whether or not the address has an account.
  const resetLimiter = rateLimit({
    windowMs: 15 * 60 * 1000,
    limit: deps.resetLimit ?? 5,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) =>
      `reset|${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '')
        .trim()
        .toLowerCase()}`,
    handler: (_req, _res, next) => next(new AppError('rate_limited', 'Too many reset requests for this e-mail. Wait 15 minutes and try again.')),
  });

  r.post('/password-reset', 'public', resetLimiter, validate('body', ResetRequestInput), async (req, res) => {
    // Answered before any lookup, so the time taken says nothing about the address either.
    res.status(202).json({ message: RESET_ANSWER });
    try {
      await deps.auth.requestPasswordReset(res.locals.body.email, originOf(req));
    } catch (err) {
      req.log?.error({ err }, 'password reset request failed');
    }
  });

  r.get('/password-reset/:token', 'public', validate('params', ResetTokenParam), async (_req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    res.json(await deps.auth.resetInfo(res.locals.params.token));
  });

  r.post('/password-reset/confirm', 'public', validate('body', ResetConfirmInput), async (req, res) => {
    const { token, password } = res.locals.body as z.output<typeof ResetConfirmInput>;
    const user = await deps.auth.confirmPasswordReset(token, password);
    await signIn(req, user);
    res.json(mePayload(user));
  });

  return r;
}
