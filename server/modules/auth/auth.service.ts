import { verifyPassword, hashPassword, isCommonPassword } from '../users/password';
import { findAccountByEmail, findAccountById, recordSignIn, setPasswordHash } from '../users/user-directory';
import { endAllSessions } from './sessions.service';
import { AppError, badRequest } from '../../lib/errors';
import type { SecurityEvent } from '../../lib/logger';
import { disconnectUser } from '../../lib/realtime';
import type { AppDeps, AuthUser } from '../../lib/http';
import { toAuthUser } from './session-middleware';
import { countSignInAttempt, signInRules, signInSucceeded } from './sign-in-throttle';
import { consumeAccountLink, recordAccountMailRequest, type AccountMailKind } from './account-links.service';

// The domain side of signing in: no `req` here. The routes pass where a request comes from and
// how to log it (RequestContext); sessions are started and ended in session-middleware.ts.

/** Where a request comes from and how its security log lines are written. */
export interface RequestContext {
  address: string | undefined;
  /** Writes the security log line for this request. */
  audit: (event: SecurityEvent, extra?: Record<string, unknown>) => void;
}

/** A sign-in attempt: also told the seconds to wait when it is throttled (Retry-After). */
export interface SignInAttempt extends RequestContext {
  onThrottled: (seconds: number) => void;
}

function waitInWords(seconds: number) {
  if (seconds < 90) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}

/**
 * Checks a sign-in. The attempt is counted (per account and address, per account, per address)
 * BEFORE the password is checked, so parallel guesses cannot pass the limit; the same answer
 * for a wrong e-mail and a wrong password. The caller starts the session for the user it returns.
 */
export async function checkSignIn(deps: AppDeps, input: { email: string; password: string }, attempt: SignInAttempt): Promise<AuthUser> {
  const { config, sequelize } = deps;
  const counted = await countSignInAttempt(sequelize, config, signInRules(config, input.email, attempt.address));
  if (!counted.allowed) {
    attempt.onThrottled(counted.retryAfterSeconds);
    attempt.audit('sign_in_throttled', { email: input.email, retryAfterSeconds: counted.retryAfterSeconds });
    throw new AppError(
      429,
      'rate_limited',
      `Too many sign-in attempts. Try again in ${waitInWords(counted.retryAfterSeconds)}, or ask for a sign-in link by e-mail.`,
    );
  }

  const user = await findAccountByEmail(input.email);
  const ok = await verifyPassword(user?.passwordHash ?? null, input.password);
  if (!user || !ok || !user.active) {
    attempt.audit('sign_in_failed', { email: input.email });
    throw new AppError(401, 'bad_credentials', 'That e-mail and password do not match an active account.');
  }
  await signInSucceeded(sequelize, config, user.email, attempt.address);
  await recordSignIn(user.id, new Date());
  return toAuthUser(user);
}

/**
 * "Mail me a reset link / a sign-in link": the same answer and the same work whether or not
 * the address has an account. Only the request is recorded now; the account-mail queue looks
 * the address up and writes the mail after the response has gone (the route nudges it).
 */
export async function requestAccountMail(kind: AccountMailKind, email: string, context: RequestContext) {
  await recordAccountMailRequest(kind, email);
  context.audit('account_mail_requested', { kind });
}

const linkInvalid = (what: 'reset' | 'sign-in') =>
  new AppError(
    400,
    what === 'reset' ? 'reset_link_invalid' : 'sign_in_link_invalid',
    `This ${what} link has expired or was already used. Ask for a new one.`,
  );

/** Sets a new password with a reset or invitation link; every session and other link of the account ends. */
export async function resetPassword(deps: AppDeps, token: string, password: string, context: RequestContext) {
  if (isCommonPassword(password))
    throw badRequest('Choose a less common password.', {
      password: ['This password is on a list of commonly used passwords. Choose another.'],
    });
  const passwordHash = await hashPassword(password);
  const userId = await deps.sequelize.transaction(async (transaction) => {
    const id = await consumeAccountLink(token, ['reset', 'invite'], transaction);
    if (id === null) return null;
    await setPasswordHash(id, passwordHash, transaction);
    await endAllSessions(id, transaction);
    return id;
  });
  if (userId === null) {
    context.audit('account_link_refused', { purpose: 'reset' });
    throw linkInvalid('reset');
  }
  disconnectUser(userId);
  const user = await findAccountById(userId);
  // Whoever holds the mailbox is the owner: their sign-in counters start over.
  if (user) await signInSucceeded(deps.sequelize, deps.config, user.email, context.address);
  context.audit('password_changed', { changedUserId: userId, via: 'reset_link' });
}

/**
 * Checks a mailed sign-in link (single use, 15 minutes): the way in while sign-in is throttled.
 * The caller starts the session for the user it returns.
 */
export async function checkSignInLink(deps: AppDeps, token: string, context: RequestContext): Promise<AuthUser> {
  const userId = await deps.sequelize.transaction((transaction) => consumeAccountLink(token, ['sign_in'], transaction));
  const user = userId === null ? null : await findAccountById(userId);
  if (!user || !user.active) {
    context.audit('account_link_refused', { purpose: 'sign_in' });
    throw linkInvalid('sign-in');
  }
  await signInSucceeded(deps.sequelize, deps.config, user.email, context.address);
  await recordSignIn(user.id, new Date());
  return toAuthUser(user);
}
