import { Op, type Transaction } from 'sequelize';
import { Ticket } from './ticket.model';
import { Tool, StateInterval } from '../facility/facility.model';
import { User } from '../users/user.model';
import { AppError, forbidden, notFound, badRequest } from '../../lib/errors';
import type { AppDeps, AuthUser } from '../../lib/http';
import { appendEvent, changeStateForTicket, intervalsHeldBy } from './ticket-effects';
import { notifyUsers, pageP1AtNight, ticketFollowers } from './ticket-notify';
import { worseImpact } from './report.service';
import { announceBoardTools } from '../facility/board.service';
import { hasRole, isStaff } from '../../../shared/roles';
import { ACTIONS, STATUS_LABELS, canPerform, isOpenStatus, type TicketAction, type TicketStatus } from '../../../shared/ticket-workflow';
import { computePriority } from '../../../shared/priority';
import { E10_LABELS, REASONS_BY_STATE, type StateReason } from '../../../shared/equipment-state';
import { FIX_KIND_LABELS, WAIT_REASON_LABELS, type WaitReason } from '../../../shared/report-options';
import { STAFF_ONLY_ACTIONS, type TicketActionData } from '../../../shared/schemas/tickets';
import { returnToServiceProof } from '../maintenance/requal.service';

/** The client saved on top of a version someone else already changed. */
export class StaleTicketError extends AppError {
  constructor(readonly ticketId: number) {
    super(
      409,
      'stale_version',
      'Someone else changed this ticket while you had it open. Look at what changed, then apply your change again if it still makes sense.',
    );
  }
}

const WORKFLOW = new Set<string>(Object.keys(ACTIONS));
const isWorkflowAction = (a: string): a is TicketAction => WORKFLOW.has(a);

/** The E10 sub-state a wait stands for, so downtime analytics can tell delay from repair. */
const WAIT_STATE_REASON: Record<WaitReason, StateReason> = {
  parts: 'waiting_parts',
  vendor: 'maintenance_delay_supplier',
  facilities: 'facilities_related',
  user: 'maintenance_delay_user',
};

function checkPermission(user: AuthUser, ticket: Ticket, action: TicketActionData['action']) {
  if ((STAFF_ONLY_ACTIONS as readonly string[]).includes(action)) {
    if (!isStaff(user.role)) throw forbidden('Only technicians, managers and admins can do this.');
    if (ticket.status === 'merged') throw new AppError(409, 'ticket_merged', `This ticket was merged into #${ticket.mergedIntoId}.`);
    if ((action === 'assign' || action === 'set_priority') && !isOpenStatus(ticket.status))
      throw new AppError(409, 'ticket_not_open', 'This ticket is no longer open.');
    return;
  }
  if (!isWorkflowAction(action)) throw badRequest('Unknown action.');
  const rule = ACTIONS[action];
  if (!hasRole(user.role, rule.minimumRole)) {
    throw forbidden(`Only technicians, managers and admins can ${rule.label.toLowerCase()} a ticket.`);
  }
  const result = canPerform(action, ticket.status, {
    role: user.role,
    isReporter: ticket.reporterId === user.id,
    now: new Date(),
    resolvedAt: ticket.resolvedAt,
  });
  if (result.ok) return;
  if (!rule.from.includes(ticket.status)) throw new AppError(409, 'invalid_transition', result.reason);
  throw forbidden(result.reason);
}

/** Keeps the reason of a Down held by this ticket in step with the ticket (repair or which delay). */
/**
 * The Down this ticket holds follows the workflow: its reason, and its note, which the board
 * shows. A note belongs to the reason it was written for, so a new reason brings its own note
 * (the wait's note, or none) instead of keeping words like "waiting for a gauge" after a resume.
 */
async function syncDowntimeReason(
  deps: AppDeps,
  ticket: Ticket,
  actorId: number,
  reason: StateReason,
  transaction: Transaction,
  note: string | null = null,
  expectedReturnAt?: Date | null,
) {
  for (const held of await intervalsHeldBy(ticket.id, transaction)) {
    // A limited (restricted, still running) interval keeps its running reason.
    if (held.state !== 'unscheduled_downtime' || held.reason === reason) continue;
    await changeStateForTicket(
      deps,
      ticket,
      actorId,
      {
        toolId: held.toolId,
        moduleId: held.moduleId,
        state: 'unscheduled_downtime',
        reason,
        note,
        expectedReturnAt: expectedReturnAt ?? held.expectedReturnAt,
        source: held.source === 'user_report' ? 'user_report' : 'staff',
        confirmed: held.confirmed,
      },
      transaction,
    );
  }
}

