import { useState } from 'react';
import type { Role } from '@shared/roles';
import type { UpdateUserInput } from '@shared/schemas/users';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import type { AdminUser } from '@/features/users/api/list-users';
import { useUpdateUser } from '@/features/users/api/update-user';
import { CheckboxField, SelectField } from '@/features/users/components/form-controls';
import { isRole, ON_CALL_HINT, ROLE_OPTIONS } from '@/features/users/components/role-options';

function describeFailure(error: unknown): string {
  if (!isApiError(error)) return 'The change could not be saved. Try again.';
  if (error.isNetworkError) return 'Faultline cannot be reached. Nothing was changed; try again.';
  return error.message;
}

export interface UserEditorProps {
  /** Carries allowedActions from the user policy (server/modules/users/user.policy.ts). */
  user: AdminUser;
  /** Called after a successful change, with a sentence to announce. */
  onSaved: (message: string) => void;
  onClose: () => void;
}

/** Role, on-call and access of one person, with a confirm step before access changes. */
export function UserEditor({ user, onSaved, onClose }: UserEditorProps) {
  // What the server will accept, as its policy says: one's own role and access stay as they are.
  const mayChangeRole = user.allowedActions.includes('change_role');
  const mayChangeAccess = user.allowedActions.includes(user.active ? 'disable' : 'enable');
  const update = useUpdateUser();
  const [role, setRole] = useState<Role>(user.role);
  const [onCall, setOnCall] = useState(user.onCall);
  const [confirming, setConfirming] = useState(false);

  const changes: UpdateUserInput = {};
  // Sending an unchanged role would still sign the person out, so only differences go.
  if (role !== user.role) changes.role = role;
  if (onCall !== user.onCall) changes.onCall = onCall;
  const dirty = Object.keys(changes).length > 0;

  const save = () => {
    update.mutate(
      { id: user.id, changes },
      {
        onSuccess: (saved) => {
          const roleNote = changes.role ? ' They sign in again to work with the new role.' : '';
          onSaved(`Changes to ${saved.name} saved.${roleNote}`);
        },
      },
    );
  };

  const setActive = (active: boolean) => {
    update.mutate(
      { id: user.id, changes: { active } },
      {
        onSuccess: (saved) =>
          onSaved(active ? `${saved.name} can sign in again.` : `${saved.name} is disabled and was signed out everywhere.`),
        onSettled: () => setConfirming(false),
      },
    );
  };

  return (
    <div className="flex flex-col gap-5 py-2" data-testid={`user-editor-${user.id}`}>
      {update.isError && (
        <Alert tone="danger" live title="Not saved">
          {describeFailure(update.error)}
        </Alert>
      )}

      <div className="grid gap-5 md:grid-cols-2">
        <SelectField
          label="Role"
          name="role"
          options={ROLE_OPTIONS}
          value={role}
          disabled={!mayChangeRole || update.isPending}
          hint={
            !mayChangeRole
              ? 'You cannot take away your own administrator role; another administrator can.'
              : 'Changing the role signs the person out everywhere, so the new role applies at once.'
          }
          onChange={(event) => {
            if (isRole(event.target.value)) setRole(event.target.value);
          }}
        />
        <CheckboxField
          label="On call"
          name="onCall"
          hint={ON_CALL_HINT}
          checked={onCall}
          onChange={setOnCall}
          disabled={update.isPending}
        />
      </div>

      <div className="flex flex-wrap gap-3">
        <Button onClick={save} disabled={!dirty} busy={update.isPending && dirty && !confirming}>
          Save changes
        </Button>
        <Button variant="secondary" onClick={onClose} disabled={update.isPending}>
          Close
        </Button>
      </div>

      {user.invited && user.active && (
        <p className="text-sm text-muted">
          Invitation not arrived or expired? {user.name} can ask for a fresh link on the sign-in page under “Forgot your password?”, using{' '}
          {user.email}.
        </p>
      )}

      <div className="border-t border-line pt-4">
        <h4 className="text-sm font-semibold text-ink">Access</h4>
        {!mayChangeAccess ? (
          <p className="mt-1 text-sm text-muted">You cannot disable your own account; another administrator can.</p>
        ) : confirming ? (
          <Alert
            tone={user.active ? 'warning' : 'info'}
            className="mt-3"
            title={user.active ? `Disable ${user.name}?` : `Enable ${user.name}?`}
            actions={
              <>
                <Button variant={user.active ? 'danger' : 'primary'} busy={update.isPending} onClick={() => setActive(!user.active)}>
                  {user.active ? 'Yes, disable the account' : 'Yes, enable the account'}
                </Button>
                <Button variant="secondary" onClick={() => setConfirming(false)} disabled={update.isPending}>
                  {user.active ? 'Keep it active' : 'Keep it disabled'}
                </Button>
              </>
            }
          >
            {user.active
              ? 'They are signed out everywhere at once, their open pages stop updating, and they cannot sign in until an administrator enables the account again. Their reports and history stay.'
              : 'They can sign in again with their password. Someone who never chose one can ask for a new link under “Forgot your password?”.'}
          </Alert>
        ) : (
          <div className="mt-2 flex flex-wrap items-center gap-3">
            <p className="text-sm text-muted">{user.active ? 'The account can sign in.' : 'The account is disabled and cannot sign in.'}</p>
            <Button variant="secondary" onClick={() => setConfirming(true)} disabled={update.isPending}>
              {user.active ? 'Disable account…' : 'Enable account…'}
            </Button>
          </div>
        )}
      </div>
    </div>
  );
}
