import { describe, expect, it } from 'vitest';
import { ROLES, type Role } from '@shared/roles';
import {
  ACTIONS,
  OPEN_STATUSES,
  REOPEN_WINDOW_DAYS,
  STATUS_LABELS,
  TICKET_ACTIONS,
  TICKET_STATUSES,
  actionFor,
  allowedActions,
  canPerform,
  canTransition,
  isOpenStatus,
  type TicketAction,
  type TicketStatus,
  type TransitionContext,
} from '@shared/ticket-workflow';

// The workflow is Faultline's own, in the words of maintenance and alarm practice (common
// practice, no published check values). The expected tables below are written out by hand on
// purpose: they are the specification the ACTIONS table must match, not a copy of it.

const DAY_MS = 24 * 60 * 60 * 1000;
const NOW = new Date('2025-03-10T09:00:00Z');
const daysAgo = (days: number) => new Date(NOW.getTime() - days * DAY_MS);

// Every move staff (technician, manager, admin) may make, as "from>to".
const STAFF_ALLOWED = new Set<string>([
  'reported>acknowledged',
  'reported>in_repair',
  'reported>fixed',
  'reported>merged',
  'reported>no_fault_found',
  'acknowledged>in_repair',
  'acknowledged>waiting',
  'acknowledged>fixed',
  'acknowledged>merged',
  'acknowledged>no_fault_found',
  'in_repair>waiting',
  'in_repair>fixed',
  'in_repair>merged',
  'in_repair>no_fault_found',
  'waiting>in_repair',
  'waiting>fixed',
  'waiting>merged',
  'waiting>no_fault_found',
  'fixed>in_repair',
  'fixed>closed',
  'fixed>acknowledged',
  'closed>acknowledged',
  'no_fault_found>acknowledged',
]);

// A member who reported the ticket, one day after it was resolved: only reopening.
const MEMBER_REPORTER_ALLOWED = new Set<string>(['fixed>acknowledged', 'closed>acknowledged', 'no_fault_found>acknowledged']);

const EXPECTED_BY_ROLE: Record<Role, Set<string>> = {
  member: MEMBER_REPORTER_ALLOWED,
  technician: STAFF_ALLOWED,
  manager: STAFF_ALLOWED,
  admin: STAFF_ALLOWED,
};

function ctx(role: Role, overrides: Partial<TransitionContext> = {}): TransitionContext {
  return { role, isReporter: true, now: NOW, resolvedAt: daysAgo(1), ...overrides };
}

describe('ticket workflow: every (from, to, role) combination', () => {
  const cases = ROLES.flatMap((role) =>
    TICKET_STATUSES.flatMap((from) =>
      TICKET_STATUSES.map((to) => ({ role, from, to, allowed: EXPECTED_BY_ROLE[role].has(`${from}>${to}`) })),
    ),
  );

  it.each(cases)('when a $role moves a ticket from $from to $to, then allowed is $allowed', ({ role, from, to, allowed }) => {
    const result = canTransition(from, to, ctx(role));
    expect(result.ok).toBe(allowed);
    if (!result.ok) expect(result.reason.length).toBeGreaterThan(10);
  });
});

describe('ticket workflow: allowed actions per status', () => {
  const STAFF_ACTIONS: Record<TicketStatus, TicketAction[]> = {
    reported: ['acknowledge', 'start_repair', 'fix', 'merge', 'no_fault_found'],
    acknowledged: ['start_repair', 'wait', 'fix', 'merge', 'no_fault_found'],
    in_repair: ['wait', 'fix', 'merge', 'no_fault_found'],
    waiting: ['resume', 'fix', 'merge', 'no_fault_found'],
    fixed: ['resume', 'close', 'reopen'],
    closed: ['reopen'],
    merged: [],
    no_fault_found: ['reopen'],
  };
  const MEMBER_REPORTER_ACTIONS: Record<TicketStatus, TicketAction[]> = {
    reported: [],
    acknowledged: [],
    in_repair: [],
    waiting: [],
    fixed: ['reopen'],
    closed: ['reopen'],
    merged: [],
    no_fault_found: ['reopen'],
  };

  it.each(TICKET_STATUSES)('when a technician views a %s ticket, then the listed actions match', (status) => {
    expect(allowedActions(status, ctx('technician', { isReporter: false }))).toEqual(STAFF_ACTIONS[status]);
  });

  it.each(TICKET_STATUSES)('when an admin views a %s ticket, then the actions are the same as a technician’s', (status) => {
    expect(allowedActions(status, ctx('admin', { isReporter: false }))).toEqual(STAFF_ACTIONS[status]);
  });

  it.each(TICKET_STATUSES)('when the reporting member views a %s ticket, then only reopen may show', (status) => {
    expect(allowedActions(status, ctx('member'))).toEqual(MEMBER_REPORTER_ACTIONS[status]);
  });

  it.each(TICKET_STATUSES)('when another member views a %s ticket, then no action shows', (status) => {
    expect(allowedActions(status, ctx('member', { isReporter: false }))).toEqual([]);
  });

  it('when any two statuses are given, then at most one action leads from the first to the second', () => {
    for (const from of TICKET_STATUSES) {
      for (const to of TICKET_STATUSES) {
        const matching = TICKET_ACTIONS.filter((a) => ACTIONS[a].to === to && ACTIONS[a].from.includes(from));
        expect(matching.length, `${from}>${to}`).toBeLessThanOrEqual(1);
      }
    }
  });

  it('when a repair starts from Reported or a fix does not hold, then the named action is found', () => {
    expect(actionFor('reported', 'in_repair')).toBe('start_repair');
    expect(actionFor('fixed', 'in_repair')).toBe('resume');
    expect(actionFor('closed', 'acknowledged')).toBe('reopen');
    expect(actionFor('closed', 'in_repair')).toBeNull();
  });
});

