import type { ZodError } from 'zod';

/** The one error type of the server: an HTTP status, a stable code and a human message. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string[]>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const badRequest = (message: string, fields?: Record<string, string[]>) => new AppError(400, 'validation_failed', message, fields);
export const unauthorized = (message = 'Please sign in.') => new AppError(401, 'unauthenticated', message);
export const forbidden = (message = 'You are not allowed to do this.') => new AppError(403, 'forbidden', message);
export const notFound = (what = 'That') => new AppError(404, 'not_found', `${what} was not found.`);
export const conflict = (message: string, code = 'conflict') => new AppError(409, code, message);

/** Turns a zod error into field messages keyed by dotted path ("" for the whole input). */
export function zodFields(error: ZodError, prefix?: string): Record<string, string[]> {
  const fields: Record<string, string[]> = {};
  for (const issue of error.issues) {
    let path = issue.path.map(String).join('.');
    const message = issue.message;
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) {
        const p = [prefix, path, key].filter(Boolean).join('.');
        (fields[p] ??= []).push('This field is not accepted here.');
      }
      continue;
    }
    path = [prefix, path].filter(Boolean).join('.');
    (fields[path] ??= []).push(message);
  }
  return fields;
}
