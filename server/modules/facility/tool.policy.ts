import { AppError, forbidden } from '../../lib/errors';
import type { AuthUser } from '../../lib/http';
import { isStaff } from '../../../shared/roles';
import type { ToolAction } from '../../../shared/schemas/facility';

// What a user may do to a tool, decided once: the tool page gets allowedToolActions() with the
// tool, and the writes call authorizeToolAction() with the same facts.

const ALL: readonly ToolAction[] = ['change_state'];

type Decision = { ok: true } | { ok: false; error: AppError };

function decide(user: AuthUser, tool: { retiredAt: Date | null }, action: ToolAction): Decision {
  switch (action) {
    case 'change_state':
      if (!isStaff(user.role)) return { ok: false, error: forbidden('Only technicians, managers and admins can change a tool’s state.') };
      if (tool.retiredAt)
        return { ok: false, error: new AppError(409, 'tool_retired', 'This tool is retired; its state can no longer change.') };
      return { ok: true };
  }
}

export function allowedToolActions(user: AuthUser, tool: { retiredAt: Date | null }): ToolAction[] {
  return ALL.filter((action) => decide(user, tool, action).ok);
}

export function authorizeToolAction(user: AuthUser, tool: { retiredAt: Date | null }, action: ToolAction) {
  const d = decide(user, tool, action);
  if (!d.ok) throw d.error;
}
