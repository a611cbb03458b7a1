import { AppError } from '../../lib/errors';
import type { AuthUser } from '../../lib/http';
import { USER_ACTIONS, type UserAction, type UpdateUserInput } from '../../../shared/schemas/users';

// What an administrator may do to an account, decided once: the user list carries
// allowedUserActions() for each person, and updateUser() calls authorizeUserUpdate().
// The route already admits admins only; the rule here is that nobody locks themselves out.

const ALL: readonly UserAction[] = USER_ACTIONS;

function refusal(actor: AuthUser, target: { id: number }, action: UserAction): AppError | null {
  const self = actor.id === target.id;
  if (self && (action === 'disable' || action === 'change_role'))
    return new AppError(409, 'cannot_demote_self', 'You cannot disable yourself or take away your own admin role.');
  return null;
}

export function allowedUserActions(actor: AuthUser, target: { id: number }): UserAction[] {
  return ALL.filter((action) => refusal(actor, target, action) === null);
}

/** The actions an update asks for; a change to one's own role that keeps it admin asks for none. */
export function actionsOf(target: { role: string }, input: UpdateUserInput): UserAction[] {
  const actions: UserAction[] = [];
  if (input.name !== undefined) actions.push('rename');
  if (input.role !== undefined && input.role !== target.role) actions.push('change_role');
  if (input.onCall !== undefined) actions.push('set_on_call');
  if (input.active === false) actions.push('disable');
  if (input.active === true) actions.push('enable');
  return actions;
}

export function authorizeUserUpdate(actor: AuthUser, target: { id: number; role: string }, input: UpdateUserInput) {
  for (const action of actionsOf(target, input)) {
    const error = refusal(actor, target, action);
    if (error) throw error;
  }
}
