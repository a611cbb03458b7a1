import type { RequestHandler } from 'express';
import { AppError } from '../../lib/errors';

/**
 * Admission control for the ingest API: at most `concurrent` ingest requests of this process
 * work at once, a bounded number wait, and the rest are told to come back (503, Retry-After).
 * That keeps database connections free for people — the board, the queue — while a tool
 * empties a day's buffer; senders retry (the forwarder does), and ids make retries safe.
 */
export function ingestGate(opts: { concurrent: number; queue: number; retryAfterSeconds?: number }): RequestHandler {
  let active = 0;
  const waiting: (() => void)[] = [];
  const release = () => {
    const next = waiting.shift();
    if (next) next();
    else active--;
  };
  return (_req, res, next) => {
    const start = () => {
      let done = false;
      const finish = () => {
        if (done) return;
        done = true;
        release();
      };
      res.once('finish', finish);
      res.once('close', finish);
      next();
    };
    if (active < opts.concurrent) {
      active++;
      return start();
    }
    if (waiting.length >= opts.queue) {
      res.setHeader('Retry-After', String(opts.retryAfterSeconds ?? 2));
      return next(
        new AppError(
          503,
          'ingest_busy',
          'Faultline is busy taking in alarms; send these events again in a moment (their ids make a resend safe).',
        ),
      );
    }
    waiting.push(start);
  };
}
