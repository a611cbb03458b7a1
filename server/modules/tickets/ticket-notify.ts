import { Op, QueryTypes, type Transaction } from 'sequelize';
import { User } from '../users/user.model';
import { Notice } from '../notices/notice.model';
import { queueMail } from '../../lib/mailer';
import { queuePush } from '../push/push.service';
import type { AppDeps } from '../../lib/http';
import { HAZARD_LABELS, type Hazard } from '../../../shared/report-options';
import { cautionLines, cautionsFor } from '../../../shared/hazard-cautions';
import { getFacilitySettings } from '../settings/settings.service';
import { pagesAtThisHour, startEscalation } from '../oncall/escalation.service';
import { onCallRecipients } from '../oncall/rota.service';

export const ticketLink = (deps: AppDeps, ticketId: number) => `${deps.config.publicUrl}/tickets/${ticketId}`;

export interface Notification {
  userIds: readonly (number | null | undefined)[];
  /** Never notified: the person who caused the change already knows. */
  exceptUserId?: number | null;
  kind: string;
  title: string;
  text: string;
  ticketId: number;
  /** Also as a phone notification (web push) to the browsers these people allowed. */
  push?: boolean;
}

/**
 * E-mail (through the outbox) plus an in-app notice for each recipient, written in the
 * caller's transaction; the 'notice.created' event reaches their sockets after commit.
 */
export async function notifyUsers(deps: AppDeps, n: Notification, transaction: Transaction) {
  const ids = [...new Set(n.userIds.filter((id): id is number => typeof id === 'number' && id !== n.exceptUserId))];
  if (ids.length === 0) return [];
  const users = await User.findAll({ where: { id: ids, active: true }, transaction });
  if (users.length === 0) return [];
  const link = ticketLink(deps, n.ticketId);
  await queueMail(
    users.map((u) => ({
      to: u.email,
      subject: n.title,
      text: `Hello ${u.name},\n\n${n.text}\n\nOpen the ticket: ${link}\n\n— Faultline`,
      // A burst of updates on one ticket reaches each person as one mail; safety mail never waits.
      fold:
        n.kind === 'ticket.hazard' || n.kind === 'ticket.created'
          ? undefined
          : { key: `ticket:${n.ticketId}:user:${u.id}`, ms: deps.config.MAIL_FOLD_MS },
    })),
    transaction,
  );
  await Notice.bulkCreate(
    users.map((u) => ({
      userId: u.id,
      kind: n.kind,
      title: n.title.slice(0, 200),
      body: n.text,
      link: `/tickets/${n.ticketId}`,
      readAt: null,
    })),
    { transaction },
  );
  if (n.push)
    await queuePush(
      users.map((u) => u.id),
      { title: n.title, body: n.text.split('\n')[0], link: `/tickets/${n.ticketId}` },
      transaction,
    );
  deps.events.publish(
    { type: 'notice.created', audience: { users: users.map((u) => u.id) }, payload: { kind: n.kind, ticketId: n.ticketId } },
    transaction,
  );
  return users.map((u) => u.id);
}

/**
 * A hazard pages the person on call at once (text and mail with a single-use acknowledge link,
 * then the backup and the manager while nobody answers; server/modules/oncall). When nobody
 * could be paged (a gap in the rota, or the ticket is already being escalated), the on-call
 * mail goes out as before, to whoever the rota (or, in a gap, the on-call flag) names.
 * Returns who was told, so they get no second mail about the same report.
 */
export async function notifyOnCall(
  deps: AppDeps,
  input: {
    ticketId: number;
    toolId: number;
    toolName: string;
    toolCode: string;
    hazards: readonly Hazard[];
    description: string;
    exceptUserId?: number | null;
  },
  transaction: Transaction,
) {
  const hazards = input.hazards.map((h) => HAZARD_LABELS[h].toLowerCase()).join(', ');
  const cautions = cautionsFor(input.hazards, await getFacilitySettings(deps, transaction));
  const title = `Safety report: ${hazards} at ${input.toolName} (${input.toolCode}) — #${input.ticketId}`;
  const text = [
    `A report on ${input.toolName} (${input.toolCode}) names a hazard: ${hazards}.`,
    '',
    input.description,
    '',
    'Cautions:',
    ...cautionLines(cautions),
  ].join('\n');
  const paged = await startEscalation(
    deps,
    {
      ticketId: input.ticketId,
      toolId: input.toolId,
      severity: 'hazard',
      headline: `Safety report: ${hazards} at ${input.toolName} (${input.toolCode})`,
      details: text,
    },
    transaction,
  );
  if (paged.length) return paged;
  return notifyUsers(
    deps,
    {
      userIds: await onCallRecipients(new Date(), transaction),
      exceptUserId: input.exceptUserId,
      kind: 'ticket.hazard',
      title,
      text,
      ticketId: input.ticketId,
    },
    transaction,
  );
}

/** A P1 ticket without a hazard pages only inside the night window (facility time); returns who was paged. */
export async function pageP1AtNight(
  deps: AppDeps,
  input: { ticketId: number; toolId: number; headline: string; details: string },
  transaction: Transaction,
) {
  if (!(await pagesAtThisHour(deps, new Date(), transaction))) return [];
  return startEscalation(deps, { ...input, severity: 'p1' }, transaction);
}

/**
 * The people who told us about a ticket: its reporter, everyone who added a report to it,
 * and the same for every ticket merged into it.
 */
export async function ticketFollowers(deps: AppDeps, ticketId: number, transaction: Transaction): Promise<number[]> {
  const rows = await deps.sequelize.query<{ userId: number }>(
    `SELECT t.reporter_id AS userId FROM tickets t WHERE (t.id = :id OR t.merged_into_id = :id) AND t.reporter_id IS NOT NULL
     UNION
     SELECT e.actor_id AS userId FROM ticket_events e JOIN tickets t ON t.id = e.ticket_id
      WHERE (t.id = :id OR t.merged_into_id = :id) AND e.kind = 'added_report' AND e.actor_id IS NOT NULL`,
    { replacements: { id: ticketId }, type: QueryTypes.SELECT, transaction },
  );
  return rows.map((r) => Number(r.userId));
}

export async function activeStaffIds(ids: readonly number[], transaction: Transaction) {
  const users = await User.findAll({ where: { id: ids, active: true, role: { [Op.ne]: 'member' } }, attributes: ['id'], transaction });
  return users.map((u) => u.id);
}
