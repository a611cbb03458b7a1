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
  | 'session_expired'
  | 'account_mail_requested'
  | 'account_link_refused'
  | 'password_changed'
  | 'webhook_signature_refused';

// Path segments that look like a link token (32 random bytes in base64url, or longer keys).
const TOKEN_SEGMENT = /\/[A-Za-z0-9_-]{32,}(?=\/|$)/g;

/**
 * One structured line per security-relevant event: UTC time, user, route, address. Token-like
 * path segments (reset and sign-in links) are masked: a log line must not be a way in.
 */
export function securityLog(log: Logger, req: Request, event: SecurityEvent, extra: Record<string, unknown> = {}) {
  log.info({
    security: event,
    userId: req.user?.id ?? null,
    route: `${req.method} ${req.originalUrl.split('?')[0].replace(TOKEN_SEGMENT, '/:token')}`,
    address: req.ip,
    ...extra,
  });
}
