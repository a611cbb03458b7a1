import { route, type RouteSpec } from '../../lib/http';
import { signInSchema } from '../../../shared/schemas/session';
import { passwordResetRequestSchema, passwordResetSchema, passwordResetParams } from '../../../shared/schemas/password';
import { checkSignIn, requestPasswordReset, resetPassword } from './auth.service';
import { endSession, newCsrfToken, startSession } from './session-middleware';
import { disconnectSession } from '../../lib/realtime';
import { rateLimit } from '../../lib/throttle';
import { securityLog, type Logger } from '../../lib/logger';

export function authRoutes(log: Logger): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/session',
      access: 'public',
      summary: 'The signed-in user (or null) and the CSRF token for state-changing requests',
      handle: ({ req, user }) => {
        req.session.csrfToken ??= newCsrfToken();
        return { user, csrfToken: req.session.csrfToken };
      },
    }),
    route({
      method: 'post',
      path: '/session',
      access: 'public',
      summary: 'Sign in with e-mail and password',
      body: signInSchema,
      handle: async ({ deps, req, res, body }) => {
        const user = await checkSignIn(deps, body, {
          address: req.ip,
          audit: (event, extra) => securityLog(deps.log, req, event, extra),
          onThrottled: (seconds) => res.setHeader('Retry-After', String(seconds)),
        });
        return startSession(req, user, deps.log);
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
      handle: async ({ deps, body }) => {
        await requestPasswordReset(deps, body.email);
        return { message: 'If that address has an account, a reset link is on its way.' };
      },
    }),
    route({
      method: 'post',
      path: '/password-resets/:token',
      access: 'public',
      summary: 'Set a new password with a reset link',
      params: passwordResetParams,
      body: passwordResetSchema,
      handle: async ({ deps, params, body }) => {
        await resetPassword(deps, params.token, body.password);
        return { message: 'Your password is changed. Sign in with the new one.' };
      },
    }),
  ];
}
