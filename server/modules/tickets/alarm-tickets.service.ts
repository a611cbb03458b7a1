import type { Transaction } from 'sequelize';
import { Ticket, UNWORKED_TICKET_FIELDS } from './ticket.model';
import { Tool } from '../facility/facility.model';
import { User } from '../users/user.model';
import type { AppDeps } from '../../lib/http';
import { appendEvent, changeStateForTicket, openInterval } from './ticket-effects';
import { notifyUsers } from './ticket-notify';
import { startEscalation } from '../oncall/escalation.service';
import { onCallRecipients } from '../oncall/rota.service';
import { queueMail } from '../../lib/mailer';
import { createNotices } from '../notices/notices.service';
import { isStaff } from '../../../shared/roles';
import { computePriority } from '../../../shared/priority';
import { HAZARD_CAUTIONS } from '../../../shared/report-options';
import { isOpenStatus, type TicketStatus } from '../../../shared/ticket-workflow';
import { ALARM_CATEGORY_LABELS } from '../../../shared/alarms';

// The tickets side of alarms reported by the tools themselves. The alarms module decides
// when a ticket is due (its rules, folding, chattering, floods); this file opens and annotates
// tickets through the same models, timeline and outbox as a person's report.

export interface AlarmTicketInput {
  toolId: number;
  moduleId: number | null;
  alarmId: string;
  alarmText: string;
  category: number | null;
  setAt: Date;
  /** Personal or equipment safety: P1, and the on-call list hears at once. */
  safety: boolean;
  /** The rule says: put the tool (or the module) Down. */
  takeDown: boolean;
  /** False while a flood or a chattering alarm holds notifications back (never for safety). */
  notify: boolean;
}

const where = (tool: Tool) => `${tool.name} (${tool.code})`;

/** Opens a ticket for an alarm; the timeline says it was reported by the tool. */
export async function openAlarmTicket(deps: AppDeps, input: AlarmTicketInput, transaction: Transaction): Promise<{ ticketId: number }> {
  const tool = await Tool.findByPk(input.toolId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!tool) throw new Error(`tool ${input.toolId} vanished`);
  const impact = input.takeDown ? 'tool_stopped' : 'still_usable';
  const priority = input.safety
    ? 'P1'
    : computePriority({ impact, hazards: [], wafersAtRisk: 0, wafersKnownSafe: false, criticality: tool.criticality }).priority;
  const engineers = await User.findAll({
    where: { id: [tool.primaryEngineerId, tool.backupEngineerId].filter((x): x is number => x !== null), active: true },
    transaction,
  });
  const assignee =
    engineers.find((u) => u.id === tool.primaryEngineerId && isStaff(u.role)) ??
    engineers.find((u) => u.id === tool.backupEngineerId && isStaff(u.role)) ??
    null;
  const categoryLabel = input.category ? ALARM_CATEGORY_LABELS[input.category] : null;
  const title = `Alarm ${input.alarmId}: ${input.alarmText}`.slice(0, 120);
  const description = [
    `The tool reported alarm ${input.alarmId} at ${input.setAt.toISOString()}.`,
    categoryLabel ? `Category: ${categoryLabel}.` : null,
    `Alarm text: ${input.alarmText}`,
  ]
    .filter(Boolean)
    .join('\n');

  const ticket = await Ticket.create(
    {
      toolId: tool.id,
      moduleId: input.moduleId,
      category: 'alarm_interlock',
      title,
      description,
      alarmText: `${input.alarmId} ${input.alarmText}`.slice(0, 1000),
      impact,
      hazards: [],
      wafersCount: 0,
      wafersOwner: null,
      wafersRecoverable: null,
      priority,
      reporterId: null,
      assigneeId: assignee?.id ?? null,
      ...UNWORKED_TICKET_FIELDS,
    },
    { transaction },
  );
  await appendEvent(
    ticket.id,
    null,
    'alarm_reported',
    {
      body: description,
      data: {
        alarmId: input.alarmId,
        alarmText: input.alarmText,
        category: input.category,
        moduleId: input.moduleId,
        setAt: input.setAt.toISOString(),
        priority,
        safety: input.safety,
      },
    },
    transaction,
  );
  if (assignee)
    await appendEvent(
      ticket.id,
      null,
      'assignment',
      { data: { from: null, to: { id: assignee.id, name: assignee.name }, automatic: true } },
      transaction,
    );
  if (input.takeDown) {
    const target = await openInterval(tool.id, input.moduleId, transaction);
    const toolOpen = await openInterval(tool.id, null, transaction);
    if (target?.state !== 'unscheduled_downtime' && toolOpen?.state !== 'unscheduled_downtime') {
      await changeStateForTicket(
        deps,
        ticket,
        null,
        {
          toolId: tool.id,
          moduleId: input.moduleId,
          state: 'unscheduled_downtime',
          reason: 'repair',
          note: `Alarm ${input.alarmId}: ${input.alarmText}`.slice(0, 500),
          source: 'alarm',
          confirmed: true,
        },
        transaction,
      );
    }
  }

  let told: number[] = [];
  if (input.safety) {
    const details = [
      `${where(tool)} reported a ${categoryLabel?.toLowerCase() ?? 'safety'} alarm (${input.alarmId}): ${input.alarmText}.`,
      '',
      'Faultline records and passes on what the tool reports; it does not replace the facility’s alarm systems or emergency response.',
      'The usual cautions:',
      ...HAZARD_CAUTIONS.map((c) => `- ${c}`),
    ].join('\n');
    // Safety alarms page like hazard reports; the mail below is for when nobody could be paged.
    told = await startEscalation(
      deps,
      { ticketId: ticket.id, toolId: tool.id, severity: 'hazard', headline: `Safety alarm at ${where(tool)}: ${input.alarmText}`, details },
      transaction,
    );
  }
  if (input.safety && told.length === 0) {
    told = await notifyUsers(
      deps,
      {
        userIds: await onCallRecipients(new Date(), transaction),
        kind: 'ticket.hazard',
        title: `Safety alarm at ${where(tool)}: ${input.alarmText} — #${ticket.id}`.slice(0, 255),
        text: [
          `${where(tool)} reported a ${categoryLabel?.toLowerCase() ?? 'safety'} alarm (${input.alarmId}): ${input.alarmText}.`,
          '',
          'Faultline records and passes on what the tool reports; it does not replace the facility’s alarm systems or emergency response.',
          'The usual cautions:',
          ...HAZARD_CAUTIONS.map((c) => `- ${c}`),
        ].join('\n'),
        ticketId: ticket.id,
      },
      transaction,
    );
  }
  if (input.notify || input.safety) {
    await notifyUsers(
      deps,
      {
        userIds: engineers.map((u) => u.id).filter((id) => !told.includes(id)),
        kind: 'ticket.created',
        title: `[#${ticket.id}] ${priority} alarm on ${where(tool)}: ${input.alarmText}`.slice(0, 255),
        text: [
          `${where(tool)} reported alarm ${input.alarmId}: ${input.alarmText}`,
          categoryLabel ? `Category: ${categoryLabel}.` : null,
          input.takeDown ? 'The tool was put Down by its alarm rule.' : null,
        ]
          .filter(Boolean)
          .join('\n'),
        ticketId: ticket.id,
      },
      transaction,
    );
  }
  deps.events.publish({ type: 'ticket.created', audience: 'all', payload: { id: ticket.id, toolId: tool.id } }, transaction);
  return { ticketId: ticket.id };
}