async function assignIfNobody(ticket: Ticket, user: AuthUser, transaction: Transaction) {
  if (ticket.assigneeId !== null) return;
  ticket.assigneeId = user.id;
  await appendEvent(
    ticket.id,
    user.id,
    'assignment',
    { data: { from: null, to: { id: user.id, name: user.name }, automatic: true } },
    transaction,
  );
}

const STATUS_MAIL: Partial<Record<string, string>> = {
  acknowledged: 'A technician has acknowledged your report.',
  in_repair: 'The repair has started.',
  waiting: 'The repair is waiting.',
  fixed: 'The problem is fixed.',
  closed: 'The ticket is closed.',
  no_fault_found: 'A technician looked and found no fault.',
  merged: 'Your report was joined with another ticket about the same problem.',
};

export async function performAction(deps: AppDeps, user: AuthUser, ticketId: number, input: TicketActionData) {
  const touched = new Set<number>([ticketId]);
  const result = await deps.sequelize.transaction(async (transaction) => {
    const bare = await Ticket.findByPk(ticketId, { attributes: ['id', 'toolId'], transaction });
    if (!bare) throw notFound('That ticket');
    // Same lock order as reports: the tool first, then the ticket.
    const tool = await Tool.findByPk(bare.toolId, { transaction, lock: transaction.LOCK.UPDATE });
    const ticket = await Ticket.findByPk(ticketId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!tool || !ticket) throw notFound('That ticket');

    checkPermission(user, ticket, input.action);
    if (ticket.version !== input.version) throw new StaleTicketError(ticket.id);

    const now = new Date();
    const from = ticket.status;
    let statusNote: string | null = null;
    let statusData: Record<string, unknown> = {};

    switch (input.action) {
      case 'acknowledge':
        ticket.acknowledgedAt = now;
        await assignIfNobody(ticket, user, transaction);
        break;
      case 'start_repair':
        ticket.acknowledgedAt ??= now;
        await assignIfNobody(ticket, user, transaction);
        await syncDowntimeReason(deps, ticket, user.id, 'repair', transaction);
        break;
      case 'wait':
        ticket.waitReason = input.waitReason;
        statusNote = input.note;
        statusData = { waitReason: input.waitReason, expectedReturnAt: input.expectedReturnAt?.toISOString() ?? null };
        await syncDowntimeReason(
          deps,
          ticket,
          user.id,
          WAIT_STATE_REASON[input.waitReason],
          transaction,
          input.note,
          input.expectedReturnAt,
        );
        break;
      case 'resume':
        ticket.waitReason = null;
        ticket.fixedAt = null;
        ticket.resolvedAt = null;
        await syncDowntimeReason(deps, ticket, user.id, 'repair', transaction);
        break;
      case 'fix': {
        if (ticket.wafersCount > 0) {
          // Wafers were reported in the tool: what became of them is asked, never assumed.
          const fields: Record<string, string[]> = {};
          if (input.wafersRecovered === null) fields.wafersRecovered = ['Say how many wafers were recovered (0 if none).'];
          if (input.wafersReturned === null) fields.wafersReturned = ['Say how many wafers went back to their owner (0 if none).'];
          if (Object.keys(fields).length) throw badRequest('Say what became of the wafers.', fields);
        }
        Object.assign(ticket, {
          fixKind: input.fixKind,
          failureMode: input.failureMode,
          cause: input.cause,
          workDone: input.workDone,
          partsUsed: input.partsUsed,
          handsOnMinutes: input.handsOnMinutes,
          wafersRecovered: input.wafersRecovered,
          wafersReturned: input.wafersReturned,
        });
        ticket.acknowledgedAt ??= now;
        ticket.fixedAt = now;
        ticket.resolvedAt = now;
        ticket.waitReason = null;
        await assignIfNobody(ticket, user, transaction);
        statusData = {
          fixKind: input.fixKind,
          failureMode: input.failureMode,
          cause: input.cause,
          partsUsed: input.partsUsed,
          handsOnMinutes: input.handsOnMinutes,
          wafersRecovered: input.wafersRecovered,
          wafersReturned: input.wafersReturned,
          returnToService: input.returnToService,
        };
        statusNote = input.workDone;
        if (input.returnToService) {
          // Back to Running only with proof when the tool has a requalification template.
          const proof = await returnToServiceProof(
            deps,
            { toolId: tool.id, since: ticket.createdAt, user, overrideReason: input.returnOverrideReason },
            transaction,
          );
          statusData.returnProof = proof;
          if (proof.kind !== 'no_template')
            await appendEvent(
              ticket.id,
              user.id,
              'return_proof',
              { body: proof.kind === 'override' ? proof.reason : null, data: proof },
              transaction,
            );
          for (const held of await intervalsHeldBy(ticket.id, transaction)) {
            await changeStateForTicket(
              deps,
              ticket,
              user.id,
              { toolId: held.toolId, moduleId: held.moduleId, state: 'standby', note: 'Returned to service after the fix' },
              transaction,
            );
          }
        }
        break;
      }
      case 'close':
        ticket.closedAt = now;
        ticket.resolvedAt ??= now;
        break;
      case 'reopen':
        ticket.fixedAt = null;
        ticket.closedAt = null;
        ticket.resolvedAt = null;
        statusNote = input.reason;
        break;
      case 'no_fault_found':
        ticket.acknowledgedAt ??= now;
        ticket.resolvedAt = now;
        ticket.waitReason = null;
        statusNote = input.note;
        break;
      case 'merge': {
        if (input.targetId === ticket.id)
          throw badRequest('A ticket cannot be merged into itself.', { targetId: ['Choose another ticket.'] });
        const target = await Ticket.findByPk(input.targetId, { transaction, lock: transaction.LOCK.UPDATE });
        if (!target) throw badRequest('There is no such ticket.', { targetId: ['Unknown ticket.'] });
        if (target.toolId !== ticket.toolId)
          throw badRequest('Only reports about the same tool can be merged.', { targetId: ['That ticket is about another tool.'] });
        if (!isOpenStatus(target.status)) throw badRequest('Merge into an open ticket.', { targetId: ['That ticket is not open.'] });
        ticket.mergedIntoId = target.id;
        statusData = { targetId: target.id };
        // The target now stands for both: the worst impact, every hazard, the most wafers.
        const before = { priority: target.priority, impact: target.impact, hazards: target.hazards, wafersCount: target.wafersCount };
        target.hazards = [...new Set([...target.hazards, ...ticket.hazards])];
        target.impact = worseImpact(target.impact, ticket.impact);
        target.wafersCount = Math.max(target.wafersCount, ticket.wafersCount);
        if (!target.priorityOverridden) {
          target.priority = computePriority({
            impact: target.impact,
            hazards: target.hazards,
            wafersAtRisk: target.wafersCount,
            wafersKnownSafe: target.wafersRecoverable === 'yes',
            criticality: tool.criticality,
          }).priority;
        }
        target.changed('updatedAt', true);
        await target.save({ transaction });
        await appendEvent(
          target.id,
          user.id,
          'merged_from',
          {
            data: {
              sourceId: ticket.id,
              from: before,
              to: { priority: target.priority, impact: target.impact, hazards: target.hazards, wafersCount: target.wafersCount },
            },
          },
          transaction,
        );
        // A Down the merged report caused is now the target's to resolve.
        await StateInterval.update({ ticketId: target.id }, { where: { ticketId: ticket.id, endedAt: null }, transaction });
        touched.add(target.id);
        break;
      }
      case 'assign': {
        let to: User | null = null;
        if (input.assigneeId !== null) {
          to = await User.findOne({ where: { id: input.assigneeId, active: true, role: { [Op.ne]: 'member' } }, transaction });
          if (!to)
            throw badRequest('Assign to an active technician, manager or admin.', { assigneeId: ['Not someone who can be assigned.'] });
        }
        const before = ticket.assigneeId ? await User.findByPk(ticket.assigneeId, { attributes: ['id', 'name'], transaction }) : null;
        ticket.assigneeId = to?.id ?? null;
        await appendEvent(
          ticket.id,
          user.id,
          'assignment',
          { data: { from: before ? { id: before.id, name: before.name } : null, to: to ? { id: to.id, name: to.name } : null } },
          transaction,
        );
        if (to && to.id !== user.id) {
          await notifyUsers(
            deps,
            {
              userIds: [to.id],
              kind: 'ticket.assigned',
              title: `[#${ticket.id}] Assigned to you: ${ticket.title}`,
              text: `${user.name} assigned ticket #${ticket.id} on ${tool.name} (${tool.code}) to you. Priority ${ticket.priority}.`,
              ticketId: ticket.id,
            },
            transaction,
          );
        }
        break;
      }
      case 'set_priority':
        await appendEvent(
          ticket.id,
          user.id,
          'priority',
          { body: input.reason, data: { from: ticket.priority, to: input.priority } },
          transaction,
        );
        // Raised to P1 without a hazard (hazards page already): the on-call person is paged at night only.
        if (input.priority === 'P1' && ticket.priority !== 'P1' && ticket.hazards.length === 0)
          await pageP1AtNight(
            deps,
            {
              ticketId: ticket.id,
              toolId: tool.id,
              headline: `P1 on ${tool.name} (${tool.code}): ${ticket.title}`,
              details: `${user.name} raised ticket #${ticket.id} on ${tool.name} (${tool.code}) to P1: ${ticket.title}${input.reason ? `\n\n${input.reason}` : ''}`,
            },
            transaction,
          );
        ticket.priority = input.priority;
        ticket.priorityOverridden = true;
        break;
      case 'set_state': {
        const reason = input.reason ?? REASONS_BY_STATE[input.state][0];
        await changeStateForTicket(
          deps,
          ticket,
          user.id,
          {
            toolId: tool.id,
            moduleId: input.moduleId,
            state: input.state,
            reason,
            note: input.note,
            expectedReturnAt: input.expectedReturnAt,
          },
          transaction,
        );
        break;
      }
      case 'confirm_down': {
        const pending = (await intervalsHeldBy(ticket.id, transaction)).filter((s) => s.source === 'user_report' && !s.confirmed);
        if (pending.length === 0) throw new AppError(409, 'nothing_to_confirm', 'There is no reported Down waiting for confirmation.');
        // Confirming is not a new state, only a mark on the open interval; the log keeps one stretch.
        await StateInterval.update({ confirmed: true }, { where: { id: pending.map((s) => s.id) }, transaction });
        await appendEvent(
          ticket.id,
          user.id,
          'down_confirmed',
          { data: { intervals: pending.map((s) => ({ moduleId: s.moduleId, state: s.state, since: s.startedAt.toISOString() })) } },
          transaction,
        );
        announceBoardTools(
          deps,
          pending.map((s) => s.toolId),
          transaction,
          { stateChange: true },
        );
        break;
      }
      case 'revert_down': {
        const pending = (await intervalsHeldBy(ticket.id, transaction)).filter((s) => s.source === 'user_report' && !s.confirmed);
        if (pending.length === 0) throw new AppError(409, 'nothing_to_revert', 'There is no reported Down waiting for confirmation.');
        for (const s of pending) {
          const before = await StateInterval.findOne({
            where: { toolId: s.toolId, moduleId: s.moduleId, endedAt: s.startedAt },
            order: [['startedAt', 'DESC']],
            transaction,
          });
          const state = before && before.state !== 'unscheduled_downtime' ? before.state : 'standby';
          const reason = before && before.state === state ? before.reason : REASONS_BY_STATE[state][0];
          await changeStateForTicket(
            deps,
            ticket,
            user.id,
            {
              toolId: s.toolId,
              moduleId: s.moduleId,
              state,
              reason,
              note: input.note ?? `The reported Down was not confirmed; back to ${E10_LABELS[state].toLowerCase()}.`,
            },
            transaction,
          );
        }
        break;
      }
    }

    if (isWorkflowAction(input.action)) {
      ticket.status = ACTIONS[input.action].to;
      await appendEvent(
        ticket.id,
        user.id,
        'status',
        { body: statusNote, data: { action: input.action, from, to: ticket.status, ...statusData } },
        transaction,
      );
    }
    // Every accepted change moves the version on, so a second stale save is always caught.
    ticket.changed('updatedAt', true);
    await ticket.save({ transaction });

    const mailText = input.action === 'reopen' ? `${user.name} reopened the ticket.` : STATUS_MAIL[ticket.status];
    if (isWorkflowAction(input.action) && mailText) {
      const followers = await ticketFollowers(deps, ticket.id, transaction);
      const extra =
        input.action === 'wait'
          ? ` ${WAIT_REASON_LABELS[input.waitReason]}.`
          : input.action === 'fix'
            ? ` Recorded as: ${FIX_KIND_LABELS[input.fixKind].toLowerCase()}.`
            : '';
      const toolBack = input.action === 'fix' && input.returnToService ? ` ${tool.name} is back in service.` : '';
      // A reporter who reopens wants the technician to know; staff reopening tell the reporters.
      const recipients = input.action === 'reopen' && !isStaff(user.role) ? [...followers, ticket.assigneeId] : followers;
      await notifyUsers(
        deps,
        {
          userIds: recipients,
          exceptUserId: user.id,
          kind: input.action === 'reopen' ? 'ticket.reopened' : `ticket.${ticket.status}`,
          title: `[#${ticket.id}] ${input.action === 'reopen' ? 'Reopened' : STATUS_LABELS[ticket.status as TicketStatus]}: ${tool.name} — ${ticket.title}`,
          text: `${mailText}${extra}${toolBack}\n\nTicket #${ticket.id} on ${tool.name} (${tool.code}): ${ticket.title}${statusNote ? `\n\n${user.name}: ${statusNote}` : ''}`,
          ticketId: ticket.id,
          // "Your report was fixed" reaches the reporter's phone too.
          push: ticket.status === 'fixed',
        },
        transaction,
      );
    }

    for (const id of touched)
      deps.events.publish({ type: 'ticket.updated', audience: { ticket: id }, payload: { id, toolId: tool.id } }, transaction);
    // A status change may change the tool's open-ticket count on the board.
    if (isWorkflowAction(input.action)) announceBoardTools(deps, [tool.id], transaction);
    return { id: ticket.id, status: ticket.status, version: ticket.version };
  });
  return result;
}
