import crypto from 'node:crypto';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { PasswordReset, AccountMailRequest, type AccountLinkPurpose } from './account-link.model';
import { findAccountByEmail } from '../users/user-directory';
import { queueMail } from '../../lib/mailer';
import type { AppDeps } from '../../lib/http';

/**
 * Single-use account links: password resets, invitations and mailed sign-in links. Only a
 * SHA-256 of the token is stored. A link is consumed by one conditional UPDATE, so of any
 * number of parallel uses exactly one wins; using one voids every other open link of the
 * account (as does any password change).
 */

export const LINK_LIFETIME_MS: Record<AccountLinkPurpose, number> = {
  reset: 60 * 60_000,
  invite: 7 * 24 * 3_600_000,
  sign_in: 15 * 60_000,
};

const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

/** Creates a link for the user and returns its token (the only time it exists in clear). */
export async function createAccountLink(userId: number, purpose: AccountLinkPurpose, transaction: Transaction) {
  const token = crypto.randomBytes(32).toString('base64url');
  await PasswordReset.create(
    { userId, purpose, tokenHash: sha256(token), expiresAt: new Date(Date.now() + LINK_LIFETIME_MS[purpose]), usedAt: null },
    { transaction },
  );
  return token;
}

/**
 * Uses a link: the conditional UPDATE marks it used only if it is open, unexpired and of an
 * accepted purpose; the row lock makes a parallel second use see it used. Returns the user id,
 * or null when the link is not (or no longer) valid. Voids the account's other open links.
 */
export async function consumeAccountLink(token: string, purposes: AccountLinkPurpose[], transaction: Transaction): Promise<number | null> {
  const tokenHash = sha256(token);
  const now = new Date();
  const [, affected] = await PasswordReset.sequelize!.query(
    `UPDATE password_resets SET used_at = :now, updated_at = :now
      WHERE token_hash = :tokenHash AND used_at IS NULL AND expires_at > :now AND purpose IN (:purposes)`,
    { type: QueryTypes.UPDATE, replacements: { now, tokenHash, purposes }, transaction },
  );
  if (Number(affected) !== 1) return null;
  const link = await PasswordReset.findOne({ where: { tokenHash }, attributes: ['userId'], transaction });
  await voidOpenLinks(link!.userId, transaction, now);
  return link!.userId;
}

/** Every open link of the account becomes unusable (a link was used, or the password changed). */
export async function voidOpenLinks(userId: number, transaction: Transaction, now = new Date()) {
  await PasswordReset.update({ usedAt: now }, { where: { userId, usedAt: null }, transaction });
}

// ---- "Mail me a link" requests -----------------------------------------------------------

export type AccountMailKind = AccountMailRequest['kind'];

/**
 * The whole of what a request does while the client waits: one INSERT, the same for a known
 * and an unknown address. Looking the address up and writing the mail happen afterwards.
 */
export async function recordAccountMailRequest(kind: AccountMailKind, email: string) {
  await AccountMailRequest.create({ kind, email: email.toLowerCase() });
}

/** At most this many links of one kind are mailed to one account per quarter hour (no mail bombing). */
const MAILS_PER_QUARTER_HOUR = 3;

/**
 * Works through pending requests: claims rows with FOR UPDATE SKIP LOCKED (several server
 * processes may run this), and for a known active account creates the link and queues its
 * mail in the same transaction that deletes the request.
 */
export async function processAccountMailRequests(deps: AppDeps, batch = 20): Promise<number> {
  return deps.sequelize.transaction(async (transaction) => {
    const rows = await AccountMailRequest.findAll({
      order: [['id', 'ASC']],
      limit: batch,
      lock: transaction.LOCK.UPDATE,
      skipLocked: true,
      transaction,
    });
    for (const row of rows) await answer(deps, row, transaction);
    if (rows.length) await AccountMailRequest.destroy({ where: { id: rows.map((r) => r.id) }, transaction });
    return rows.length;
  });
}

async function answer(deps: AppDeps, request: AccountMailRequest, transaction: Transaction) {
  const user = await findAccountByEmail(request.email, transaction);
  // A mailed sign-in link is for an account that has a password (an invitee uses the invitation).
  if (!user || !user.active || (request.kind === 'sign_in_link' && !user.passwordHash)) return;
  const purpose: AccountLinkPurpose = request.kind === 'sign_in_link' ? 'sign_in' : 'reset';
  const recent = await PasswordReset.count({
    where: { userId: user.id, purpose, createdAt: { [Op.gt]: new Date(Date.now() - 15 * 60_000) } },
    transaction,
  });
  if (recent >= MAILS_PER_QUARTER_HOUR) return;
  const token = await createAccountLink(user.id, purpose, transaction);
  const base = deps.config.publicUrl;
  const mail =
    purpose === 'sign_in'
      ? {
          subject: 'Faultline: your sign-in link',
          text: `Hello ${user.name},\n\nSomeone (hopefully you) asked for a link to sign in to Faultline without the password.\nOpen this link within 15 minutes; it works once:\n\n${base}/sign-in-link/${token}\n\nIf you did not ask for it, ignore this mail. If you did not expect it at all, someone may be guessing your password: tell your facility's administrator.\n`,
        }
      : {
          subject: 'Faultline: reset your password',
          text: `Hello ${user.name},\n\nSomeone (hopefully you) asked to reset your Faultline password.\nOpen this link within one hour to choose a new one:\n\n${base}/reset-password/${token}\n\nIf you did not ask for this, ignore this mail; your password stays as it is.\n`,
        };
  await queueMail({ to: user.email, ...mail }, transaction);
}

/**
 * Runs the request processing soon after each request (nudge) and every few seconds as a
 * sweep, so requests left behind by a stopped process are answered too.
 */
export class AccountMailQueue {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<unknown> = Promise.resolve();

  constructor(
    private deps: AppDeps,
    private sweepMs = 5_000,
  ) {}

  start() {
    if (this.timer) return;
    this.timer = setInterval(() => this.nudge(), this.sweepMs);
    this.timer.unref();
    this.nudge();
  }

  /** Asks for a pass soon; does nothing when the queue was not started (tests run passes by hand). */
  nudge() {
    if (this.timer) void this.runOnce();
  }

  /** One pass; passes are queued, never overlapped. Returns how many requests were handled. */
  runOnce(): Promise<number> {
    const pass = this.running.then(() =>
      processAccountMailRequests(this.deps).catch((error) => {
        this.deps.log.warn({ err: String(error) }, 'account mail pass failed; will retry');
        return 0;
      }),
    );
    this.running = pass;
    return pass;
  }

  async stop() {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.running;
  }
}
