import { QueryTypes } from 'sequelize';
import { Ticket } from './ticket.model';
import { loadServiceTargets, summaryIncludes, toSummary, type WithIncludes } from './ticket-query.service';
import type { AppDeps, AuthUser } from '../../lib/http';
import { OPEN_STATUSES, RESOLVED_STATUSES } from '../../../shared/ticket-workflow';
import type { TicketList, ticketListQuerySchema } from '../../../shared/schemas/tickets';
import type { z } from 'zod';

type ListQuery = z.output<typeof ticketListQuerySchema>;

/**
 * Each sort order the lists offer, forwards and backwards. Both end in the id, so tickets
 * with the same priority and creation time keep one order on every page; each has a covering
 * index (tickets_by_queue, tickets_by_newest, migration 0020) that the page's ids are read
 * from without touching the rows.
 */
const ORDERS = {
  queue: { forward: 't.priority ASC, t.created_at ASC, t.id ASC', backward: 't.priority DESC, t.created_at DESC, t.id DESC' },
  newest: { forward: 't.created_at DESC, t.id DESC', backward: 't.created_at ASC, t.id ASC' },
} as const;

/** Only the columns a list row shows: the report texts (TEXT columns) stay on disk. */
const SUMMARY_ATTRIBUTES = [
  'id',
  'toolId',
  'moduleId',
  'title',
  'status',
  'priority',
  'category',
  'impact',
  'hazards',
  'waitReason',
  'reporterId',
  'assigneeId',
  'wafersCount',
  'mergedIntoId',
  'acknowledgedAt',
  'fixedAt',
  'resolvedAt',
  'createdAt',
  'updatedAt',
  'version',
] as const;

/**
 * The filters as SQL on the tickets table alone: the tool-based ones become `tool_id IN
 * (tools …)`, the hazard filter reads the stored flag, and My reports starts from the union
 * of the member's own tickets and the ones they added a report to (each found by an index),
 * instead of an OR that defeats both indexes.
 */
export function listFilter(user: AuthUser, q: ListQuery) {
  const where: string[] = [];
  const replacements: Record<string, unknown> = { me: user.id };
  const add = (condition: string, values: Record<string, unknown> = {}) => {
    where.push(condition);
    Object.assign(replacements, values);
  };
  if (q.status === 'open') add('t.status IN (:statuses)', { statuses: [...OPEN_STATUSES] });
  else if (q.status === 'resolved') add('t.status IN (:statuses)', { statuses: [...RESOLVED_STATUSES] });
  else if (q.status !== 'all') add('t.status = :status', { status: q.status });
  if (q.waiting) add("t.status = 'waiting'");
  if (q.mine) add('t.assignee_id = :me');
  if (q.unassigned) add('t.assignee_id IS NULL');
  if (q.toolId) add('t.tool_id = :toolId', { toolId: q.toolId });
  if (q.areaId) add('t.tool_id IN (SELECT a.id FROM tools a WHERE a.area_id = :areaId)', { areaId: q.areaId });
  if (q.hazard) add('t.has_hazard = 1');
  if (q.myTools) add('t.tool_id IN (SELECT e.id FROM tools e WHERE e.primary_engineer_id = :me OR e.backup_engineer_id = :me)');
  const from = q.reportedByMe
    ? `(SELECT r.id FROM tickets r WHERE r.reporter_id = :me
        UNION SELECT e.ticket_id FROM ticket_events e WHERE e.actor_id = :me AND e.kind = 'added_report') mine
       JOIN tickets t ON t.id = mine.id`
    : 'tickets t';
  return { from, where: where.length ? `WHERE ${where.join(' AND ')}` : '', replacements };
}

/**
 * Which ids to read for a page: pages past the middle are read from the other end of the same
 * index (the last page is the first one backwards), so no page walks more than half the list.
 */
export function pageWindow(total: number, limit: number, offset: number) {
  if (offset >= total) return null;
  const shown = Math.min(limit, total - offset);
  if (offset + shown / 2 <= total / 2) return { backward: false, limit: shown, offset };
  return { backward: true, limit: shown, offset: total - offset - shown };
}

/** The SQL of one page's ids (also used by the EXPLAIN in docs/performance.md and its test). */
export function pageIdsSql(user: AuthUser, q: ListQuery, backward: boolean) {
  const f = listFilter(user, q);
  const order = ORDERS[q.sort][backward ? 'backward' : 'forward'];
  return { sql: `SELECT t.id FROM ${f.from} ${f.where} ORDER BY ${order} LIMIT :limit OFFSET :offset`, replacements: f.replacements };
}

export function countSql(user: AuthUser, q: ListQuery) {
  const f = listFilter(user, q);
  return { sql: `SELECT COUNT(*) AS n FROM ${f.from} ${f.where}`, replacements: f.replacements };
}

/**
 * A page of tickets: count on the filtered tickets table alone, read the page's ids from the
 * sort order's index, then load only the shown columns (and the tool, module and people) for
 * those ids.
 */
export async function listTickets(deps: AppDeps, user: AuthUser, q: ListQuery): Promise<TicketList> {
  const count = countSql(user, q);
  const [{ n }] = await deps.sequelize.query<{ n: number }>(count.sql, { type: QueryTypes.SELECT, replacements: count.replacements });
  const total = Number(n);
  const window = pageWindow(total, q.limit, q.offset);
  let ids: number[] = [];
  if (window) {
    const page = pageIdsSql(user, q, window.backward);
    const rows = await deps.sequelize.query<{ id: number }>(page.sql, {
      type: QueryTypes.SELECT,
      replacements: { ...page.replacements, limit: window.limit, offset: window.offset },
    });
    ids = rows.map((r) => Number(r.id));
    if (window.backward) ids.reverse();
  }
  const rows = ids.length
    ? await Ticket.findAll({ where: { id: ids }, attributes: [...SUMMARY_ATTRIBUTES], include: summaryIncludes() })
    : [];
  const byId = new Map(rows.map((r) => [r.id, r as WithIncludes]));
  const table = await loadServiceTargets();
  const now = new Date();
  const items = ids.flatMap((id) => {
    const row = byId.get(id);
    return row ? [toSummary(row, table, now)] : [];
  });
  return { items, total, limit: q.limit, offset: q.offset };
}
