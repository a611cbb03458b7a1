import { literal, Op, type Transaction } from 'sequelize';
import { Tool, ToolModule, StateInterval, type StateSource } from './facility.model';
import { isReasonAllowed, REASONS_BY_STATE, type E10State, type StateReason } from '../../../shared/equipment-state';
import { AppError, notFound, badRequest } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';
import { announceBoardTools } from './board.service';
import type { StateChangeFields } from '../../../shared/schemas/facility';

export interface StateChange {
  toolId: number;
  /** null or absent: the tool itself; otherwise one of its modules. */
  moduleId?: number | null;
  state: E10State;
  reason?: StateReason;
  note?: string | null;
  /** A restriction in force while the tool runs; the board then reads Limited. */
  restriction?: string | null;
  expectedReturnAt?: Date | null;
  ticketId?: number | null;
  source?: StateSource;
  /** false when a lab user's report set it and no technician has confirmed it yet. */
  confirmed?: boolean;
  actorId: number | null;
  /** When the change happened (default now); never earlier than the open interval's start. */
  at?: Date;
}

export interface StateChangeResult {
  previous: StateInterval | null;
  current: StateInterval;
}

/**
 * Work that must commit with a state change. `deps` is the calling server's, so a hook can
 * publish events to that server's sockets (tests run several servers in one process).
 */
export type AfterChange = (change: StateChangeResult, transaction: Transaction, deps: AppDeps) => Promise<void>;
const afterChangeHooks: AfterChange[] = [];

/**
 * Other parts of the server (follower notifications, ticket timelines) add work that must
 * commit in the same transaction as the state change itself. Registering the same function
 * twice has no effect, so a module may register on every server start.
 */
export function onStateChanged(hook: AfterChange) {
  if (!afterChangeHooks.includes(hook)) afterChangeHooks.push(hook);
}

/**
 * The open interval of a tool (moduleId null) or module. Looked up through the generated
 * columns of the unique key (tool_id, module_key, open_flag), so the row lock touches that
 * one row and not the tool's whole history.
 */
export function findOpenInterval(toolId: number, moduleId: number | null, transaction?: Transaction, forUpdate = false) {
  return StateInterval.findOne({
    where: { toolId, [Op.and]: [literal(`module_key = ${Number(moduleId ?? 0)}`), literal('open_flag = 1')] },
    transaction,
    lock: forUpdate && transaction ? transaction.LOCK.UPDATE : undefined,
  });
}

/**
 * Changes the state of a tool or module. The tool row is locked first, so concurrent changes
 * to the same tool (and to any of its modules) queue up; the open interval is closed and the
 * next opened at the same instant, which keeps the log free of gaps and overlaps.
 */
export async function changeState(deps: AppDeps, change: StateChange, outer?: Transaction): Promise<StateChangeResult> {
  const reason = change.reason ?? REASONS_BY_STATE[change.state][0];
  if (!isReasonAllowed(change.state, reason)) {
    throw badRequest('That reason does not fit that state.', { reason: [`"${reason}" is not a reason for ${change.state}.`] });
  }
  const run = async (transaction: Transaction) => {
    const tool = await Tool.findByPk(change.toolId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!tool) throw notFound('Tool');
    if (tool.retiredAt) throw new AppError(409, 'tool_retired', 'This tool is retired; its state can no longer change.');
    const moduleId = change.moduleId ?? null;
    if (moduleId !== null) {
      const mod = await ToolModule.findOne({ where: { id: moduleId, toolId: tool.id }, transaction });
      if (!mod) throw badRequest('That module does not belong to this tool.', { moduleId: ['Unknown module for this tool.'] });
      if (mod.retiredAt) throw new AppError(409, 'module_retired', 'This module is retired; its state can no longer change.');
    }
    const open = await findOpenInterval(tool.id, moduleId, transaction, true);
    let at = change.at ?? new Date();
    if (open && at < open.startedAt) at = open.startedAt;

    if (open) {
      await open.update({ endedAt: at }, { transaction });
    }
    const current = await StateInterval.create(
      {
        toolId: tool.id,
        moduleId,
        state: change.state,
        reason,
        note: change.note ?? null,
        restriction: change.restriction ?? null,
        startedAt: at,
        endedAt: null,
        expectedReturnAt: change.expectedReturnAt ?? null,
        ticketId: change.ticketId ?? null,
        setById: change.actorId,
        source: change.source ?? 'staff',
        confirmed: change.confirmed ?? true,
      },
      { transaction },
    );
    const result = { previous: open, current };
    for (const hook of afterChangeHooks) await hook(result, transaction, deps);
    announceBoardTools(deps, [tool.id], transaction, { stateChange: true });
    return result;
  };
  return outer ? run(outer) : deps.sequelize.transaction(run);
}

