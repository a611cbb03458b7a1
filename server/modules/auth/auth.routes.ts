import { route, type AppDeps, type RouteSpec } from '../../lib/http';
import { signInSchema } from '../../../shared/schemas/session';
import { passwordResetRequestSchema, passwordResetSchema, passwordResetParams } from '../../../shared/schemas/password';
import { signInLinkRequestSchema, signInLinkParams } from '../../../shared/schemas/session';
import { checkSignIn, checkSignInLink, requestAccountMail, resetPassword, type RequestContext } from './auth.service';
import type { AccountMailQueue } from './account-links.service';
import { csrfTokenFor, endSession, startSession } from './session-middleware';
import { disconnectSession } from '../../lib/realtime';
import { rateLimit } from '../../lib/throttle';
import { securityLog, type Logger } from '../../lib/logger';
import type { Request } from 'express';

/** What the auth service needs of a request: where it came from and how to log it. */
function contextOf(deps: AppDeps, req: Request): RequestContext {
  return { address: req.ip, audit: (event, extra) => securityLog(deps.log, req, event, extra) };
}

/** The account-mail queue writes the mail once the response has gone (same answer for every address). */
function nudgeAccountMailAfterResponse(req: Request) {
  const queue = req.app.locals.accountMail as AccountMailQueue | undefined;
  if (queue) req.res?.once('finish', () => queue.nudge());
}

export function authRoutes(log: Logger): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/session',
      access: 'public',
      summary: 'The signed-in user (or null) and the CSRF token for state-changing requests',
      // A signed-out visitor gets a token bound to a cookie, not a session row (nothing to keep yet).
      handle: ({ deps, req, res, user }) => ({ user, csrfToken: csrfTokenFor(deps.config, req, res) }),
    }),
    route({
      method: 'post',
      path: '/session',
      access: 'public',
      summary: 'Sign in with e-mail and password',
      body: signInSchema,
      handle: async ({ deps, req, res, body }) => {
        const user = await checkSignIn(deps, body, {
          ...contextOf(deps, req),
          onThrottled: (seconds) => res.setHeader('Retry-After', String(seconds)),
        });
        return startSession(req, user, 'password', deps.log);
      },
    }),
    route({
      method: 'delete',
      path: '/session',
      access: 'member',
      summary: 'Sign out: destroys the server session and closes its sockets',
      handle: async ({ deps, req, res }) => {
        const sid = await endSession(req, deps.log);
        disconnectSession(sid);
        res.clearCookie('faultline.sid', { path: '/' });
        return undefined;
      },
    }),
    route({
      method: 'post',
      path: '/password-resets',
      access: 'public',
      summary: 'Ask for a password reset link by e-mail',
      body: passwordResetRequestSchema,
      status: 202,
      before: [rateLimit({ name: 'password-reset', limit: 5, windowMs: 15 * 60_000, log })],
      handle: async ({ deps, req, body }) => {
        await requestAccountMail('password_reset', body.email, contextOf(deps, req));
        nudgeAccountMailAfterResponse(req);
        return { message: 'If that address has an account, a reset link is on its way.' };
      },
    }),
    route({
      method: 'post',
      path: '/sign-in-links',
      access: 'public',
      summary: 'Ask for a single-use sign-in link by e-mail (the way in while sign-in is throttled)',
      body: signInLinkRequestSchema,
      status: 202,
      before: [rateLimit({ name: 'sign-in-link', limit: 5, windowMs: 15 * 60_000, log })],
      handle: async ({ deps, req, body }) => {
        await requestAccountMail('sign_in_link', body.email, contextOf(deps, req));
        nudgeAccountMailAfterResponse(req);
        return { message: 'If that address has an account, a sign-in link is on its way.' };
      },
    }),
    route({
      method: 'post',
      path: '/sign-in-links/:token',
      access: 'public',
      summary: 'Sign in with a mailed sign-in link (works once, for 15 minutes)',
      params: signInLinkParams,
      handle: async ({ deps, req, params }) => {
        const user = await checkSignInLink(deps, params.token, contextOf(deps, req));
        return startSession(req, user, 'mailed_link', deps.log);
      },
    }),
    route({
      method: 'post',
      path: '/password-resets/:token',
      access: 'public',
      summary: 'Set a new password with a reset link',
      params: passwordResetParams,
      body: passwordResetSchema,
      handle: async ({ deps, req, params, body }) => {
        await resetPassword(deps, params.token, body.password, contextOf(deps, req));
        return { message: 'Your password is changed. Sign in with the new one.' };
      },
    }),
  ];
}