describe('ticket workflow: the member reopen window', () => {
  it('when the reporter reopens 6 days after the fix, then it is allowed', () => {
    expect(canTransition('fixed', 'acknowledged', ctx('member', { resolvedAt: daysAgo(6) }))).toEqual({ ok: true });
  });

  it('when the reporter reopens exactly at the end of the window, then it is still allowed', () => {
    const result = canTransition('closed', 'acknowledged', ctx('member', { resolvedAt: daysAgo(REOPEN_WINDOW_DAYS) }));
    expect(result.ok).toBe(true);
  });

  it('when the reporter reopens 8 days after closing, then it is refused with the window in the reason', () => {
    const result = canTransition('closed', 'acknowledged', ctx('member', { resolvedAt: daysAgo(8) }));
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reason).toContain('7 days');
  });

  it('when a member who did not report it tries to reopen within the window, then it is refused', () => {
    const result = canTransition('fixed', 'acknowledged', ctx('member', { isReporter: false, resolvedAt: daysAgo(1) }));
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reason).toMatch(/reported/);
  });

  it('when the resolution time is unknown, then a member cannot reopen', () => {
    expect(canTransition('no_fault_found', 'acknowledged', ctx('member', { resolvedAt: null })).ok).toBe(false);
  });

  it('when the resolution time lies slightly in the future (clock skew), then the reporter may reopen', () => {
    const resolvedAt = new Date(NOW.getTime() + 60_000);
    expect(canTransition('fixed', 'acknowledged', ctx('member', { resolvedAt })).ok).toBe(true);
  });

  it.each(['technician', 'manager', 'admin'] as const)(
    'when a %s reopens a year-old ticket they did not report, then it is allowed',
    (role) => {
      const staffCtx = ctx(role, { isReporter: false, resolvedAt: daysAgo(365) });
      expect(canTransition('closed', 'acknowledged', staffCtx).ok).toBe(true);
      expect(canPerform('reopen', 'no_fault_found', { ...staffCtx, resolvedAt: null }).ok).toBe(true);
    },
  );

  it('when the window has passed, then reopen disappears from the member’s actions', () => {
    expect(allowedActions('closed', ctx('member', { resolvedAt: daysAgo(6) }))).toEqual(['reopen']);
    expect(allowedActions('closed', ctx('member', { resolvedAt: daysAgo(8) }))).toEqual([]);
  });
});

describe('ticket workflow: refusals and labels', () => {
  it('when anyone tries to move a merged ticket, then the reason points to the ticket it was merged into', () => {
    const result = canTransition('merged', 'acknowledged', ctx('admin'));
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reason).toMatch(/merged into/);
  });

  it('when a member tries a staff action, then the reason names who can', () => {
    const result = canPerform('acknowledge', 'reported', ctx('member'));
    expect(result).toEqual({ ok: false, reason: 'Only technicians, managers and admins can acknowledge a ticket.' });
  });

  it('when an action does not fit the current status, then the reason names the status', () => {
    const result = canPerform('close', 'waiting', ctx('admin'));
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reason).toContain('Waiting');
  });

  it('when the target equals the current status, then it is refused', () => {
    expect(canTransition('in_repair', 'in_repair', ctx('admin')).ok).toBe(false);
  });

  it('when statuses are shown, then they carry their display labels', () => {
    expect(STATUS_LABELS).toEqual({
      reported: 'Reported',
      acknowledged: 'Acknowledged',
      in_repair: 'In repair',
      waiting: 'Waiting',
      fixed: 'Fixed',
      closed: 'Closed',
      merged: 'Merged',
      no_fault_found: 'No fault found',
    });
  });

  it('when the tool problem is unresolved, then the ticket counts as open, and otherwise not', () => {
    expect([...OPEN_STATUSES]).toEqual(['reported', 'acknowledged', 'in_repair', 'waiting']);
    expect(TICKET_STATUSES.filter(isOpenStatus)).toEqual(['reported', 'acknowledged', 'in_repair', 'waiting']);
  });
});
