import crypto from 'node:crypto';
import { verifyPassword, hashPassword, isCommonPassword } from '../users/password';
import { findAccountByEmail, recordSignIn, createPasswordReset, findResetUser, completePasswordReset } from '../users/user-directory';
import { endAllSessions } from './sessions.service';
import { hit, peek, clear, retryAfterSeconds, tooManyRequests } from '../../lib/throttle';
import { AppError, badRequest } from '../../lib/errors';
import type { SecurityEvent } from '../../lib/logger';
import { queueMail } from '../../lib/mailer';
import type { AppDeps, AuthUser } from '../../lib/http';
import { toAuthUser } from './session-middleware';

const accountKey = (email: string) => `signin:account:${email.toLowerCase()}`;
const addressKey = (ip: string | undefined) => `signin:address:${ip ?? 'unknown'}`;

/** Where a sign-in attempt comes from, and how its outcome is recorded and answered. */
export interface SignInAttempt {
  address: string | undefined;
  /** Writes the security log line for this request. */
  audit: (event: SecurityEvent, extra?: Record<string, unknown>) => void;
  /** Called before a throttled attempt is refused, with the seconds to wait (Retry-After). */
  onThrottled: (seconds: number) => void;
}

/**
 * Checks a sign-in: throttled per account and per address, the same answer for a wrong e-mail
 * and a wrong password. The caller starts the session for the user it returns.
 */
export async function checkSignIn(deps: AppDeps, input: { email: string; password: string }, attempt: SignInAttempt): Promise<AuthUser> {
  const { config } = deps;
  const windowMs = config.SIGNIN_WINDOW_SECONDS * 1000;
  const keys = [
    { key: accountKey(input.email), limit: config.SIGNIN_MAX_FAILURES_PER_ACCOUNT },
    { key: addressKey(attempt.address), limit: config.SIGNIN_MAX_FAILURES_PER_ADDRESS },
  ];
  for (const { key, limit } of keys) {
    if ((await peek(key, windowMs)) >= limit) {
      const seconds = await retryAfterSeconds(key, windowMs);
      attempt.onThrottled(seconds);
      attempt.audit('sign_in_throttled', { email: input.email });
      throw tooManyRequests(seconds, 'failed sign-ins');
    }
  }

  const user = await findAccountByEmail(input.email);
  const ok = await verifyPassword(user?.passwordHash ?? null, input.password);
  if (!user || !ok || !user.active) {
    for (const { key } of keys) await hit(key, windowMs);
    attempt.audit('sign_in_failed', { email: input.email });
    throw new AppError(401, 'bad_credentials', 'That e-mail and password do not match an active account.');
  }

  await clear(accountKey(input.email));
  await recordSignIn(user.id, new Date());
  return toAuthUser(user);
}

const RESET_TTL_MS = 60 * 60 * 1000;
const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

/** Always answers the same, whether or not the address has an account (no account probing). */
export async function requestPasswordReset(deps: AppDeps, email: string) {
  const user = await findAccountByEmail(email);
  if (!user || !user.active) return;
  const token = crypto.randomBytes(32).toString('base64url');
  await deps.sequelize.transaction(async (transaction) => {
    await createPasswordReset(user.id, sha256(token), new Date(Date.now() + RESET_TTL_MS), transaction);
    await queueMail(
      {
        to: user.email,
        subject: 'Faultline: reset your password',
        text: `Hello ${user.name},\n\nSomeone (hopefully you) asked to reset your Faultline password.\nOpen this link within one hour to choose a new one:\n\n${deps.config.publicUrl}/reset-password/${token}\n\nIf you did not ask for this, ignore this mail; your password stays as it is.\n`,
      },
      transaction,
    );
  });
}

export async function resetPassword(deps: AppDeps, token: string, password: string) {
  if (isCommonPassword(password))
    throw badRequest('Choose a less common password.', {
      password: ['This password is on a list of commonly used passwords. Choose another.'],
    });
  const tokenHash = sha256(token);
  const userId = await findResetUser(tokenHash);
  if (userId === null) throw new AppError(400, 'reset_link_invalid', 'This reset link has expired or was already used. Ask for a new one.');
  const passwordHash = await hashPassword(password);
  await deps.sequelize.transaction(async (transaction) => {
    await completePasswordReset(tokenHash, userId, passwordHash, transaction);
    await endAllSessions(userId, transaction);
  });
}
