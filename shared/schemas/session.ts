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
