import pino from 'pino';
import type { Request } from 'express';

export type Logger = pino.Logger;

export function createLogger(level: string, destination?: pino.DestinationStream): Logger {
  return pino(
    {
      level,
      base: undefined,
      timestamp: pino.stdTimeFunctions.isoTime,
      // Secrets never reach a log line, even by accident.
      redact: { paths: ['password', '*.password', 'token', '*.token', 'req.headers.cookie', 'sessionId'], remove: true },
    },
    destination,
  );
}

export type SecurityEvent =
  | 'sign_in_succeeded'
  | 'sign_in_failed'
  | 'sign_in_throttled'
  | 'signed_out'
  | 'access_denied'
  | 'unauthenticated'
  | 'csrf_refused'
  | 'validation_failed'
  | 'rate_limited'
  | 'session_expired';

/** One structured line per security-relevant event: UTC time, user, route, address. */
export function securityLog(log: Logger, req: Request, event: SecurityEvent, extra: Record<string, unknown> = {}) {
  log.info({
    security: event,
    userId: req.user?.id ?? null,
    route: `${req.method} ${req.originalUrl.split('?')[0]}`,
    address: req.ip,
    ...extra,
  });
}
