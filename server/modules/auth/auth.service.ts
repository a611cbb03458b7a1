import crypto from 'node:crypto';
import type { Request } from 'express';
import { Op } from 'sequelize';
import { User, PasswordReset } from '../users/user.model';
import { SessionRow } from './session.model';
import { verifyPassword, hashPassword, isCommonPassword } from '../users/password';
import { hit, peek, clear, retryAfterSeconds, tooManyRequests } from '../../lib/throttle';
import { AppError, badRequest } from '../../lib/errors';
import { securityLog } from '../../lib/logger';
import { queueMail } from '../../lib/mailer';
import type { AppDeps, AuthUser } from '../../lib/http';
import { newCsrfToken, toAuthUser } from './session-middleware';

const accountKey = (email: string) => `signin:account:${email.toLowerCase()}`;
const addressKey = (ip: string | undefined) => `signin:address:${ip ?? 'unknown'}`;

/**
 * Signs a user in: throttled per account and per address, the same answer for a wrong e-mail
 * and a wrong password, and a brand-new session id on success (the old one is dead).
 */
export async function signIn(
  deps: AppDeps,
  req: Request,
  input: { email: string; password: string },
): Promise<{ user: AuthUser; csrfToken: string }> {
  const { config, log } = deps;
  const windowMs = config.SIGNIN_WINDOW_SECONDS * 1000;
  const keys = [
    { key: accountKey(input.email), limit: config.SIGNIN_MAX_FAILURES_PER_ACCOUNT },
    { key: addressKey(req.ip), limit: config.SIGNIN_MAX_FAILURES_PER_ADDRESS },
  ];
  for (const { key, limit } of keys) {
    if ((await peek(key, windowMs)) >= limit) {
      const seconds = await retryAfterSeconds(key, windowMs);
      req.res?.setHeader('Retry-After', String(seconds));
      securityLog(log, req, 'sign_in_throttled', { email: input.email });
      throw tooManyRequests(seconds, 'failed sign-ins');
    }
  }

  const user = await User.findOne({ where: { email: input.email.toLowerCase() } });
  const ok = await verifyPassword(user?.passwordHash ?? null, input.password);
  if (!user || !ok || !user.active) {
    for (const { key } of keys) await hit(key, windowMs);
    securityLog(log, req, 'sign_in_failed', { email: input.email });
    throw new AppError(401, 'bad_credentials', 'That e-mail and password do not match an active account.');
  }

  await clear(accountKey(input.email));
  const authUser = toAuthUser(user);
  // passport 0.7 regenerates the session inside req.login: a new id, the old one destroyed.
  await new Promise<void>((resolve, reject) => req.login(authUser, (error) => (error ? reject(error) : resolve())));
  const now = Date.now();
  req.session.csrfToken = newCsrfToken();
  req.session.signedInAt = now;
  req.session.lastSeenAt = now;
  await new Promise<void>((resolve, reject) => req.session.save((error) => (error ? reject(error) : resolve())));
  await user.update({ lastSignInAt: new Date(now) });
  securityLog(log, req, 'sign_in_succeeded');
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

const RESET_TTL_MS = 60 * 60 * 1000;
const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

/** Always answers the same, whether or not the address has an account (no account probing). */
export async function requestPasswordReset(deps: AppDeps, email: string) {
  const user = await User.findOne({ where: { email: email.toLowerCase(), active: true } });
  if (!user) return;
  const token = crypto.randomBytes(32).toString('base64url');
  await deps.sequelize.transaction(async (transaction) => {
    await PasswordReset.create(
      { userId: user.id, tokenHash: sha256(token), expiresAt: new Date(Date.now() + RESET_TTL_MS), usedAt: null },
      { transaction },
    );
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
  const reset = await PasswordReset.findOne({ where: { tokenHash: sha256(token), usedAt: null, expiresAt: { [Op.gt]: new Date() } } });
  if (!reset) throw new AppError(400, 'reset_link_invalid', 'This reset link has expired or was already used. Ask for a new one.');
  const passwordHash = await hashPassword(password);
  await deps.sequelize.transaction(async (transaction) => {
    await User.update({ passwordHash }, { where: { id: reset.userId }, transaction });
    await reset.update({ usedAt: new Date() }, { transaction });
    await SessionRow.destroy({ where: { userId: reset.userId }, transaction });
  });
}
