import { QueryTypes, type Transaction } from 'sequelize';
import { Ticket, Photo, UNWORKED_TICKET_FIELDS } from './ticket.model';
import { Tool, ToolModule } from '../facility/facility.model';
import { User } from '../users/user.model';
import { AppError, badRequest, forbidden } from '../../lib/errors';
import { storePhotos, removePhotos, linkPhotos, type IncomingFile, type StoredPhoto } from '../../lib/uploads';
import type { AppDeps, AuthUser } from '../../lib/http';
import { appendEvent, applyLimitedReport, applyStoppedReport } from './ticket-effects';
import { notifyOnCall, notifyUsers, ticketFollowers } from './ticket-notify';
import { findTicket } from './ticket-query.service';
import { announceBoardTools } from '../facility/board.service';
import { isStaff } from '../../../shared/roles';
import { computePriority } from '../../../shared/priority';
import { CATEGORY_LABELS, IMPACTS, IMPACT_LABELS, type Impact } from '../../../shared/report-options';
import { isOpenStatus } from '../../../shared/ticket-workflow';
import type { AddReportData, ReportData } from '../../../shared/schemas/tickets';

const TITLE_MAX = 120;

/** A one-line title from "what happened": its first line, cut at a word near 120 characters. */
export function titleFrom(description: string): string {
  const line =
    description
      .split(/\r?\n/)
      .find((l) => l.trim())
      ?.replace(/\s+/g, ' ')
      .trim() ?? description.trim();
  if (line.length <= TITLE_MAX) return line;
  const cut = line.slice(0, TITLE_MAX - 1);
  const space = cut.lastIndexOf(' ');
  return `${(space > 60 ? cut.slice(0, space) : cut).trimEnd()}…`;
}

/** The worse of two impacts (IMPACTS runs from worst to mildest). */
export const worseImpact = (a: Impact, b: Impact | null): Impact => (b && IMPACTS.indexOf(b) < IMPACTS.indexOf(a) ? b : a);

async function validateToolAndModule(toolId: number, moduleId: number | null) {
  const tool = await Tool.findByPk(toolId);
  if (!tool || tool.retiredAt) throw badRequest('That tool cannot take reports.', { toolId: ['Unknown or retired tool.'] });
  if (moduleId !== null) {
    const mod = await ToolModule.findOne({ where: { id: moduleId, toolId, retiredAt: null } });
    if (!mod) throw badRequest('That module does not belong to this tool.', { moduleId: ['Unknown module for this tool.'] });
  }
  return tool;
}

/** Thrown inside the transaction to roll it back when the same draft was filed before. */
class AlreadySent extends Error {
  constructor(readonly ticketId: number) {
    super('already sent');
  }
}

/**
 * Photos are checked and saved (in the photo store, not yet linked) before the transaction, and linked
 * into place by savePhotos inside it; if the transaction then fails, the files go again. So a
 * failed report leaves neither rows nor files, and a crash leaves only files the sweep removes.
 */
async function withStoredPhotos<T>(
  deps: AppDeps,
  files: readonly IncomingFile[],
  work: (stored: StoredPhoto[]) => Promise<T>,
): Promise<T | { id: number; duplicate: true }> {
  const stored = await storePhotos(deps.photos, files);
  try {
    return await work(stored);
  } catch (error) {
    // A store that is down may refuse the clean-up too; the sweep takes what is left.
    await removePhotos(deps.photos, stored).catch(() => undefined);
    if (error instanceof AlreadySent) return { id: error.ticketId, duplicate: true };
    throw error;
  }
}

async function savePhotos(
  deps: AppDeps,
  ticketId: number,
  eventId: number,
  uploaderId: number,
  stored: StoredPhoto[],
  transaction: Transaction,
) {
  if (stored.length === 0) return;
  await Photo.bulkCreate(
    stored.map((p) => ({
      ticketId,
      eventId,
      uploaderId,
      storedName: p.storedName,
      thumbName: p.thumbName,
      mime: p.mime,
      width: p.width,
      height: p.height,
      bytes: p.bytes,
    })),
    { transaction },
  );
  // The rows exist (uncommitted); the files take their served names in the same step.
  await linkPhotos(deps.photos, stored);
}

