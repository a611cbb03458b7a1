import type { ErrorRequestHandler } from 'express';
import multer from 'multer';
import { OptimisticLockError, UniqueConstraintError, ForeignKeyConstraintError } from 'sequelize';
import { AppError } from './errors';
import { isDatabaseDown } from '../db';
import type { Logger } from './logger';

const MULTER_TOO_LARGE = new Set([
  'LIMIT_FILE_SIZE',
  'LIMIT_FILE_COUNT',
  'LIMIT_PART_COUNT',
  'LIMIT_FIELD_KEY',
  'LIMIT_FIELD_VALUE',
  'LIMIT_FIELD_COUNT',
]);

/** Maps any error to the one JSON error shape; unknown errors are logged with their stack, never sent. */
export function toAppError(error: unknown): AppError | null {
  if (error instanceof AppError) return error;
  if (error instanceof multer.MulterError) {
    if (MULTER_TOO_LARGE.has(error.code)) return new AppError(413, 'upload_too_large', uploadLimitMessage(error.code));
    return new AppError(400, 'upload_invalid', `The upload was not accepted (${error.field ?? 'file'}).`);
  }
  if (error instanceof OptimisticLockError)
    return new AppError(409, 'stale_version', 'Someone else changed this in the meantime. Reload to see their change.');
  if (error instanceof UniqueConstraintError)
    return new AppError(
      409,
      'already_exists',
      'Something with that name or code already exists.',
      Object.fromEntries(error.errors.map((e) => [e.path ?? '', ['Already in use.']])),
    );
  if (error instanceof ForeignKeyConstraintError) return new AppError(400, 'invalid_reference', 'A referenced item does not exist.');
  if (isDatabaseDown(error))
    return new AppError(503, 'db_unavailable', 'The database is not reachable right now. Nothing was saved; please try again in a moment.');
  const e = error as { type?: string; status?: number } | null;
  if (e?.type === 'entity.parse.failed')
    return new AppError(400, 'validation_failed', 'The request body is not valid JSON.', { body: ['Not valid JSON.'] });
  if (e?.type === 'entity.too.large') return new AppError(413, 'body_too_large', 'The request body is too large.');
  if (e?.status && e.status >= 400 && e.status < 500) return new AppError(e.status, 'bad_request', 'The request was not understood.');
  return null;
}

function uploadLimitMessage(code: string) {
  if (code === 'LIMIT_FILE_SIZE') return 'A photo is too large.';
  if (code === 'LIMIT_FILE_COUNT') return 'Too many photos in one request.';
  return 'The upload has too many parts.';
}

export function errorMiddleware(log: Logger): ErrorRequestHandler {
  return (error, req, res, _next) => {
    const known = toAppError(error);
    if (res.headersSent) return;
    if (known) {
      if (known.status >= 500)
        log.warn(
          { code: known.code, route: `${req.method} ${req.originalUrl}`, ...(known.cause ? { cause: String(known.cause) } : {}) },
          known.message,
        );
      res
        .status(known.status)
        .json({ error: { code: known.code, message: known.message, ...(known.fields ? { fields: known.fields } : {}) } });
      return;
    }
    log.error({ err: error, route: `${req.method} ${req.originalUrl}` }, 'unhandled error');
    res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on our side. It has been logged.' } });
  };
}
