import { z } from 'zod';
import { plainText } from './text';

// Sign-in input, checked by the sign-in form and by POST /api/session alike.
// The password cap keeps a hostile request from making the hasher work on megabytes.
export const signInSchema = z.strictObject({
  email: z.email({ error: 'Enter the e-mail address of your account, like name@example.org.' }),
  password: plainText({ error: 'Enter your password.' })
    .min(1, { error: 'Enter your password.' })
    .max(1024, { error: 'That password is too long (at most 1024 characters).' }),
});

export type SignInInput = z.infer<typeof signInSchema>;

// Asking for a mailed sign-in link, and using one (the token is 32 random bytes, base64url).
export const signInLinkRequestSchema = z.strictObject({ email: z.email('Enter a valid e-mail address.').max(254) });
export const signInLinkParams = z.strictObject({ token: z.string().regex(/^[A-Za-z0-9_-]{43}$/, 'This link is not valid.') });
export type SignInLinkRequestInput = z.infer<typeof signInLinkRequestSchema>;
