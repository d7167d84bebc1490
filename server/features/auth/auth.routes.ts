import crypto from 'node:crypto';
import type { PassportStatic } from 'passport';
import type { Request, RequestHandler } from 'express';
import { acceptInvitationInput, changePasswordInput, loginInput, resetConfirmInput, resetRequestInput, signupInput, updateMeInput } from '../../../shared/schemas/auth';
import { z } from 'zod';
import type { AuthUser } from '../../lib/policy';
import { publicRoute, signedIn, user } from '../../lib/policy';
import { json, type RouteTable } from '../../lib/routes';
import { HOUR } from '../../lib/clock';
import { accountRef, requester } from '../../lib/security-log';
import { signIn, signOut } from '../../lib/session';
import { validate } from '../../lib/validate';
import type { InvitationsService } from '../invitations/invitations.service';
import type { AuthService } from './auth.service';

const tokenParams = z.object({ token: z.string().min(10).max(200) });

/** Sign-ins, sign-outs and reset requests go to the log (ASVS 7.1.3, 7.2.1): who, how, from where; no secrets. */
const logSignIn = (req: Request, how: 'password' | 'sign-up' | 'password-reset' | 'password-change' | 'invitation') =>
  req.log.info({ event: 'security.signed-in', how, ...requester(req) }, `signed in (${how})`);

/** passport.authenticate('local') with a callback, so our error factory renders its failures. */
const authenticateWith =
  (passport: PassportStatic): RequestHandler =>
  (req, res, next) =>
    passport.authenticate('local', (err: unknown, u: AuthUser | false) => {
      if (err) return next(err);
      if (!u) return next(new Error('local strategy returned no user'));
      signIn(req, u).then(() => next(), next);
    })(req, res, next);

export function authRoutes(r: RouteTable, deps: { auth: AuthService; invitations: InvitationsService; passport: PassportStatic; sessionCookie?: string }) {
  const { auth, invitations } = deps;
  const authenticate = authenticateWith(deps.passport);

  r.get('/auth/csrf', publicRoute(), (req, res) => {
    // a visitor's session (a token for the public forms) lasts an hour; signing in starts a new one of 14 days
    if (!req.user && !req.session.csrf) req.session.cookie.maxAge = HOUR;
    req.session.csrf ??= crypto.randomBytes(24).toString('base64url');
    res.set('Cache-Control', 'no-store').json({ token: req.session.csrf });
  });
  r.post('/auth/signup', publicRoute(), validate({ body: signupInput }), json(async (req) => {
    const result = await auth.signup(req.body);
    await signIn(req, result.user);
    logSignIn(req, 'sign-up');
    return result;
  }, 201));
  r.post('/auth/login', publicRoute(), validate({ body: loginInput }), authenticate, json((req) => {
    logSignIn(req, 'password');
    return auth.me(user(req).id);
  }));
  r.post('/auth/logout', publicRoute(), json(async (req, res) => {
    if (req.user) req.log.info({ event: 'security.signed-out', ...requester(req) }, 'signed out');
    if (req.session) await signOut(req);
    const name = deps.sessionCookie ?? 'sablework.sid';
    // a __Host- cookie is only replaced by one with the same attributes
    res.clearCookie(name, { path: '/', httpOnly: true, sameSite: 'lax', secure: name.startsWith('__Host-') });
  }));
  // the session's read of the person (passport's deserializeUser, this request) is fresh: no second read
  r.get('/auth/me', signedIn(), json((req) => auth.me(user(req).id, user(req))));
  r.patch('/auth/me', signedIn(), validate({ body: updateMeInput }), json((req) => auth.updateMe(user(req).id, req.body)));
  // A new password from a signed-in session: the other sessions end, this one starts afresh (a new id and epoch).
  r.post('/auth/password', signedIn(), validate({ body: changePasswordInput }), json(async (req) => {
    const result = await auth.changePassword(user(req).id, req.body, req.ip ?? 'unknown');
    req.log.info({ event: 'security.password-changed', ...requester(req) }, 'password changed');
    await signIn(req, result.user);
    logSignIn(req, 'password-change');
    return result;
  }));
  r.post('/auth/password-reset', publicRoute(), validate({ body: resetRequestInput }), json(async (req) => {
    req.log.info({ event: 'security.reset-requested', account: accountRef(req.body.email), ...requester(req) }, 'password reset asked for');
    await auth.requestReset(req.body.email, req.ip ?? 'unknown');
    return { ok: true };
  }, 202));
  r.post('/auth/password-reset/confirm', publicRoute(), validate({ body: resetConfirmInput }), json(async (req) => {
    const result = await auth.confirmReset(req.body);
    await signIn(req, result.user);
    logSignIn(req, 'password-reset');
    return result;
  }));

  r.get('/invitations/:token', publicRoute(), validate({ params: tokenParams }), json((req) => invitations.preview(String(req.params.token))));
  r.post('/invitations/:token/accept', publicRoute(), validate({ params: tokenParams, body: acceptInvitationInput }), json(async (req) => {
    const { userId, studioId } = await invitations.accept(String(req.params.token), req.body, req.user?.id, req.ip ?? 'unknown');
    const result = await auth.me(userId);
    await signIn(req, result.user);
    logSignIn(req, 'invitation');
    return { ...result, studioId };
  }));
}
