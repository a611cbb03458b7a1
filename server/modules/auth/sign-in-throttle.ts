import crypto from 'node:crypto';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { Config } from '../../config';

/**
 * Sign-in throttling with growing delays, counted BEFORE the password is checked.
 *
 * Three counters per attempt: the account from this address (the tightest), the account from
 * anywhere (a slower guesser with many addresses), and the address across accounts (password
 * spraying). Each allows a few attempts freely; after that every further attempt must wait a
 * delay that doubles each time (base, 2×base, 4×base …, capped at the window). An attempt is
 * counted by one conditional UPDATE that succeeds only when the counter is not waiting, all
 * three in one transaction, so parallel guesses take turns on the row lock and at most the
 * allowed number ever reaches the password check. A count starts over one window after its
 * first attempt, so a key gets at most free + log2(window / base) checks per window.
 *
 * The owner is never locked out for good: the delays are bounded, a mailed sign-in link or a
 * reset link lets them in meanwhile, and a successful sign-in clears their counters.
 */

export interface ThrottleRule {
  key: string;
  free: number;
}

export type AttemptResult = { allowed: true } | { allowed: false; retryAfterSeconds: number };

const digest = (s: string) => crypto.createHash('sha256').update(s.toLowerCase()).digest('hex').slice(0, 40);
// Addresses are kept as they are (the security log has them too); e-mails only as a digest.
const accountKey = (email: string) => `account:${digest(email)}`;
const pairKey = (email: string, ip: string) => `pair:${digest(email)}|${ip}`;
const addressKey = (ip: string) => `address:${ip}`;

export function signInRules(config: Config, email: string, ip: string | undefined): ThrottleRule[] {
  const address = ip ?? 'unknown';
  // Fixed order (pair, account, address): every transaction locks rows in the same order, so
  // two attempts never wait for each other in a circle.
  return [
    { key: pairKey(email, address), free: config.SIGNIN_MAX_FAILURES_PER_ACCOUNT },
    { key: accountKey(email), free: config.SIGNIN_MAX_FAILURES_PER_ACCOUNT_TOTAL },
    { key: addressKey(address), free: config.SIGNIN_MAX_FAILURES_PER_ADDRESS },
  ];
}

function policy(config: Config) {
  const windowMs = config.SIGNIN_WINDOW_SECONDS * 1000;
  return { windowMs, baseMs: Math.round(config.SIGNIN_DELAY_SECONDS * 1000), maxMs: windowMs };
}

const DEADLOCK = /deadlock|lock wait timeout/i;

/**
 * Counts one attempt on every rule, or on none: when any counter is still waiting the whole
 * attempt is refused (and counted nowhere) with the longest wait as Retry-After.
 */
export async function countSignInAttempt(
  sequelize: Sequelize,
  config: Config,
  rules: ThrottleRule[],
  now = new Date(),
): Promise<AttemptResult> {
  const { windowMs, baseMs, maxMs } = policy(config);
  // Rows exist before the transaction, so the UPDATEs below lock single existing rows only.
  for (const rule of rules) {
    await sequelize.query('INSERT IGNORE INTO sign_in_throttles (`key`, attempts) VALUES (:key, 0)', { replacements: { key: rule.key } });
  }
  for (let tries = 0; ; tries++) {
    try {
      return await sequelize.transaction(async (transaction) => {
        for (const rule of rules) {
          const counted = await countOne(sequelize, transaction, rule, { now, cutoff: new Date(now.getTime() - windowMs), baseMs, maxMs });
          if (!counted) {
            const waits = await sequelize.query<{ next: Date | null }>(
              'SELECT MAX(next_allowed_at) AS next FROM sign_in_throttles WHERE `key` IN (:keys)',
              {
                type: QueryTypes.SELECT,
                replacements: { keys: rules.map((r) => r.key) },
                transaction,
              },
            );
            const next = waits[0]?.next ? new Date(waits[0].next).getTime() : now.getTime();
            // Roll back the counts already made on the other rules: a refused attempt costs nothing.
            throw new Refused(Math.max(1, Math.ceil((next - now.getTime()) / 1000)));
          }
        }
        return { allowed: true } as const;
      });
    } catch (error) {
      if (error instanceof Refused) return { allowed: false, retryAfterSeconds: error.seconds };
      if (tries < 3 && DEADLOCK.test(String((error as Error)?.message))) continue;
      throw error;
    }
  }
}