function reportFacts(
  input: {
    alarmText: string | null;
    impact: Impact | null;
    hazards: string[];
    wafersCount: number;
    wafersOwner: string | null;
    wafersRecoverable: string | null;
    clientKey: string | null;
  },
  photos: number,
) {
  return {
    alarmText: input.alarmText,
    impact: input.impact,
    hazards: input.hazards,
    wafersCount: input.wafersCount,
    wafersOwner: input.wafersOwner,
    wafersRecoverable: input.wafersRecoverable,
    photos,
    ...(input.clientKey ? { clientKey: input.clientKey } : {}),
  };
}

const RESEND_WINDOW_MS = 3 * 24 * 60 * 60_000;

/**
 * The ticket this user already filed (or added to) with the same draft key, if any. The same
 * key with other words is not a resend but a second browser tab that held the same draft:
 * refused, so that tab keeps its words instead of being thanked for the other tab's ticket.
 */
async function alreadySent(
  deps: AppDeps,
  userId: number,
  clientKey: string | null,
  description: string,
  kind: 'reported' | 'added_report',
  transaction: Transaction,
): Promise<number | null> {
  if (!clientKey) return null;
  const rows = await deps.sequelize.query<{ ticketId: number; body: string | null }>(
    `SELECT e.ticket_id AS ticketId, e.body FROM ticket_events e
      WHERE e.actor_id = :userId AND e.kind = :kind AND e.created_at > :since AND JSON_VALUE(e.data, '$.clientKey') = :clientKey
      LIMIT 1`,
    { replacements: { userId, kind, since: new Date(Date.now() - RESEND_WINDOW_MS), clientKey }, type: QueryTypes.SELECT, transaction },
  );
  if (!rows.length) return null;
  const ticketId = Number(rows[0].ticketId);
  if ((rows[0].body ?? '') !== description) {
    throw new AppError(
      409,
      'draft_sent_elsewhere',
      `This draft was already sent from another tab or window as ticket #${ticketId}, with other words. Yours are kept here: send them as a new report if they describe something else.`,
    );
  }
  return ticketId;
}

