import { AppError, forbidden } from '../../lib/errors';
import type { AuthUser } from '../../lib/http';
import { hasRole, isStaff } from '../../../shared/roles';
import { ACTIONS, TICKET_ACTIONS, canPerform, isOpenStatus, type TicketAction, type TicketStatus } from '../../../shared/ticket-workflow';
import { STAFF_ONLY_ACTIONS, type TicketDetail } from '../../../shared/schemas/tickets';

// What a user may do to a ticket, decided in one place. The ticket page gets the list of
// allowed actions from allowedTicketActions(); every write calls authorizeTicketAction() with the
// same facts. So the buttons a person sees are exactly the requests the server accepts.

export type TicketActionName = TicketDetail['allowedActions'][number];

/** Every action, in the order the ticket page lists them. */
export const ALL_TICKET_ACTIONS: readonly TicketActionName[] = [...TICKET_ACTIONS, 'comment', 'add_report', 'note', ...STAFF_ONLY_ACTIONS];

/** What the decision depends on, read from the ticket and the state log. */
export interface TicketFacts {
  id: number;
  status: TicketStatus;
  reporterId: number | null;
  resolvedAt: Date | null;
  mergedIntoId: number | null;
  /** The ticket holds a Down (or a limit) that a lab user reported and no technician has confirmed yet. */
  awaitingConfirmation: boolean;
}

/** The intervals a ticket holds (Down or Limited) that a lab user reported and no technician has confirmed yet. */
export function awaitingConfirmation<T extends { ticketId: number | null; source: string; confirmed: boolean }>(
  ticketId: number,
  openIntervals: readonly T[],
): T[] {
  return openIntervals.filter((s) => s.ticketId === ticketId && s.source === 'user_report' && !s.confirmed);
}

type Decision = { ok: true } | { ok: false; error: AppError };
const ALLOW: Decision = { ok: true };
const refuse = (error: AppError): Decision => ({ ok: false, error });

const merged = (t: TicketFacts, where: string) =>
  refuse(new AppError(409, 'ticket_merged', `This ticket was merged into #${t.mergedIntoId}${where}.`));
const notOpen = () => refuse(new AppError(409, 'ticket_not_open', 'This ticket is no longer open.'));

function decideWorkflow(user: AuthUser, t: TicketFacts, action: TicketAction, now: Date): Decision {
  const rule = ACTIONS[action];
  if (!hasRole(user.role, rule.minimumRole)) {
    return refuse(forbidden(`Only technicians, managers and admins can ${rule.label.toLowerCase()} a ticket.`));
  }
  const result = canPerform(action, t.status, { role: user.role, isReporter: t.reporterId === user.id, now, resolvedAt: t.resolvedAt });
  if (result.ok) return ALLOW;
  if (!rule.from.includes(t.status)) return refuse(new AppError(409, 'invalid_transition', result.reason));
  return refuse(forbidden(result.reason));
}

export function decideTicketAction(user: AuthUser, t: TicketFacts, action: TicketActionName, now = new Date()): Decision {
  switch (action) {
    case 'comment':
      return t.status === 'merged' ? merged(t, '; write there') : ALLOW;
    case 'note':
      if (!isStaff(user.role)) return refuse(forbidden('Only staff can write internal notes.'));
      return t.status === 'merged' ? merged(t, '; write there') : ALLOW;
    case 'add_report':
      if (t.status === 'merged') return merged(t, '; add your report there');
      if (!isOpenStatus(t.status))
        return refuse(
          new AppError(409, 'ticket_not_open', 'This ticket is no longer open. Report the problem as a new one, or reopen this ticket.'),
        );
      return ALLOW;
    case 'assign':
    case 'set_priority':
    case 'set_state':
    case 'confirm_down':
    case 'revert_down':
      if (!isStaff(user.role)) return refuse(forbidden('Only technicians, managers and admins can do this.'));
      if (t.status === 'merged') return merged(t, '');
      if ((action === 'assign' || action === 'set_priority') && !isOpenStatus(t.status)) return notOpen();
      if ((action === 'confirm_down' || action === 'revert_down') && !t.awaitingConfirmation)
        return refuse(
          new AppError(
            409,
            action === 'confirm_down' ? 'nothing_to_confirm' : 'nothing_to_revert',
            'There is no reported Down waiting for confirmation.',
          ),
        );
      return ALLOW;
    default:
      return decideWorkflow(user, t, action, now);
  }
}

/** The actions this user may take on the ticket now, sent with the ticket. */
export function allowedTicketActions(user: AuthUser, t: TicketFacts, now = new Date()): TicketActionName[] {
  return ALL_TICKET_ACTIONS.filter((action) => decideTicketAction(user, t, action, now).ok);
}

/** Throws the refusal (403 or 409 with the reason) unless the user may take the action now. */
export function authorizeTicketAction(user: AuthUser, t: TicketFacts, action: TicketActionName, now = new Date()) {
  const decision = decideTicketAction(user, t, action, now);
  if (!decision.ok) throw decision.error;
}
