import { QueryTypes } from 'sequelize';
import { Ticket } from './ticket.model';
import { loadServiceTargets, toSummary, type TargetTable, type WithIncludes } from './ticket-query.service';
import type { AppDeps, AuthUser } from '../../lib/http';
import { badRequest } from '../../lib/errors';
import { OPEN_STATUSES, RESOLVED_STATUSES } from '../../../shared/ticket-workflow';
import { PRIORITIES, type Priority } from '../../../shared/priority';
import type { TicketList, TicketSummary, ticketListQuerySchema } from '../../../shared/schemas/tickets';
import type { Hazard } from '../../../shared/report-options';
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

/**
 * Only the columns a list row shows (the report texts, TEXT columns, stay on disk), with the
 * tool, area, module and people, for one page's ids.
 */
const SUMMARY_ROWS_SQL = `SELECT t.id, t.tool_id AS toolId, t.module_id AS moduleId, t.title, t.status, t.priority, t.category,
       t.impact, t.hazards, t.wait_reason AS waitReason, t.reporter_id AS reporterId, t.assignee_id AS assigneeId,
       t.wafers_count AS wafersCount, t.merged_into_id AS mergedIntoId, t.acknowledged_at AS acknowledgedAt,
       t.fixed_at AS fixedAt, t.resolved_at AS resolvedAt, t.created_at AS createdAt, t.updated_at AS updatedAt, t.version,
       tool.code AS toolCode, tool.name AS toolName, tool.area_id AS toolAreaId, area.name AS areaName,
       m.code AS moduleCode, m.name AS moduleName, r.name AS reporterName, a.name AS assigneeName
  FROM tickets t
  JOIN tools tool ON tool.id = t.tool_id
  LEFT JOIN areas area ON area.id = tool.area_id
  LEFT JOIN modules m ON m.id = t.module_id
  LEFT JOIN users r ON r.id = t.reporter_id
  LEFT JOIN users a ON a.id = t.assignee_id
 WHERE t.id IN (:ids)`;

interface SummaryRow {
  id: number;
  toolId: number;
  moduleId: number | null;
  hazards: string | Hazard[];
  toolCode: string;
  toolName: string;
  toolAreaId: number;
  areaName: string | null;
  moduleCode: string | null;
  moduleName: string | null;
  reporterId: number | null;
  reporterName: string | null;
  assigneeId: number | null;
  assigneeName: string | null;
  [column: string]: unknown;
}

/**
 * Plain rows in the shape the ticket presenter reads (the same `toSummary` as a ticket page),
 * without building ORM objects for every row and join: the JSON is shaped once.
 */
async function loadSummaries(deps: AppDeps, ids: number[], table: TargetTable, now: Date): Promise<TicketSummary[]> {
  if (ids.length === 0) return [];
  const rows = await deps.sequelize.query<SummaryRow>(SUMMARY_ROWS_SQL, { type: QueryTypes.SELECT, replacements: { ids } });
  const byId = new Map(rows.map((r) => [Number(r.id), r]));
  return ids.flatMap((id) => {
    const r = byId.get(id);
    if (!r) return [];
    const ticket = {
      ...r,
      hazards: typeof r.hazards === 'string' ? (JSON.parse(r.hazards) as Hazard[]) : r.hazards,
      tool: { code: r.toolCode, name: r.toolName, areaId: r.toolAreaId, area: r.areaName === null ? undefined : { name: r.areaName } },
      module: r.moduleId === null ? null : { id: r.moduleId, code: r.moduleCode, name: r.moduleName },
      reporter: r.reporterId === null ? null : { id: r.reporterId, name: r.reporterName },
      assignee: r.assigneeId === null ? null : { id: r.assigneeId, name: r.assigneeName },
    };
    return [toSummary(ticket as unknown as WithIncludes, table, now)];
  });
}

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

/** Counts stop here: past it a list says "10,000+", as mail programs do, instead of counting on. */
export const COUNT_CAP = 10_000;

export function countSql(user: AuthUser, q: ListQuery) {
  const f = listFilter(user, q);
  return {
    sql: `SELECT COUNT(*) AS n FROM (SELECT 1 FROM ${f.from} ${f.where} LIMIT ${COUNT_CAP + 1}) capped`,
    replacements: f.replacements,
  };
}

/**
 * Which ids to read for an offset page when the total is known: pages past the middle are
 * read from the other end of the same index (the last page is the first one backwards), so no
 * page walks more than half the list.
 */
export function pageWindow(total: number, limit: number, offset: number) {
  if (offset >= total) return null;
  const shown = Math.min(limit, total - offset);
  if (offset + shown / 2 <= total / 2) return { backward: false, limit: shown, offset };
  return { backward: true, limit: shown, offset: total - offset - shown };
}

interface SortKey {
  priority: Priority;
  createdAt: Date;
  id: number;
}

/**
 * The rows strictly after (`side` = 'after') or before a ticket in the list's order, written as
 * disjoint ranges of the sort order's index so MariaDB seeks instead of walking from the start.
 * (An ENUM compared with `>` is not a range; later priorities are listed instead.)
 */
