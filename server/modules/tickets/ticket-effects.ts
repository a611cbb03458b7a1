import type { Transaction } from 'sequelize';
import { Ticket, TicketEvent } from './ticket.model';
import { changeState, findOpenInterval, type StateChangeResult } from '../facility/state.service';
import type { ToolFacts } from '../facility/tool-directory';
import type { AppDeps } from '../../lib/http';
import { E10_LABELS, boardStatusOf, type E10State, type StateReason } from '../../../shared/equipment-state';

/** Appends one timeline entry; the timeline is never edited afterwards. */
export function appendEvent(
  ticketId: number,
  actorId: number | null,
  kind: string,
  opts: { body?: string | null; data?: Record<string, unknown> | null; internal?: boolean; at?: Date },
  transaction: Transaction,
) {
  return TicketEvent.create(
    {
      ticketId,
      actorId,
      kind,
      internal: opts.internal ?? false,
      body: opts.body ?? null,
      data: opts.data ?? null,
      ...(opts.at ? { createdAt: opts.at } : {}),
    },
    { transaction },
  );
}

export interface StateStep {
  toolId: number;
  moduleId: number | null;
  state: E10State;
  reason?: StateReason;
  note?: string | null;
  expectedReturnAt?: Date | null;
  source?: 'staff' | 'user_report' | 'alarm';
  confirmed?: boolean;
  /** A restriction in force while the tool runs (the board reads Limited). */
  restriction?: string | null;
}

/**
 * Changes a tool or module state on behalf of a ticket (through the facility's changeState,
 * which logs the interval and tells the board) and records the step in the ticket's timeline.
 */
export async function changeStateForTicket(
  deps: AppDeps,
  ticket: Ticket,
  actorId: number | null,
  step: StateStep,
  transaction: Transaction,
) {
  const change = await changeState(
    deps,
    {
      toolId: step.toolId,
      moduleId: step.moduleId,
      state: step.state,
      reason: step.reason,
      note: step.note ?? null,
      expectedReturnAt: step.expectedReturnAt ?? null,
      restriction: step.restriction ?? null,
      ticketId: ticket.id,
      source: step.source ?? 'staff',
      confirmed: step.confirmed ?? true,
      actorId,
    },
    transaction,
  );
  await recordStateStep(ticket.id, actorId, change, step.note ?? null, transaction);
  return change;
}

/** The ticket's timeline entry for a state change made on its behalf. */
export async function recordStateStep(
  ticketId: number,
  actorId: number | null,
  { previous, current }: StateChangeResult,
  note: string | null,
  transaction: Transaction,
) {
  await appendEvent(
    ticketId,
    actorId,
    'tool_state',
    {
      body: note,
      data: {
        moduleId: current.moduleId,
        from: previous ? { state: previous.state, reason: previous.reason } : null,
        to: { state: current.state, reason: current.reason },
        source: current.source,
        confirmed: current.confirmed,
        expectedReturnAt: current.expectedReturnAt ? current.expectedReturnAt.toISOString() : null,
      },
    },
    transaction,
  );
}

/**
 * "Tool stopped" takes the tool (or the module) down at once, marked as a user's report and
 * unconfirmed. If it is already down, nothing changes and the timeline says why.
 */
export async function applyStoppedReport(
  deps: AppDeps,
  ticket: Ticket,
  tool: ToolFacts,
  moduleId: number | null,
  actorId: number,
  transaction: Transaction,
) {
  const toolOpen = await findOpenInterval(tool.id, null, transaction);
  const targetOpen = moduleId === null ? toolOpen : await findOpenInterval(tool.id, moduleId, transaction);
  const alreadyDown = toolOpen?.state === 'unscheduled_downtime' || targetOpen?.state === 'unscheduled_downtime';
  if (alreadyDown) {
    const state = (toolOpen?.state === 'unscheduled_downtime' ? toolOpen : targetOpen)!;
    await appendEvent(
      ticket.id,
      null,
      'tool_state_unchanged',
      {
        data: { moduleId: state.moduleId, state: state.state, since: state.startedAt.toISOString(), byTicketId: state.ticketId },
        body: `Already ${E10_LABELS[state.state].toLowerCase()}; the state was left as it is.`,
      },
      transaction,
    );
    return false;
  }
  await changeStateForTicket(
    deps,
    ticket,
    actorId,
    {
      toolId: tool.id,
      moduleId,
      state: 'unscheduled_downtime',
      reason: 'repair',
      note: `Reported by a user: ${ticket.title}`.slice(0, 500),
      source: 'user_report',
      confirmed: false,
    },
    transaction,
  );
  return true;
}

/**
 * "Tool limited" makes the tool read Limited at once, marked as a user's report: the module
 * named goes Down (so the tool reads Limited), or, for the whole tool, a restriction is put
 * on its running state. A tool that is already not running, or already limited, is left
 * as it is and the timeline says why.
 */
export async function applyLimitedReport(
  deps: AppDeps,
  ticket: Ticket,
  tool: ToolFacts,
  moduleId: number | null,
  actorId: number,
  transaction: Transaction,
) {
  if (moduleId !== null) return applyStoppedReport(deps, ticket, tool, moduleId, actorId, transaction);
  const open = await findOpenInterval(tool.id, null, transaction);
  if (!open || boardStatusOf(open.state) !== 'running' || open.restriction) {
    const body = open?.restriction
      ? 'Already limited; the state was left as it is.'
      : `Already ${E10_LABELS[open?.state ?? 'standby'].toLowerCase()}; the state was left as it is.`;
    await appendEvent(
      ticket.id,
      null,
      'tool_state_unchanged',
      {
        data: {
          moduleId: null,
          state: open?.state ?? null,
          since: open?.startedAt.toISOString() ?? null,
          byTicketId: open?.ticketId ?? null,
        },
        body,
      },
      transaction,
    );
    return false;
  }
  const restriction = `Reported by a user: ${ticket.title}`.slice(0, 200);
  await changeStateForTicket(
    deps,
    ticket,
    actorId,
    {
      toolId: tool.id,
      moduleId: null,
      state: open.state,
      reason: open.reason,
      note: restriction,
      restriction,
      source: 'user_report',
      confirmed: false,
    },
    transaction,
  );
  return true;
}