class Refused extends Error {
  constructor(readonly seconds: number) {
    super('refused');
  }
}

/**
 * The one conditional UPDATE: counts the attempt only when the counter is not waiting, and
 * sets the wait that the NEXT attempt must respect. Assignments are ordered so that each one
 * reads the old column values whether MariaDB assigns left to right or simultaneously.
 */
async function countOne(
  sequelize: Sequelize,
  transaction: Transaction,
  rule: ThrottleRule,
  p: { now: Date; cutoff: Date; baseMs: number; maxMs: number },
) {
  const expired = '(window_started_at IS NULL OR window_started_at <= :cutoff)';
  const newAttempts = `IF(${expired}, 1, attempts + 1)`;
  const [, affected] = await sequelize.query(
    `UPDATE sign_in_throttles SET
       next_allowed_at = IF(${newAttempts} < :free, NULL,
         DATE_ADD(:now, INTERVAL CAST(LEAST(:maxMs, :baseMs * POW(2, LEAST(${newAttempts} - :free, 30))) AS UNSIGNED) * 1000 MICROSECOND)),
       attempts = ${newAttempts},
       window_started_at = IF(${expired}, :now, window_started_at)
     WHERE \`key\` = :key AND (next_allowed_at IS NULL OR next_allowed_at <= :now)`,
    { type: QueryTypes.UPDATE, replacements: { ...p, key: rule.key, free: rule.free }, transaction },
  );
  return Number(affected) === 1;
}

/**
 * After a successful sign-in (or a used mailed link): the account's counters start over, and
 * the address gets its attempt back, so people signing in from one shared address do not
 * throttle each other.
 */
export async function signInSucceeded(sequelize: Sequelize, config: Config, email: string, ip: string | undefined) {
  const [pair, account, address] = signInRules(config, email, ip);
  await sequelize.query('DELETE FROM sign_in_throttles WHERE `key` IN (:keys)', { replacements: { keys: [pair.key, account.key] } });
  await sequelize.query(
    `UPDATE sign_in_throttles SET
       next_allowed_at = IF(GREATEST(attempts, 1) - 1 < :free, NULL, next_allowed_at),
       attempts = GREATEST(attempts, 1) - 1
     WHERE \`key\` = :key`,
    { replacements: { key: address.key, free: address.free } },
  );
}

/**
 * Deletes counters nobody needs any more: sign-in counters whose window and wait are over
 * (guesses at invented addresses would otherwise pile up), and rate-limit windows older than a
 * day. Any process may run it; it only deletes rows that mean "no limit" anyway.
 */
export async function pruneThrottles(sequelize: Sequelize, config: Config, now = new Date()) {
  const cutoff = new Date(now.getTime() - config.SIGNIN_WINDOW_SECONDS * 1000);
  await sequelize.query(
    'DELETE FROM sign_in_throttles WHERE (window_started_at IS NULL OR window_started_at <= :cutoff) AND (next_allowed_at IS NULL OR next_allowed_at <= :now)',
    {
      replacements: { cutoff, now },
    },
  );
  await sequelize.query('DELETE FROM throttles WHERE window_started_at <= :dayAgo', {
    replacements: { dayAgo: new Date(now.getTime() - 86_400_000) },
  });
}

/** Prunes every quarter hour; returns the function that stops it. */
export function schedulePruning(sequelize: Sequelize, config: Config, log: { warn: (o: object, m: string) => void }) {
  const timer = setInterval(
    () => void pruneThrottles(sequelize, config).catch((error) => log.warn({ err: String(error) }, 'pruning throttles failed')),
    15 * 60_000,
  );
  timer.unref();
  return () => clearInterval(timer);
}
