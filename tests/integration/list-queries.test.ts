import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op, QueryTypes, literal, type WhereOptions } from 'sequelize';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import type { TestClient } from '../support/client';
import { Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';
import { StateInterval } from '../../server/modules/facility/facility.model';
import { loadServiceTargets, summaryIncludes, toSummary, type WithIncludes } from '../../server/modules/tickets/ticket-query.service';
import { OPEN_STATUSES, RESOLVED_STATUSES } from '../../shared/ticket-workflow';
import type { TicketDetail, TicketEventPage, TicketList } from '../../shared/schemas/tickets';
import type { HistoryEntry, Page } from '../../shared/schemas/facility';
import { createTool } from './tickets-fixtures';

// The paged lists were rewritten for speed (ids first from a covering index, the last page
// read backwards, counts without joins, My reports as a union, history and timelines bounded
// to their page). The queries they replaced are kept here as the oracle: every list must
// return the same rows, in the same order, with the same total — including tickets that tie
// in priority and creation time, which only the id orders.

let server: TestServer;
let tech: { client: TestClient; user: { id: number } };
let member: { client: TestClient; user: { id: number } };
let toolA: number;
let toolB: number;
let areaA: number;
let longTicket: number;

beforeAll(async () => {
  server = await startTestServer();
  tech = await signedInClient(server.url, 'technician');
  member = await signedInClient(server.url, 'member');
  const a = await createTool(server.deps.sequelize, { primaryEngineerId: tech.user.id, modules: ['A', 'B'] });
  const b = await createTool(server.deps.sequelize, { backupEngineerId: null });
  toolA = a.tool.id;
  toolB = b.tool.id;
  areaA = a.tool.areaId;

  // 60 tickets on three instants and four priorities: many exact ties in (priority, created_at).
  const instants = [new Date('2001-03-04T05:06:07.000Z'), new Date('2001-03-04T05:06:08.000Z'), new Date('2002-01-01T00:00:00.000Z')];
  const statuses = ['reported', 'acknowledged', 'in_repair', 'waiting', 'fixed', 'closed', 'merged', 'no_fault_found'] as const;
  const rows = Array.from({ length: 60 }, (_, i) => ({
    toolId: i % 3 === 0 ? toolB : toolA,
    moduleId: null,
    category: 'alarm_interlock',
    title: `List oracle ${i}`,
    description: 'A long text the list never shows',
    alarmText: null,
    impact: 'tool_stopped' as const,
    hazards: i % 5 === 0 ? (['leak'] as const).slice() : [],
    wafersOwner: null,
    wafersRecoverable: null,
    status: statuses[i % statuses.length],
    waitReason: statuses[i % statuses.length] === 'waiting' ? ('parts' as const) : null,
    priority: (['P1', 'P2', 'P3', 'P4'] as const)[i % 4],
    reporterId: i % 4 === 1 ? member.user.id : tech.user.id,
    assigneeId: i % 6 === 0 ? null : tech.user.id,
    mergedIntoId: null,
    fixKind: null,
    failureMode: null,
    cause: null,
    workDone: null,
    partsUsed: null,
    handsOnMinutes: null,
    wafersRecovered: null,
    wafersReturned: null,
    acknowledgedAt: null,
    fixedAt: null,
    closedAt: null,
    resolvedAt: null,
    createdAt: instants[i % instants.length],
    updatedAt: instants[i % instants.length],
  }));
  const tickets = await Ticket.bulkCreate(rows);
  // The member also added a report to some tickets they did not file (and one they did).
  for (const t of tickets.filter((_, i) => i % 7 === 3 || i === 1)) {
    await TicketEvent.create({
      ticketId: t.id,
      actorId: member.user.id,
      kind: 'added_report',
      internal: false,
      body: 'Same here',
      data: null,
      createdAt: t.createdAt,
    });
  }

  // A long timeline: 260 events, many on the same millisecond, some of them staff-only.
  longTicket = tickets[2].id;
  const at = new Date('2002-02-02T00:00:00.000Z');
  await TicketEvent.bulkCreate(
    Array.from({ length: 260 }, (_, i) => ({
      ticketId: longTicket,
      actorId: i % 2 ? member.user.id : tech.user.id,
      kind: i % 9 === 0 ? 'note' : 'reply',
      internal: i % 9 === 0,
      body: `Update ${i}`,
      data: i % 10 === 0 ? { n: i } : null,
      // Groups of four share a timestamp, and the groups run backwards against the ids.
      createdAt: new Date(at.getTime() + (65 - Math.floor(i / 4)) * 60_000),
    })),
  );

  // A state log with ties in start time, on the tool and both modules (closed intervals only,
  // before the open ones makeTool created, so the one-open rule holds).
  const logRows = [];
  for (let i = 0; i < 70; i++) {
    // Six entries an hour: two each on the tool and on both modules start together.
    const start = new Date(Date.UTC(2000, 0, 1) + Math.floor(i / 6) * 3_600_000);
    logRows.push({
      toolId: toolA,
      moduleId: i % 3 === 0 ? null : a.modules[i % 2].id,
      state: (['standby', 'productive', 'unscheduled_downtime', 'engineering'] as const)[i % 4],
      reason: 'none' as const,
      note: null,
      restriction: null,
      startedAt: start,
      endedAt: new Date(start.getTime() + 60_000),
      expectedReturnAt: null,
      ticketId: null,
      setById: tech.user.id,
      source: 'staff' as const,
      confirmed: true,
      createdAt: start,
    });
  }
  await StateInterval.bulkCreate(logRows as never[]);
});

afterAll(async () => {
  await server.close();
});

type Query = Record<string, string | number>;

/** The list query as it was before (findAndCountAll with every join): the oracle. */
async function oldList(
  userId: number,
  q: { status: string; sort: 'queue' | 'newest'; limit: number; offset: number; [k: string]: unknown },
) {
  const and: WhereOptions[] = [];
  if (q.status === 'open') and.push({ status: [...OPEN_STATUSES] });
  else if (q.status === 'resolved') and.push({ status: [...RESOLVED_STATUSES] });
  else if (q.status !== 'all') and.push({ status: q.status });
  if (q.waiting) and.push({ status: 'waiting' });
  if (q.mine) and.push({ assigneeId: userId });
  if (q.unassigned) and.push({ assigneeId: null });
  if (q.toolId) and.push({ toolId: q.toolId });
  if (q.areaId) and.push({ '$tool.area_id$': q.areaId });
  if (q.hazard) and.push(literal('JSON_LENGTH(`Ticket`.`hazards`) > 0'));
  if (q.myTools) and.push({ [Op.or]: [{ '$tool.primary_engineer_id$': userId }, { '$tool.backup_engineer_id$': userId }] });
  if (q.reportedByMe) {
    and.push({
      [Op.or]: [
        { reporterId: userId },
        literal(
          `\`Ticket\`.\`id\` IN (SELECT e.ticket_id FROM ticket_events e WHERE e.kind = 'added_report' AND e.actor_id = ${Number(userId)})`,
        ),
      ],
    });
  }
  const order: [string, string][] =
    q.sort === 'queue'
      ? [
          ['priority', 'ASC'],
          ['createdAt', 'ASC'],
          ['id', 'ASC'],
        ]
      : [
          ['createdAt', 'DESC'],
          ['id', 'DESC'],
        ];
  const { rows, count } = await Ticket.findAndCountAll({
    where: { [Op.and]: and },
    include: summaryIncludes(),
    order,
    limit: q.limit,
    offset: q.offset,
  });
  const table = await loadServiceTargets();
  return { ids: rows.map((r) => r.id), total: count, items: rows.map((r) => toSummary(r as WithIncludes, table)) };
}

async function compare(client: TestClient, userId: number, filters: Query, limit = 7) {
  const qs = (extra: Query, size = limit) =>
    new URLSearchParams(Object.entries({ ...filters, ...extra, limit: size }).map(([k, v]) => [k, String(v)])).toString();
  const first = await client.get(`/api/tickets?${qs({ offset: 0 })}`);
  expect(first.status).toBe(200);
  const total = (first.body as TicketList).total;
  const lastStart = Math.max(0, Math.floor((total - 1) / limit) * limit);
  // First page, a page before and after the middle (read forwards and backwards), the last
  // page, a page that overhangs the end, and past the end.
  const offsets = [
    ...new Set([0, Math.max(0, Math.floor(total / 2) - limit), Math.floor(total / 2), lastStart, Math.max(0, total - 3), total + 5]),
  ];
  for (const offset of offsets) {
    const res = await client.get(`/api/tickets?${qs({ offset })}`);
    const body = res.body as TicketList;
    const oracle = await oldList(userId, { status: 'open', sort: 'queue', ...filters, limit, offset } as never);
    expect({ offset, total: body.total, ids: body.items.map((t) => t.id) }).toEqual({ offset, total: oracle.total, ids: oracle.ids });
    expect(body.hasNext).toBe(offset + limit < total);
    // Row for row the same JSON as the old presenter gave (a clock's state depends on "now").
    const withoutClockState = (items: TicketList['items']) =>
      items.map((t) => ({
        ...t,
        targets: { acknowledge: { ...t.targets.acknowledge, status: null }, restore: { ...t.targets.restore, status: null } },
      }));
    expect(withoutClockState(body.items)).toEqual(withoutClockState(JSON.parse(JSON.stringify(oracle.items)) as TicketList['items']));
  }
  // Keyset paging: from the first page by "after", and from the last page back by "before",
  // the pages join up to the old query's whole order.
  const whole = (await oldList(userId, { status: 'open', sort: 'queue', ...filters, limit: 100_000, offset: 0 } as never)).ids;
  // At most about eight pages each way (the shared test database grows from run to run).
  const walk = Math.min(100, Math.max(limit, Math.ceil(total / 8)));
  const forward: number[] = [];
  let page = (await client.get(`/api/tickets?${qs({ offset: 0 }, walk)}`)).body as TicketList;
  forward.push(...page.items.map((t) => t.id));
  while (page.hasNext) {
    page = (await client.get(`/api/tickets?${qs({ after: forward[forward.length - 1] }, walk)}`)).body as TicketList;
    expect(page.items.length).toBeGreaterThan(0);
    forward.push(...page.items.map((t) => t.id));
  }
  expect(forward).toEqual(whole);
  const backward: number[] = [];
  page = (await client.get(`/api/tickets?${qs({ last: 'true' }, walk)}`)).body as TicketList;
  expect(page.hasNext).toBe(false);
  backward.unshift(...page.items.map((t) => t.id));
  while (page.hasPrevious) {
    page = (await client.get(`/api/tickets?${qs({ before: backward[0] }, walk)}`)).body as TicketList;
    expect(page.items.length).toBeGreaterThan(0);
    backward.unshift(...page.items.map((t) => t.id));
  }
  expect(backward).toEqual(whole);
  return total;
}

describe('ticket lists against the queries they replaced', () => {
  it('when the queue lists every ticket, open or resolved tickets, in either order, then pages match the old query (ties by id)', async () => {
    for (const sort of ['queue', 'newest'] as const) {
      for (const status of ['all', 'open', 'resolved', 'waiting', 'closed']) {
        await compare(tech.client, tech.user.id, { status, sort });
      }
    }
  }, 180_000);

  it('when a filter is on (mine, my tools, unassigned, hazard, waiting, tool, area), then pages match the old query', async () => {
    const filters: Query[] = [
      { mine: 'true' },
      { myTools: 'true' },
      { unassigned: 'true' },
      { hazard: 'true' },
      { waiting: 'true' },
      { toolId: toolA },
      { areaId: areaA },
      { hazard: 'true', myTools: 'true' },
    ];
    for (const f of filters) {
      for (const sort of ['queue', 'newest'] as const) {
        const total = await compare(tech.client, tech.user.id, { status: 'all', sort, ...f });
        // The fixtures alone put tickets under every filter, so nothing passes by being empty.
        expect(total, JSON.stringify(f)).toBeGreaterThan(0);
      }
    }
  }, 180_000);

  it('when a member opens My reports, then their own tickets and the ones they added to come back as before', async () => {
    const total = await compare(member.client, member.user.id, { status: 'all', sort: 'newest', reportedByMe: 'true' }, 4);
    // 15 filed (i % 4 = 1) plus the 7 added to and not filed (i % 7 = 3 and i % 4 ≠ 1).
    expect(total).toBe(22);
    await compare(member.client, member.user.id, { status: 'open', sort: 'queue', reportedByMe: 'true' }, 4);
  }, 180_000);
});

describe('a tool’s state history against the window-function query it replaced', () => {
  async function oldHistory(toolId: number, limit: number, offset: number, moduleKey?: number) {
    const scope = moduleKey === undefined ? '' : 'AND si.module_key = :moduleKey';
    return server.deps.sequelize.query<{ id: number; previousState: string | null }>(
      `SELECT h.id, h.previousState FROM (
         SELECT si.id, si.started_at AS startedAt, LAG(si.state) OVER (PARTITION BY si.module_key ORDER BY si.started_at, si.id) AS previousState
           FROM state_intervals si WHERE si.tool_id = :toolId ${scope}
       ) h ORDER BY h.startedAt DESC, h.id DESC LIMIT :limit OFFSET :offset`,
      { type: QueryTypes.SELECT, replacements: { toolId, limit, offset, moduleKey } },
    );
  }

  it('when any page of the history is read, for the tool and each module, then entries and their previous states match', async () => {
    const modules = await server.deps.sequelize.query<{ id: number }>('SELECT id FROM modules WHERE tool_id = ? ORDER BY id', {
      type: QueryTypes.SELECT,
      replacements: [toolA],
    });
    const scopes: (number | 'tool' | undefined)[] = [undefined, 'tool', ...modules.map((m) => m.id)];
    for (const scope of scopes) {
      for (const offset of [0, 9, 20, 45, 70]) {
        const res = await tech.client.get(
          `/api/tools/${toolA}/history?limit=9&offset=${offset}${scope === undefined ? '' : `&moduleId=${scope}`}`,
        );
        expect(res.status).toBe(200);
        const page = res.body as Page<HistoryEntry>;
        const oracle = await oldHistory(toolA, 9, offset, scope === undefined ? undefined : scope === 'tool' ? 0 : scope);
        expect(page.items.map((e) => [e.id, e.previousState])).toEqual(oracle.map((r) => [Number(r.id), r.previousState]));
      }
    }
  });
});

describe('a ticket page', () => {
  it('when a ticket page is read, then its open tool states are the intervals with no end', async () => {
    const t = await Ticket.findOne({ where: { toolId: toolA }, order: [['id', 'ASC']] });
    const res = await tech.client.get(`/api/tickets/${t!.id}`);
    const detail = res.body as TicketDetail;
    const open = await StateInterval.findAll({ where: { toolId: toolA, endedAt: null }, order: [['moduleId', 'ASC']] });
    expect(open).toHaveLength(3);
    expect(detail.toolStates.map((s) => [s.moduleId, s.state, s.since])).toEqual(
      open.map((s) => [s.moduleId, s.state, s.startedAt.toISOString()]),
    );
  });

  async function wholeTimeline(client: TestClient) {
    const res = await client.get(`/api/tickets/${longTicket}`);
    expect(res.status).toBe(200);
    const detail = res.body as TicketDetail;
    let events = detail.events;
    let older = detail.olderEvents;
    const pages = [detail.events.length];
    while (older > 0) {
      const next = await client.get(`/api/tickets/${longTicket}/events?before=${events[0].id}&limit=100`);
      expect(next.status).toBe(200);
      const page = next.body as TicketEventPage;
      expect(page.events.length).toBeGreaterThan(0);
      pages.push(page.events.length);
      events = [...page.events, ...events];
      older = page.olderEvents;
    }
    return { events, pages };
  }

  it('when a timeline runs past a page, then the page holds the newest 200 and the older pages complete it in the old order', async () => {
    const { events, pages } = await wholeTimeline(tech.client);
    expect(pages).toEqual([200, 60]);
    const oracle = await TicketEvent.findAll({
      where: { ticketId: longTicket },
      order: [
        ['createdAt', 'ASC'],
        ['id', 'ASC'],
      ],
    });
    expect(events.map((e) => e.id)).toEqual(oracle.map((e) => Number(e.id)));
    const withData = events.find((e) => e.body === 'Update 10');
    expect(withData?.data).toEqual({ n: 10 });
    expect(withData?.actor?.id).toBe(tech.user.id);
  });

  it('when a member reads a long timeline, then no page carries a staff-only note and the order is the old one', async () => {
    const { events } = await wholeTimeline(member.client);
    expect(events.some((e) => e.internal)).toBe(false);
    const oracle = await TicketEvent.findAll({
      where: { ticketId: longTicket, internal: false },
      order: [
        ['createdAt', 'ASC'],
        ['id', 'ASC'],
      ],
    });
    expect(events.map((e) => e.id)).toEqual(oracle.map((e) => Number(e.id)));
  });

  it('when older events are asked for with bad input, then 400 with field messages; an unknown ticket is 404', async () => {
    const bad = await member.client.get(`/api/tickets/${longTicket}/events?before=abc&limit=0`);
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields ?? {})).toEqual(expect.arrayContaining(['query.before', 'query.limit']));
    const missing = await member.client.get('/api/tickets/999999999/events');
    expect(missing.status).toBe(404);
  });
});
