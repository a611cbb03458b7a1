import { hasRole, isStaff, type Role } from './roles';

// The ticket workflow, shared by the client (which buttons to show) and the server (which
// requests to accept). Everything below is derived from the ACTIONS table, so a change to the
// workflow is a change to that table and nowhere else.

export const TICKET_STATUSES = ['reported', 'acknowledged', 'in_repair', 'waiting', 'fixed', 'closed', 'merged', 'no_fault_found'] as const;
export type TicketStatus = (typeof TICKET_STATUSES)[number];

export const STATUS_LABELS: Record<TicketStatus, string> = {
  reported: 'Reported',
  acknowledged: 'Acknowledged',
  in_repair: 'In repair',
  waiting: 'Waiting',
  fixed: 'Fixed',
  closed: 'Closed',
  merged: 'Merged',
  no_fault_found: 'No fault found',
};

/** A ticket is open while the tool problem behind it is unresolved. */
export const OPEN_STATUSES = ['reported', 'acknowledged', 'in_repair', 'waiting'] as const satisfies readonly TicketStatus[];

export function isOpenStatus(status: TicketStatus): boolean {
  return (OPEN_STATUSES as readonly TicketStatus[]).includes(status);
}

/**
 * Statuses in which the problem counts as dealt with. The moment a ticket enters one of these
 * is its `resolvedAt`, which starts the reporter's reopen window.
 */
export const RESOLVED_STATUSES = ['fixed', 'closed', 'no_fault_found'] as const satisfies readonly TicketStatus[];

/** How long after a ticket is resolved its reporter may still reopen it. */
export const REOPEN_WINDOW_DAYS = 7;

const DAY_MS = 24 * 60 * 60 * 1000;

export const TICKET_ACTIONS = [
  'acknowledge',
  'start_repair',
  'wait',
  'resume',
  'fix',
  'close',
  'merge',
  'no_fault_found',
  'reopen',
] as const;
export type TicketAction = (typeof TICKET_ACTIONS)[number];

/**
 * An extra condition for actors below staff level. Staff are never held to it.
 * - `reporter_within_reopen_window`: the actor reported the ticket and it was resolved no more
 *   than REOPEN_WINDOW_DAYS ago.
 */
export type MemberCondition = 'reporter_within_reopen_window';

export interface ActionRule {
  label: string;
  from: readonly TicketStatus[];
  to: TicketStatus;
  minimumRole: Role;
  memberCondition?: MemberCondition;
}

const OPEN: readonly TicketStatus[] = OPEN_STATUSES;

export const ACTIONS: Record<TicketAction, ActionRule> = {
  acknowledge: { label: 'Acknowledge', from: ['reported'], to: 'acknowledged', minimumRole: 'technician' },
  // Starting a repair straight from Reported acknowledges the ticket implicitly: a technician
  // who is already at the tool should not have to press two buttons. The server records the
  // acknowledgement time as the start of the repair so time-to-acknowledge stays measurable.
  start_repair: {
    label: 'Start repair',
    from: ['reported', 'acknowledged'],
    to: 'in_repair',
    minimumRole: 'technician',
  },
  wait: { label: 'Set waiting', from: ['acknowledged', 'in_repair'], to: 'waiting', minimumRole: 'technician' },
  // From Fixed this is "the fix did not hold": the repair goes on under the same ticket rather
  // than a new one, so the downtime stays one failure.
  resume: { label: 'Resume repair', from: ['waiting', 'fixed'], to: 'in_repair', minimumRole: 'technician' },
  fix: { label: 'Mark fixed', from: OPEN, to: 'fixed', minimumRole: 'technician' },
  close: { label: 'Close', from: ['fixed'], to: 'closed', minimumRole: 'technician' },
  // Merged and No fault found are final side exits. Neither is closed afterwards: there is
  // nothing left to confirm. A merged ticket lives on in the ticket it was merged into, so
  // nothing leads out of Merged for anyone; No fault found can still be reopened.
  merge: { label: 'Merge into another ticket', from: OPEN, to: 'merged', minimumRole: 'technician' },
  no_fault_found: { label: 'No fault found', from: OPEN, to: 'no_fault_found', minimumRole: 'technician' },
  reopen: {
    label: 'Reopen',
    from: RESOLVED_STATUSES,
    to: 'acknowledged',
    minimumRole: 'member',
    memberCondition: 'reporter_within_reopen_window',
  },
};