export async function createReport(deps: AppDeps, user: AuthUser, input: ReportData, files: readonly IncomingFile[]) {
  const tool = await validateToolAndModule(input.toolId, input.moduleId);
  return withStoredPhotos(deps, files, (stored) =>
    deps.sequelize.transaction(async (transaction) => {
      // The tool row is locked first by every ticket write, so writers on one tool queue up
      // instead of deadlocking between the ticket insert and the state change.
      const locked = await Tool.findByPk(tool.id, { transaction, lock: transaction.LOCK.UPDATE });
      if (!locked || locked.retiredAt) throw badRequest('That tool cannot take reports.', { toolId: ['Unknown or retired tool.'] });
      const earlier = await alreadySent(deps, user.id, input.clientKey, input.description, 'reported', transaction);
      if (earlier) throw new AlreadySent(earlier);
      const priority = computePriority({
        impact: input.impact,
        hazards: input.hazards,
        wafersAtRisk: input.wafersCount,
        wafersKnownSafe: input.wafersRecoverable === 'yes',
        criticality: locked.criticality,
      });
      const engineers = await User.findAll({
        where: { id: [locked.primaryEngineerId, locked.backupEngineerId].filter((x): x is number => x !== null), active: true },
        transaction,
      });
      const assignee =
        engineers.find((u) => u.id === locked.primaryEngineerId && isStaff(u.role)) ??
        engineers.find((u) => u.id === locked.backupEngineerId && isStaff(u.role)) ??
        null;

      const ticket = await Ticket.create(
        {
          toolId: locked.id,
          moduleId: input.moduleId,
          category: input.category,
          title: titleFrom(input.description),
          description: input.description,
          alarmText: input.alarmText,
          impact: input.impact,
          hazards: input.hazards,
          wafersCount: input.wafersCount,
          wafersOwner: input.wafersCount > 0 ? input.wafersOwner : null,
          wafersRecoverable: input.wafersCount > 0 ? input.wafersRecoverable : null,
          priority: priority.priority,
          reporterId: user.id,
          assigneeId: assignee?.id ?? null,
          ...UNWORKED_TICKET_FIELDS,
        },
        { transaction },
      );
      const event = await appendEvent(
        ticket.id,
        user.id,
        'reported',
        {
          body: input.description,
          data: {
            ...reportFacts(input, stored.length),
            category: input.category,
            moduleId: input.moduleId,
            priority: priority.priority,
            priorityReasons: priority.reasons,
          },
        },
        transaction,
      );
      await savePhotos(deps, ticket.id, Number(event.id), user.id, stored, transaction);
      if (assignee)
        await appendEvent(
          ticket.id,
          null,
          'assignment',
          { data: { from: null, to: { id: assignee.id, name: assignee.name }, automatic: true } },
          transaction,
        );
      if (input.impact === 'tool_stopped') await applyStoppedReport(deps, ticket, locked, input.moduleId, user.id, transaction);
      else if (input.impact === 'tool_limited') await applyLimitedReport(deps, ticket, locked, input.moduleId, user.id, transaction);

      const where = `${locked.name} (${locked.code})`;
      let alreadyTold: number[] = [];
      if (input.hazards.length > 0) {
        alreadyTold = await notifyOnCall(
          deps,
          {
            ticketId: ticket.id,
            toolName: locked.name,
            toolCode: locked.code,
            hazards: input.hazards,
            description: input.description,
            exceptUserId: user.id,
          },
          transaction,
        );
      }
      await notifyUsers(
        deps,
        {
          userIds: engineers.map((u) => u.id).filter((id) => !alreadyTold.includes(id)),
          exceptUserId: user.id,
          kind: 'ticket.created',
          title: `[#${ticket.id}] ${priority.priority} new report on ${where}: ${ticket.title}`,
          text: [
            `${user.name} reported a problem on ${where}.`,
            `Category: ${CATEGORY_LABELS[input.category]}. Impact: ${IMPACT_LABELS[input.impact]}. Priority: ${priority.priority}.`,
            input.alarmText ? `Alarm text: ${input.alarmText}` : null,
            input.wafersCount > 0 ? `Wafers left in the tool: ${input.wafersCount}.` : null,
            '',
            input.description,
          ]
            .filter((l) => l !== null)
            .join('\n'),
          ticketId: ticket.id,
        },
        transaction,
      );
      // Staff lists refetch; everyone else sees the new open-ticket count on the board entry.
      deps.events.publish({ type: 'ticket.created', audience: 'staff', payload: { id: ticket.id, toolId: locked.id } }, transaction);
      announceBoardTools(deps, [locked.id], transaction);
      return { id: ticket.id, status: ticket.status, priority: ticket.priority, version: ticket.version, photos: stored.length };
    }),
  );
}

