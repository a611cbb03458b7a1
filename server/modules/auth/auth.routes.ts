import { route, type RouteSpec } from '../../lib/http';
import { signInSchema } from '../../../shared/schemas/session';
import { passwordResetRequestSchema, passwordResetSchema, passwordResetParams } from '../../../shared/schemas/password';
import { signInLinkRequestSchema, signInLinkParams } from '../../../shared/schemas/session';
import { signIn, signOut, requestAccountMail, resetPassword, signInWithLink } from './auth.service';
import { csrfTokenFor } from './session-middleware';
import { disconnectSession } from '../../lib/realtime';
import { rateLimit } from '../../lib/throttle';
import type { Logger } from '../../lib/logger';

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
      handle: ({ deps, req, body }) => signIn(deps, req, body),
    }),
    route({
      method: 'delete',
      path: '/session',
      access: 'member',
      summary: 'Sign out: destroys the server session and closes its sockets',
      handle: async ({ deps, req, res }) => {
        const sid = await signOut(deps, req);
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
        await requestAccountMail(deps, req, 'password_reset', body.email);
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
        await requestAccountMail(deps, req, 'sign_in_link', body.email);
        return { message: 'If that address has an account, a sign-in link is on its way.' };
      },
    }),
    route({
      method: 'post',
      path: '/sign-in-links/:token',
      access: 'public',
      summary: 'Sign in with a mailed sign-in link (works once, for 15 minutes)',
      params: signInLinkParams,
      handle: ({ deps, req, params }) => signInWithLink(deps, req, params.token),
    }),
    route({
      method: 'post',
      path: '/password-resets/:token',
      access: 'public',
      summary: 'Set a new password with a reset link',
      params: passwordResetParams,
      body: passwordResetSchema,
      handle: async ({ deps, req, params, body }) => {
        await resetPassword(deps, req, params.token, body.password);
        return { message: 'Your password is changed. Sign in with the new one.' };
      },
    }),
  ];
}