/**
 * A person's state change, from the tool page or from a ticket: both send the fields of
 * stateChangeFields (checked by the same schema), and this is the one translation into a change.
 */
export function requestStateChange(
  deps: AppDeps,
  toolId: number,
  input: StateChangeFields,
  by: { actorId: number; ticketId?: number | null },
  transaction?: Transaction,
): Promise<StateChangeResult> {
  return changeState(
    deps,
    {
      toolId,
      moduleId: input.moduleId ?? null,
      state: input.state,
      reason: input.reason,
      note: input.note?.trim() || null,
      restriction: input.restriction?.trim() || null,
      expectedReturnAt: input.expectedReturnAt ? new Date(input.expectedReturnAt) : null,
      ticketId: by.ticketId ?? null,
      source: 'staff',
      confirmed: true,
      actorId: by.actorId,
    },
    transaction,
  );
}

/** The first interval of a new tool or module (standby, i.e. Running and idle). */
export async function openInitialState(
  toolId: number,
  moduleId: number | null,
  at: Date,
  actorId: number | null,
  transaction: Transaction,
  state: E10State = 'standby',
) {
  return StateInterval.create(
    {
      toolId,
      moduleId,
      state,
      reason: REASONS_BY_STATE[state][0],
      note: null,
      startedAt: at,
      endedAt: null,
      expectedReturnAt: null,
      ticketId: null,
      setById: actorId,
      source: 'system',
      confirmed: true,
    },
    { transaction },
  );
}

// ---- The state log as other modules see it ------------------------------------------------
// Reads, and the two marks a ticket may put on intervals it holds. Only this file writes
// state_intervals.

/** The open intervals of a tool and its modules (tool first). */
export function openIntervalsOf(toolId: number, transaction?: Transaction) {
  // open_flag (1 only on open intervals) is indexed with the tool; `ended_at IS NULL` is not.
  return StateInterval.findAll({
    where: { toolId, [Op.and]: [literal('`StateInterval`.`open_flag` = 1')] },
    order: [['moduleId', 'ASC']],
    transaction,
  });
}

/** Open intervals this ticket holds down or limited (tool and modules). */
export function intervalsHeldBy(ticketId: number, transaction: Transaction) {
  return StateInterval.findAll({
    where: { ticketId, endedAt: null, [Op.or]: [{ state: 'unscheduled_downtime' }, { restriction: { [Op.ne]: null } }] },
    transaction,
  });
}

/** The interval that ended when `interval` started: what a reverted change goes back to. */
export function intervalBefore(interval: StateInterval, transaction: Transaction) {
  return StateInterval.findOne({
    where: { toolId: interval.toolId, moduleId: interval.moduleId, endedAt: interval.startedAt },
    order: [['startedAt', 'DESC']],
    transaction,
  });
}

/** A merged ticket's open Downs become the target's to resolve; the log keeps one stretch. */
export async function handOverHeldIntervals(fromTicketId: number, toTicketId: number, transaction: Transaction) {
  await StateInterval.update({ ticketId: toTicketId }, { where: { ticketId: fromTicketId, endedAt: null }, transaction });
}

/** Confirming a reported Down is not a new state, only a mark on the open interval. */
export async function confirmIntervals(deps: AppDeps, intervals: readonly StateInterval[], transaction: Transaction) {
  await StateInterval.update({ confirmed: true }, { where: { id: intervals.map((s) => s.id) }, transaction });
  announceBoardTools(
    deps,
    intervals.map((s) => s.toolId),
    transaction,
    { stateChange: true },
  );
}
