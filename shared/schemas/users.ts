import { z } from 'zod';
import { plainText } from './text';
import { ROLES } from '../roles';

export const userListQuery = z.strictObject({
  q: plainText().trim().max(120).optional(),
  role: z.enum(ROLES).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

/** An admin invites a person; they choose their own password from the e-mailed link. */
export const inviteUserSchema = z.strictObject({
  email: z.email('Enter a valid e-mail address.').max(254),
  name: plainText().trim().min(1, 'Enter a name.').max(120),
  role: z.enum(ROLES),
  onCall: z.boolean().optional(),
});

export const updateUserSchema = z
  .strictObject({
    name: plainText().trim().min(1).max(120).optional(),
    role: z.enum(ROLES).optional(),
    active: z.boolean().optional(),
    onCall: z.boolean().optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' });

export type InviteUserInput = z.infer<typeof inviteUserSchema>;
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

/** What an administrator may do to an account; the user list sends the allowed ones per person. */
export const USER_ACTIONS = ['rename', 'change_role', 'set_on_call', 'disable', 'enable'] as const;
export type UserAction = (typeof USER_ACTIONS)[number];
