import { useRef, useState, type FormEvent } from 'react';
import { z } from 'zod';
import type { Role } from '@shared/roles';
import { inviteUserSchema, type InviteUserInput } from '@shared/schemas/users';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { EmailField } from '@/components/ui/email-field';
import { TextField } from '@/components/ui/text-field';
import { isApiError } from '@/lib/api-client';
import { useFieldErrors, type FieldErrors } from '@/lib/use-field-errors';
import type { AdminUser } from '@/features/users/api/list-users';
import { useInviteUser } from '@/features/users/api/invite-user';
import { CheckboxField, SelectField } from '@/features/users/components/form-controls';
import { isRole, ON_CALL_HINT, ROLE_HINT, ROLE_OPTIONS } from '@/features/users/components/role-options';

type FieldName = 'name' | 'email';

function describeFailure(error: unknown): string {
  if (!isApiError(error)) return 'The invitation could not be sent. Try again.';
  if (error.code === 'already_exists') return 'Someone already has an account with this e-mail address. Find them in the list below.';
  if (error.isNetworkError) return 'Faultline cannot be reached. Check your connection and try again.';
  if (error.code === 'validation_failed') return 'Check the fields marked below.';
  return error.message;
}

export interface InviteUserFormProps {
  onInvited: (user: AdminUser) => void;
  onCancel: () => void;
}

/** Creates an account without a password; the person chooses one from the e-mailed link. */
export function InviteUserForm({ onInvited, onCancel }: InviteUserFormProps) {
  const invite = useInviteUser();
  const [name, setName] = useState('');
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<Role>('member');
  const [onCall, setOnCall] = useState(false);
  const { fieldErrors, setFieldErrors, clearFieldError } = useFieldErrors<FieldName>();
  const nameInput = useRef<HTMLInputElement>(null);
  const emailInput = useRef<HTMLInputElement>(null);

  const focusFirstInvalid = (errors: FieldErrors<FieldName>) => {
    if (errors.name) nameInput.current?.focus();
    else if (errors.email) emailInput.current?.focus();
  };

  const onSubmit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = inviteUserSchema.safeParse({ name, email: email.trim(), role, onCall });
    if (!parsed.success) {
      const errors = z.flattenError(parsed.error).fieldErrors as FieldErrors<FieldName>;
      setFieldErrors(errors);
      focusFirstInvalid(errors);
      return;
    }
    setFieldErrors({});
    const input: InviteUserInput = parsed.data;
    invite.mutate(input, {
      onSuccess: (user) => onInvited(user),
      onError: (error) => {
        if (!isApiError(error)) return;
        const errors: FieldErrors<FieldName> =
          error.code === 'already_exists'
            ? { email: ['This address already has an account.'] }
            : { name: error.fields?.name, email: error.fields?.email };
        setFieldErrors(errors);
        focusFirstInvalid(errors);
      },
    });
  };

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-5" aria-label="Invite a person">
      {invite.isError && (
        <Alert tone="danger" live title="No invitation sent">
          {describeFailure(invite.error)}
        </Alert>
      )}

      <div className="grid gap-5 md:grid-cols-2">
        <TextField
          ref={nameInput}
          label="Name"
          name="name"
          autoComplete="off"
          required
          value={name}
          errors={fieldErrors.name}
          onChange={(event) => {
            setName(event.target.value);
            clearFieldError('name');
          }}
        />
        <EmailField
          ref={emailInput}
          name="email"
          autoComplete="off"
          required
          hint="The invitation goes here; its link works for 7 days."
          value={email}
          errors={fieldErrors.email}
          onChange={(event) => {
            setEmail(event.target.value);
            clearFieldError('email');
          }}
        />
      </div>

      <SelectField
        label="Role"
        name="role"
        hint={ROLE_HINT}
        options={ROLE_OPTIONS}
        value={role}
        onChange={(event) => {
          if (isRole(event.target.value)) setRole(event.target.value);
        }}
      />

      <CheckboxField label="On call" name="onCall" hint={ON_CALL_HINT} checked={onCall} onChange={setOnCall} />

      <div className="flex flex-wrap gap-3">
        <Button type="submit" busy={invite.isPending}>
          {invite.isPending ? 'Sending…' : 'Send the invitation'}
        </Button>
        <Button variant="secondary" onClick={onCancel} disabled={invite.isPending}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