function keyset(sort: ListQuery['sort'], side: 'after' | 'before', key: SortKey) {
  const values = { kp: key.priority, kc: key.createdAt, ki: key.id };
  if (sort === 'newest') {
    // Newest first: "after" means older.
    const op = side === 'after' ? '<' : '>';
    return { sql: `((t.created_at = :kc AND t.id ${op} :ki) OR t.created_at ${op} :kc)`, values };
  }
  const op = side === 'after' ? '>' : '<';
  const index = PRIORITIES.indexOf(key.priority);
  const beyond = side === 'after' ? PRIORITIES.slice(index + 1) : PRIORITIES.slice(0, index);
  const parts = [`(t.priority = :kp AND t.created_at = :kc AND t.id ${op} :ki)`, `(t.priority = :kp AND t.created_at ${op} :kc)`];
  if (beyond.length) parts.push('t.priority IN (:kbeyond)');
  return { sql: `(${parts.join(' OR ')})`, values: { ...values, kbeyond: beyond } };
}

/** The SQL of one page's ids (also used by the query plans in docs/performance.md). */
export function pageIdsSql(user: AuthUser, q: ListQuery, backward: boolean, cursor?: { side: 'after' | 'before'; key: SortKey }) {
  const f = listFilter(user, q);
  const order = ORDERS[q.sort][backward ? 'backward' : 'forward'];
  let where = f.where;
  let replacements = f.replacements;
  if (cursor) {
    const k = keyset(q.sort, cursor.side, cursor.key);
    where = `${where ? `${where} AND` : 'WHERE'} ${k.sql}`;
    replacements = { ...replacements, ...k.values };
  }
  return { sql: `SELECT t.id FROM ${f.from} ${where} ORDER BY ${order} LIMIT :limit OFFSET :offset`, replacements };
}

/** How a page is read: a stretch of the sort order's index, forwards or backwards. */
interface Read {
  backward: boolean;
  limit: number;
  offset: number;
  cursor?: { side: 'after' | 'before'; key: SortKey };
}

async function readIds(deps: AppDeps, user: AuthUser, q: ListQuery, read: Read) {
  const page = pageIdsSql(user, q, read.backward, read.cursor);
  const rows = await deps.sequelize.query<{ id: number }>(page.sql, {
    type: QueryTypes.SELECT,
    replacements: { ...page.replacements, limit: read.limit, offset: read.offset },
  });
  return rows.map((r) => Number(r.id));
}

async function cursorKey(id: number, field: 'after' | 'before'): Promise<SortKey> {
  const row = await Ticket.findByPk(id, { attributes: ['id', 'priority', 'createdAt'] });
  if (!row) throw badRequest('That page no longer exists.', { [`query.${field}`]: ['No ticket has this id.'] });
  return { id: row.id, priority: row.priority, createdAt: row.createdAt };
}

/**
 * A page of tickets: count on the filtered tickets table alone (up to the cap), read the
 * page's ids from the sort order's index — after or before a ticket (keyset), the last page
 * from the end, or by offset — then load only the shown columns (and the tool, module and
 * people) for those ids. One row more than the page is read to know whether the list goes on.
 */
export async function listTickets(deps: AppDeps, user: AuthUser, q: ListQuery): Promise<TicketList> {
  const count = countSql(user, q);
  // The count, the service targets and a keyset page's ids do not wait for each other.
  const [[{ n }], keysetPage, table] = await Promise.all([
    deps.sequelize.query<{ n: number }>(count.sql, { type: QueryTypes.SELECT, replacements: count.replacements }),
    readKeysetPage(deps, user, q),
    loadServiceTargets(),
  ]);
  const totalCapped = Number(n) > COUNT_CAP;
  const total = Math.min(Number(n), COUNT_CAP);
  const page = keysetPage ?? (await readOffsetPage(deps, user, q, total, totalCapped));
  const items = await loadSummaries(deps, page.ids, table, new Date());
  return { items, total, totalCapped, limit: q.limit, offset: q.offset, hasPrevious: page.hasPrevious, hasNext: page.hasNext };
}

interface PageIds {
  ids: number[];
  hasPrevious: boolean;
  hasNext: boolean;
}

/** After or before a ticket, or the last page: null when the page is chosen by offset. */
async function readKeysetPage(deps: AppDeps, user: AuthUser, q: ListQuery): Promise<PageIds | null> {
  if (q.after || q.before) {
    const side = q.after ? 'after' : 'before';
    const key = await cursorKey((q.after ?? q.before)!, side);
    const more = await readIds(deps, user, q, { backward: side === 'before', limit: q.limit + 1, offset: 0, cursor: { side, key } });
    const ids = more.slice(0, q.limit);
    if (side === 'before') ids.reverse();
    return { ids, hasPrevious: side === 'after' || more.length > q.limit, hasNext: side === 'before' || more.length > q.limit };
  }
  if (q.last) {
    const more = await readIds(deps, user, q, { backward: true, limit: q.limit + 1, offset: 0 });
    return { ids: more.slice(0, q.limit).reverse(), hasPrevious: more.length > q.limit, hasNext: false };
  }
  return null;
}

async function readOffsetPage(deps: AppDeps, user: AuthUser, q: ListQuery, total: number, totalCapped: boolean): Promise<PageIds> {
  if (totalCapped) {
    // Past the cap the end is not known: read forwards (the pager pages by keyset anyway).
    const more = await readIds(deps, user, q, { backward: false, limit: q.limit + 1, offset: q.offset });
    return { ids: more.slice(0, q.limit), hasPrevious: q.offset > 0, hasNext: more.length > q.limit };
  }
  const window = pageWindow(total, q.limit, q.offset);
  const ids = window ? await readIds(deps, user, q, window) : [];
  if (window?.backward) ids.reverse();
  return { ids, hasPrevious: q.offset > 0 && total > 0, hasNext: q.offset + q.limit < total };
}