/** "I see it too": the report joins an open ticket with its own author, text and photos. */
export async function addReport(deps: AppDeps, user: AuthUser, ticketId: number, input: AddReportData, files: readonly IncomingFile[]) {
  const existing = await findTicket(ticketId);
  if (!isOpenStatus(existing.status)) {
    if (existing.status === 'merged')
      throw new AppError(409, 'ticket_merged', `This ticket was merged into #${existing.mergedIntoId}; add your report there.`);
    throw new AppError(409, 'ticket_not_open', 'This ticket is no longer open. Report the problem as a new one, or reopen this ticket.');
  }
  return withStoredPhotos(deps, files, (stored) =>
    deps.sequelize.transaction(async (transaction) => {
      const tool = await Tool.findByPk(existing.toolId, { transaction, lock: transaction.LOCK.UPDATE });
      const ticket = await Ticket.findByPk(ticketId, { transaction, lock: transaction.LOCK.UPDATE });
      const earlier = await alreadySent(deps, user.id, input.clientKey, input.description, 'added_report', transaction);
      if (earlier) throw new AlreadySent(earlier);
      if (!tool || !ticket || !isOpenStatus(ticket.status))
        throw new AppError(409, 'ticket_not_open', 'This ticket closed in the meantime. Report the problem as a new one.');

      const event = await appendEvent(
        ticket.id,
        user.id,
        'added_report',
        { body: input.description, data: reportFacts(input, stored.length) },
        transaction,
      );
      await savePhotos(deps, ticket.id, Number(event.id), user.id, stored, transaction);

      // The ticket takes the worst of what everyone saw.
      const newHazards = input.hazards.filter((h) => !ticket.hazards.includes(h));
      const impact = worseImpact(ticket.impact, input.impact);
      const wafers = Math.max(ticket.wafersCount, input.wafersCount);
      if (newHazards.length || impact !== ticket.impact || wafers !== ticket.wafersCount) {
        const before = { priority: ticket.priority, impact: ticket.impact, hazards: ticket.hazards, wafersCount: ticket.wafersCount };
        ticket.hazards = [...ticket.hazards, ...newHazards];
        ticket.impact = impact;
        ticket.wafersCount = wafers;
        if (!ticket.priorityOverridden) {
          ticket.priority = computePriority({
            impact,
            hazards: ticket.hazards,
            wafersAtRisk: wafers,
            wafersKnownSafe: ticket.wafersRecoverable === 'yes',
            criticality: tool.criticality,
          }).priority;
        }
        await ticket.save({ transaction });
        await appendEvent(
          ticket.id,
          null,
          'facts_changed',
          {
            data: {
              from: before,
              to: { priority: ticket.priority, impact, hazards: ticket.hazards, wafersCount: wafers },
              cause: 'added_report',
            },
          },
          transaction,
        );
      }
      if (input.impact === 'tool_stopped') await applyStoppedReport(deps, ticket, tool, ticket.moduleId, user.id, transaction);
      if (newHazards.length) {
        await notifyOnCall(
          deps,
          {
            ticketId: ticket.id,
            toolName: tool.name,
            toolCode: tool.code,
            hazards: newHazards,
            description: input.description,
            exceptUserId: user.id,
          },
          transaction,
        );
      }
      const staffToTell = ticket.assigneeId ? [ticket.assigneeId] : [tool.primaryEngineerId, tool.backupEngineerId];
      await notifyUsers(
        deps,
        {
          userIds: staffToTell,
          exceptUserId: user.id,
          kind: 'ticket.report_added',
          title: `[#${ticket.id}] Another report on ${tool.name}: ${ticket.title}`,
          text: `${user.name} saw it too and added a report:\n\n${input.description}`,
          ticketId: ticket.id,
        },
        transaction,
      );
      deps.events.publish(
        { type: 'ticket.updated', audience: { ticket: ticket.id }, payload: { id: ticket.id, toolId: tool.id } },
        transaction,
      );
      return { id: ticket.id, eventId: Number(event.id), version: ticket.version, photos: stored.length };
    }),
  );
}

export async function addComment(deps: AppDeps, user: AuthUser, ticketId: number, input: { body: string; internal: boolean }) {
  if (input.internal && !isStaff(user.role)) throw forbidden('Only staff can write internal notes.');
  return deps.sequelize.transaction(async (transaction) => {
    const ticket = await Ticket.findByPk(ticketId, { transaction });
    if (!ticket) throw new AppError(404, 'not_found', 'That ticket was not found.');
    if (ticket.status === 'merged')
      throw new AppError(409, 'ticket_merged', `This ticket was merged into #${ticket.mergedIntoId}; write there.`);
    const event = await appendEvent(
      ticket.id,
      user.id,
      input.internal ? 'note' : 'reply',
      { body: input.body, internal: input.internal },
      transaction,
    );
    if (input.internal) {
      // Staff-only: the announcement itself must not reach members' sockets.
      deps.events.publish(
        { type: 'ticket.updated', audience: { ticket: ticket.id, staffOnly: true }, payload: { id: ticket.id, toolId: ticket.toolId } },
        transaction,
      );
    } else {
      const followers = await ticketFollowers(deps, ticket.id, transaction);
      const recipients = isStaff(user.role) ? followers : [...followers, ticket.assigneeId];
      await notifyUsers(
        deps,
        {
          userIds: recipients,
          exceptUserId: user.id,
          kind: 'ticket.reply',
          title: `[#${ticket.id}] New reply: ${ticket.title}`,
          text: `${user.name} wrote:\n\n${input.body}`,
          ticketId: ticket.id,
        },
        transaction,
      );
      deps.events.publish(
        { type: 'ticket.updated', audience: { ticket: ticket.id }, payload: { id: ticket.id, toolId: ticket.toolId } },
        transaction,
      );
    }
    return { id: ticket.id, eventId: Number(event.id) };
  });
}
