import type { RequestHandler } from 'express';
import { Throttle } from './throttle.model';
import { AppError } from './errors';
import { securityLog, type Logger } from './logger';

/**
 * Fixed-window counters in MariaDB for rate limits, so every server process sees the same
 * counts (sign-in throttling has its own, stricter scheme: modules/auth/sign-in-throttle.ts).
 * `hit` adds one and returns the count in the current window; `peek` only reads.
 */
export async function hit(key: string, windowMs: number, now = new Date()): Promise<number> {
  const sequelize = Throttle.sequelize!;
  // One statement: start a new window when the old one has passed, else count on.
  await sequelize.query(
    `INSERT INTO throttles (\`key\`, hits, window_started_at) VALUES (:key, 1, :now)
     ON DUPLICATE KEY UPDATE
       hits = IF(window_started_at <= :cutoff, 1, hits + 1),
       window_started_at = IF(window_started_at <= :cutoff, :now, window_started_at)`,
    { replacements: { key, now, cutoff: new Date(now.getTime() - windowMs) } },
  );
  return peek(key, windowMs, now);
}

export async function peek(key: string, windowMs: number, now = new Date()): Promise<number> {
  const row = await Throttle.findByPk(key);
  if (!row || row.windowStartedAt.getTime() <= now.getTime() - windowMs) return 0;
  return row.hits;
}

export async function retryAfterSeconds(key: string, windowMs: number, now = new Date()): Promise<number> {
  const row = await Throttle.findByPk(key);
  if (!row) return 0;
  return Math.max(1, Math.ceil((row.windowStartedAt.getTime() + windowMs - now.getTime()) / 1000));
}

export function tooManyRequests(seconds: number, what = 'attempts') {
  const minutes = Math.ceil(seconds / 60);
  return new AppError(429, 'rate_limited', `Too many ${what}. Please try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`);
}

/** A per-user (or per-address) rate limit for routes such as report creation and uploads. */
export function rateLimit(opts: { name: string; limit: number; windowMs: number; log: Logger }): RequestHandler {
  return async (req, res, next) => {
    try {
      const who = req.user ? `user:${req.user.id}` : `ip:${req.ip}`;
      const key = `rl:${opts.name}:${who}`;
      const count = await hit(key, opts.windowMs);
      if (count > opts.limit) {
        const seconds = await retryAfterSeconds(key, opts.windowMs);
        res.setHeader('Retry-After', String(seconds));
        securityLog(opts.log, req, 'rate_limited', { limit: opts.name });
        return next(tooManyRequests(seconds, 'requests'));
      }
      next();
    } catch (error) {
      next(error);
    }
  };
}

/**
 * Per-address limit on API requests from visitors who are neither signed in nor a lobby
 * display: they keep no session, but each request still costs a little work.
 */
export function anonymousRateLimit(opts: { limit: number; log: Logger }): RequestHandler {
  const limited = rateLimit({ name: 'anonymous', limit: opts.limit, windowMs: 60_000, log: opts.log });
  return (req, res, next) => (req.user || req.displayLinkId ? next() : limited(req, res, next));
}