/** Of these tickets, the ones still open (a repeat folds only into an open ticket). */
export async function openTicketIds(ids: readonly number[], transaction?: Transaction): Promise<Set<number>> {
  if (ids.length === 0) return new Set();
  const rows = await Ticket.findAll({ where: { id: [...new Set(ids)] }, attributes: ['id', 'status'], transaction });
  return new Set(rows.filter((t) => isOpenStatus(t.status as TicketStatus)).map((t) => t.id));
}

/** "Set again, N times since 09:12": one line on the timeline per batch of repeats. */
export async function recordAlarmRepeats(
  deps: AppDeps,
  ticketId: number,
  info: { alarmId: string; count: number; since: Date; lastAt: Date; chattering: boolean },
  transaction: Transaction,
) {
  await appendEvent(
    ticketId,
    null,
    'alarm_repeat',
    {
      data: {
        alarmId: info.alarmId,
        count: info.count,
        since: info.since.toISOString(),
        lastAt: info.lastAt.toISOString(),
        chattering: info.chattering,
      },
    },
    transaction,
  );
  const ticket = await Ticket.findByPk(ticketId, { attributes: ['id', 'toolId'], transaction, rejectOnEmpty: true });
  deps.events.publish(
    { type: 'ticket.updated', audience: { ticket: ticketId }, payload: { id: ticketId, toolId: ticket.toolId } },
    transaction,
  );
}

/** The alarm cleared on the tool: noted, but the tool is not returned to service (a person does that). */
export async function recordAlarmCleared(
  deps: AppDeps,
  ticketId: number,
  info: { alarmId: string; at: Date; by: 'tool' | 'person'; actorId: number | null },
  transaction: Transaction,
) {
  await appendEvent(
    ticketId,
    info.actorId,
    'alarm_cleared',
    { data: { alarmId: info.alarmId, at: info.at.toISOString(), by: info.by } },
    transaction,
  );
  const ticket = await Ticket.findByPk(ticketId, { attributes: ['id', 'toolId'], transaction, rejectOnEmpty: true });
  deps.events.publish(
    { type: 'ticket.updated', audience: { ticket: ticketId }, payload: { id: ticketId, toolId: ticket.toolId } },
    transaction,
  );
}

/**
 * Mail and an in-app notice to a tool's engineers (and, for safety, the on-call list) about
 * alarms that have no ticket of their own: "tell the engineers" rules, flood and chattering
 * summaries. The message links to the tool's page.
 */
export async function tellToolEngineers(
  deps: AppDeps,
  input: { toolId: number; kind: string; title: string; text: string; onCall?: boolean },
  transaction: Transaction,
) {
  const tool = await Tool.findByPk(input.toolId, { transaction });
  if (!tool) return [];
  const ids = [tool.primaryEngineerId, tool.backupEngineerId].filter((x): x is number => x !== null);
  // The on-call part of the list is the rota's concern (whoever is on call now; the on-call flag fills a gap).
  const users = await User.findAll({
    where: input.onCall ? { id: await onCallRecipients(new Date(), transaction), active: true } : { id: ids, active: true },
    transaction,
  });
  const recipients = input.onCall ? [...users, ...(await User.findAll({ where: { id: ids, active: true }, transaction }))] : users;
  const unique = [...new Map(recipients.map((u) => [u.id, u])).values()];
  if (unique.length === 0) return [];
  const link = `/tools/${encodeURIComponent(tool.code)}`;
  const url = `${deps.config.publicUrl}${link}`;
  await queueMail(
    unique.map((u) => ({
      to: u.email,
      subject: `${input.title} — ${where(tool)}`.slice(0, 255),
      text: `Hello ${u.name},\n\n${input.text}\n\nOpen the tool: ${url}\n\n— Faultline`,
    })),
    transaction,
  );
  await createNotices(
    deps,
    unique.map((u) => u.id),
    { kind: input.kind, title: `${input.title} — ${tool.code}`, body: input.text, link },
    transaction,
  );
  return unique.map((u) => u.id);
}
