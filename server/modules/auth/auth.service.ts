import type { Request } from 'express';
import { User } from '../users/user.model';
import { SessionRow } from './session.model';
import { verifyPassword, hashPassword, isCommonPassword } from '../users/password';
import { AppError, badRequest } from '../../lib/errors';
import { securityLog } from '../../lib/logger';
import { disconnectUser } from '../../lib/realtime';
import type { AppDeps, AuthUser } from '../../lib/http';
import { newCsrfToken, toAuthUser } from './session-middleware';
import { countSignInAttempt, signInRules, signInSucceeded } from './sign-in-throttle';
import { consumeAccountLink, recordAccountMailRequest, type AccountMailKind, type AccountMailQueue } from './account-links.service';

function waitInWords(seconds: number) {
  if (seconds < 90) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}

/**
 * Signs a user in. The attempt is counted (per account and address, per account, per address)
 * BEFORE the password is checked, so parallel guesses cannot pass the limit; the same answer
 * for a wrong e-mail and a wrong password; a brand-new session id on success.
 */
export async function signIn(
  deps: AppDeps,
  req: Request,
  input: { email: string; password: string },
): Promise<{ user: AuthUser; csrfToken: string }> {
  const { config, log, sequelize } = deps;
  const attempt = await countSignInAttempt(sequelize, config, signInRules(config, input.email, req.ip));
  if (!attempt.allowed) {
    req.res?.setHeader('Retry-After', String(attempt.retryAfterSeconds));
    securityLog(log, req, 'sign_in_throttled', { email: input.email, retryAfterSeconds: attempt.retryAfterSeconds });
    throw new AppError(
      429,
      'rate_limited',
      `Too many sign-in attempts. Try again in ${waitInWords(attempt.retryAfterSeconds)}, or ask for a sign-in link by e-mail.`,
    );
  }

  const user = await User.findOne({ where: { email: input.email.toLowerCase() } });
  const ok = await verifyPassword(user?.passwordHash ?? null, input.password);
  if (!user || !ok || !user.active) {
    securityLog(log, req, 'sign_in_failed', { email: input.email });
    throw new AppError(401, 'bad_credentials', 'That e-mail and password do not match an active account.');
  }
  await signInSucceeded(sequelize, config, user.email, req.ip);
  return startSession(deps, req, user, 'password');
}

/** A new session for the user: passport regenerates the id (the old session is destroyed). */
async function startSession(deps: AppDeps, req: Request, user: User, method: 'password' | 'mailed_link') {
  const authUser = toAuthUser(user);
  await new Promise<void>((resolve, reject) => req.login(authUser, (error) => (error ? reject(error) : resolve())));
  const now = Date.now();
  req.session.csrfToken = newCsrfToken();
  req.session.signedInAt = now;
  req.session.lastSeenAt = now;
  await new Promise<void>((resolve, reject) => req.session.save((error) => (error ? reject(error) : resolve())));
  await user.update({ lastSignInAt: new Date(now) });
  securityLog(deps.log, req, 'sign_in_succeeded', { method });
  return { user: authUser, csrfToken: req.session.csrfToken };
}

/** Ends the session on the server; the caller disconnects its sockets. */
export async function signOut(deps: AppDeps, req: Request): Promise<string> {
  const sid = req.sessionID;
  securityLog(deps.log, req, 'signed_out');
  await new Promise<void>((resolve, reject) => req.logout({ keepSessionInfo: false }, (error) => (error ? reject(error) : resolve())));
  await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
  return sid;
}

/** Ends every session of a user (disabling an account, resetting a password). */
export async function endAllSessions(userId: number) {
  await SessionRow.destroy({ where: { userId } });
}

/**
 * "Mail me a reset link / a sign-in link": the same answer and the same work whether or not
 * the address has an account. Only the request is recorded now; the queue looks the address
 * up and writes the mail after the response has gone.
 */
export async function requestAccountMail(deps: AppDeps, req: Request, kind: AccountMailKind, email: string) {
  await recordAccountMailRequest(kind, email);
  securityLog(deps.log, req, 'account_mail_requested', { kind });
  const queue = req.app.locals.accountMail as AccountMailQueue | undefined;
  if (queue) req.res?.once('finish', () => queue.nudge());
}

const linkInvalid = (what: 'reset' | 'sign-in') =>
  new AppError(
    400,
    what === 'reset' ? 'reset_link_invalid' : 'sign_in_link_invalid',
    `This ${what} link has expired or was already used. Ask for a new one.`,
  );

/** Sets a new password with a reset or invitation link; every session and other link of the account ends. */
export async function resetPassword(deps: AppDeps, req: Request, token: string, password: string) {
  if (isCommonPassword(password))
    throw badRequest('Choose a less common password.', {
      password: ['This password is on a list of commonly used passwords. Choose another.'],
    });
  const passwordHash = await hashPassword(password);
  const userId = await deps.sequelize.transaction(async (transaction) => {
    const id = await consumeAccountLink(token, ['reset', 'invite'], transaction);
    if (id === null) return null;
    await User.update({ passwordHash }, { where: { id }, transaction });
    await SessionRow.destroy({ where: { userId: id }, transaction });
    return id;
  });
  if (userId === null) {
    securityLog(deps.log, req, 'account_link_refused', { purpose: 'reset' });
    throw linkInvalid('reset');
  }
  disconnectUser(userId);
  const user = await User.findByPk(userId);
  // Whoever holds the mailbox is the owner: their sign-in counters start over.
  if (user) await signInSucceeded(deps.sequelize, deps.config, user.email, req.ip);
  securityLog(deps.log, req, 'password_changed', { changedUserId: userId, via: 'reset_link' });
}

/** Signs in with a mailed sign-in link (single use, 15 minutes): the way in while sign-in is throttled. */
export async function signInWithLink(deps: AppDeps, req: Request, token: string) {
  const userId = await deps.sequelize.transaction((transaction) => consumeAccountLink(token, ['sign_in'], transaction));
  const user = userId === null ? null : await User.findByPk(userId);
  if (!user || !user.active) {
    securityLog(deps.log, req, 'account_link_refused', { purpose: 'sign_in' });
    throw linkInvalid('sign-in');
  }
  await signInSucceeded(deps.sequelize, deps.config, user.email, req.ip);
  return startSession(deps, req, user, 'mailed_link');
}