export interface TransitionContext {
  role: Role;
  /** True when the actor is the person who reported the ticket. */
  isReporter: boolean;
  now: Date;
  /** When the ticket was fixed, closed or found to have no fault; null if it never was. */
  resolvedAt: Date | null;
}

export type TransitionResult = { ok: true } | { ok: false; reason: string };

const ALLOWED: TransitionResult = { ok: true };

function refuse(reason: string): TransitionResult {
  return { ok: false, reason };
}

function roleNoun(minimum: Role): string {
  switch (minimum) {
    case 'member':
      return 'signed-in users';
    case 'technician':
      return 'technicians, managers and admins';
    case 'manager':
      return 'managers and admins';
    case 'admin':
      return 'admins';
  }
}

function checkMemberCondition(condition: MemberCondition, ctx: TransitionContext): TransitionResult {
  switch (condition) {
    case 'reporter_within_reopen_window': {
      if (!ctx.isReporter) return refuse('Only the person who reported this ticket, or staff, can reopen it.');
      if (ctx.resolvedAt === null) return refuse('This ticket has no resolution time, so staff must reopen it.');
      // A resolution time slightly in the future (clock skew between machines) counts as "just now".
      const elapsed = ctx.now.getTime() - ctx.resolvedAt.getTime();
      if (elapsed > REOPEN_WINDOW_DAYS * DAY_MS) {
        return refuse(`Reporters can reopen a ticket for ${REOPEN_WINDOW_DAYS} days after it is resolved; ask a technician instead.`);
      }
      return ALLOWED;
    }
  }
}

/** Whether the actor may take `action` on a ticket that is currently in `status`. */
export function canPerform(action: TicketAction, status: TicketStatus, ctx: TransitionContext): TransitionResult {
  const rule = ACTIONS[action];
  if (!rule.from.includes(status)) {
    return refuse(`"${rule.label}" is not possible while the ticket is ${STATUS_LABELS[status]}.`);
  }
  if (!hasRole(ctx.role, rule.minimumRole)) {
    return refuse(`Only ${roleNoun(rule.minimumRole)} can ${rule.label.toLowerCase()} a ticket.`);
  }
  if (rule.memberCondition && !isStaff(ctx.role)) {
    return checkMemberCondition(rule.memberCondition, ctx);
  }
  return ALLOWED;
}

/** The action that moves a ticket from `from` to `to`, if the workflow has one. */
export function actionFor(from: TicketStatus, to: TicketStatus): TicketAction | null {
  for (const action of TICKET_ACTIONS) {
    const rule = ACTIONS[action];
    if (rule.to === to && rule.from.includes(from)) return action;
  }
  return null;
}

export function canTransition(from: TicketStatus, to: TicketStatus, ctx: TransitionContext): TransitionResult {
  if (from === to) return refuse(`The ticket is already ${STATUS_LABELS[from]}.`);
  const action = actionFor(from, to);
  if (action === null) {
    if (from === 'merged') return refuse('A merged ticket cannot change; follow the ticket it was merged into.');
    return refuse(`A ticket cannot go from ${STATUS_LABELS[from]} to ${STATUS_LABELS[to]}.`);
  }
  return canPerform(action, from, ctx);
}

/** The actions this actor may take now, in workflow order. */
export function allowedActions(status: TicketStatus, ctx: TransitionContext): TicketAction[] {
  return TICKET_ACTIONS.filter((action) => canPerform(action, status, ctx).ok);
}
