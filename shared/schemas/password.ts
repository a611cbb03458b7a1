import { z } from 'zod';
import { plainText } from './text';

export const PASSWORD_MIN = 8;
export const PASSWORD_RECOMMENDED = 12;
export const PASSWORD_MAX = 1024;

/** New passwords: at least 8 characters (12 recommended), long passphrases welcome. */
export const newPasswordSchema = plainText()
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters (${PASSWORD_RECOMMENDED} or more is better).`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`);

export const passwordResetRequestSchema = z.strictObject({ email: z.email('Enter a valid e-mail address.').max(254) });
export const passwordResetSchema = z.strictObject({ password: newPasswordSchema });
export const passwordResetParams = z.strictObject({ token: plainText().regex(/^[A-Za-z0-9_-]{43}$/, 'This link is not valid.') });
