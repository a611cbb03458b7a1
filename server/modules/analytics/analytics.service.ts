// Time accounting from the state log, for a period [from, to) and a scope (facility, area or
// tool). Everything is summed in SQL; Node receives grouped rows (per tool × state × reason,
// per month × state, per failure mode × category), at most one edge interval per tool, and the
// failure start times the trend test needs; never the log itself.
//
// Definitions (also in docs/analytics.md):
// - Only the tool's own log counts (module_id IS NULL). Module intervals exist to show a tool
//   as Limited on the board; E10 measures the equipment as a whole.
// - Every interval is clipped to the period: GREATEST(started_at, from) to
//   LEAST(COALESCE(ended_at, now), to). Whole calendar months (UTC) come from the
//   trigger-maintained rollups of migration 0006; the partial months at the edges from the
//   log itself: the intervals starting there in SQL, the one running at the edge and the open
//   one of each tool clipped in Node (see period-plan.ts).
// - A failure is counted in the period in which it starts: an unscheduled-downtime interval
//   whose predecessor (the interval of the same tool ending where it starts) is not in
//   unscheduled downtime starts one (state_stretch_starts). A stretch of repair, waiting for
//   parts and more repair is one failure. Downtime events (for MTOL) are the stretches of
//   either downtime state.
// - Assists are tickets marked fixed as an assist within the period.

import { QueryTypes, type Sequelize } from 'sequelize';
import type { E10State, StateReason } from '../../../shared/equipment-state';
import type {
  AnalyticsAreaRow,
  AnalyticsMonthRow,
  AnalyticsQuery,
  AnalyticsReport,
  AnalyticsScope,
  AnalyticsToolRow,
  ParetoKind,
  ParetoRow,
  ScopeOptions,
  ToolReliability,
} from '../../../shared/schemas/analytics';
import { TOOL_RELIABILITY_WINDOWS } from '../../../shared/schemas/analytics';
import { notFound } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';
import {
  addHours,
  addTally,
  emptyStateHours,
  emptyTally,
  figuresOf,
  MICROS_PER_HOUR,
  STATE_KEY,
  trendOf,
  uptimeOf,
  type Tally,
} from './figures';
import { monthSerial, planPeriod, type PeriodPlan, type Segment } from './period-plan';
import { responseFigures } from './response-times';

export type Scope = { kind: 'facility' } | { kind: 'area'; areaId: number } | { kind: 'tool'; toolId: number };

type Replacements = Record<string, unknown>;

export const NOTES: AnalyticsReport['notes'] = {
  mtbf: 'MTBF over uptime: productive, standby and engineering hours per failure. Faultline has no feed of real run time, so idle running is logged as standby and productive time alone cannot be measured.',
  mttr: 'MTTR as SEMI E10 defines it: repair, test and verification hours per failure, without waiting for parts, the vendor or the user. Mean down time per failure includes the waiting.',
  months: 'Months are calendar months in UTC; the first and last may be partial.',
  pareto:
    'Unscheduled downtime hours in the period, grouped by the failure mode and category of the ticket each stretch of downtime is linked to.',
  trend:
    'Rising failure rate: the reverse-arrangement test (95 %, one-sided) finds the gaps between failure starts shrinking. Needs at least four failures in the period.',
};

/** SQL that limits rows of `alias` (a table with tool_id, or tools itself) to the scope. */
function scopeSql(scope: Scope, alias: string, toolsTable = false): string {
  const column = toolsTable ? `${alias}.id` : `${alias}.tool_id`;
  if (scope.kind === 'tool') return ` AND ${column} = :scopeToolId`;
  if (scope.kind === 'area') {
    return toolsTable ? ` AND ${alias}.area_id = :scopeAreaId` : ` AND ${column} IN (SELECT id FROM tools WHERE area_id = :scopeAreaId)`;
  }
  return '';
}

function scopeReplacements(scope: Scope): Replacements {
  if (scope.kind === 'tool') return { scopeToolId: scope.toolId };
  if (scope.kind === 'area') return { scopeAreaId: scope.areaId };
  return {};
}

const clipped = (start: string, end: string) => `TIMESTAMPDIFF(MICROSECOND, GREATEST(si.started_at, ${start}), LEAST(si.ended_at, ${end}))`;

/**
 * Closed tool-level intervals that START inside raw segment i, clipped to it. The interval
 * running at the segment's start and the open intervals come from periodEdges().
 */
function rawSegmentSource(scope: Scope, i: number, select: (us: string) => string, where = ''): string {
  const f = `:seg${i}From`;
  const t = `:seg${i}To`;
  return `SELECT ${select(clipped(f, t))} FROM state_intervals si
    WHERE si.module_key = 0 AND si.started_at >= ${f} AND si.started_at < ${t} AND si.ended_at IS NOT NULL${where}${scopeSql(scope, 'si')}`;
}

function planReplacements(plan: PeriodPlan, scope: Scope): Replacements {
  const r: Replacements = { from: plan.from, to: plan.to, ...scopeReplacements(scope) };
  plan.raw.forEach((segment: Segment, i) => {
    r[`seg${i}From`] = segment.from;
    r[`seg${i}To`] = segment.to;
  });
  if (plan.rollup) {
    r.rollupFrom = plan.rollup.from;
    r.rollupTo = plan.rollup.to;
  }
  return r;
}

const n = (value: unknown) => Number(value ?? 0);

interface HoursRow {
  /** -1 for whole months from the rollup, else the raw segment (which lies in one month). */
  seg: number;
  toolId: number;
  state: E10State;
  reason: StateReason;
  us: number | string;
}

/**
 * Hours per tool, state and reason: whole months from the rollup and the raw segments from
 * the log, as separate queries so they run side by side; the caller adds them up.
 */
async function hoursByTool(sequelize: Sequelize, plan: PeriodPlan, scope: Scope): Promise<HoursRow[]> {
  const replacements = planReplacements(plan, scope);
  const queries: Promise<HoursRow[]>[] = [];
  if (plan.rollup) {
    queries.push(
      sequelize.query<HoursRow>(
        `SELECT -1 AS seg, h.tool_id AS toolId, h.state, h.reason, SUM(h.micros) AS us FROM state_hours_monthly h
          WHERE h.month >= :rollupFrom AND h.month < :rollupTo${scopeSql(scope, 'h')}
          GROUP BY h.tool_id, h.state, h.reason ORDER BY NULL`,
        { type: QueryTypes.SELECT, replacements },
      ),
    );
  }
  plan.raw.forEach((_, i) =>
    queries.push(
      sequelize.query<HoursRow>(
        `SELECT ${i} AS seg, tool_id AS toolId, state, reason, SUM(us) AS us
           FROM (${rawSegmentSource(scope, i, (us) => `si.tool_id, si.state, si.reason, ${us} AS us`)}) x
          GROUP BY tool_id, state, reason ORDER BY NULL`,
        { type: QueryTypes.SELECT, replacements },
      ),
    ),
  );
  return (await Promise.all(queries)).flat();
}

interface MonthRow {
  serial: number;
  state: E10State;
  us: number | string;
}

/**
 * Hours per whole calendar month (UTC) and state from the rollup. The partial months come
 * from hoursByTool's raw rows: each raw segment lies inside one month.
 */
async function rollupHoursByMonth(sequelize: Sequelize, plan: PeriodPlan, scope: Scope): Promise<MonthRow[]> {
  if (!plan.rollup) return [];
  return sequelize.query<MonthRow>(
    `SELECT YEAR(h.month) * 12 + MONTH(h.month) - 1 AS serial, h.state, SUM(h.micros) AS us FROM state_hours_monthly h
      WHERE h.month >= :rollupFrom AND h.month < :rollupTo${scopeSql(scope, 'h')}
      GROUP BY h.month, h.state ORDER BY NULL`,
    { type: QueryTypes.SELECT, replacements: planReplacements(plan, scope) },
  );
}

/** A tool-level interval at an edge of the period. */
interface EdgeRow {
  /** The raw segment whose start it runs across, or -1 for an open interval. */
  seg: number;
  toolId: number;
  state: E10State;
  reason: StateReason;
  startedAt: Date;
  endedAt: Date | null;
  ticketId: number | null;
}

/**
 * The intervals the rollup and the raw segments leave out: for each raw segment, the closed
 * interval of each tool running at its start (found by one loose index scan for the latest
 * start before it: the log has no gaps or overlaps), and each tool's open interval. At most
 * one row per tool and edge, so the clipping happens in Node.
 */
async function periodEdges(sequelize: Sequelize, plan: PeriodPlan, scope: Scope): Promise<EdgeRow[]> {
  const columns = 'si.tool_id AS toolId, si.state, si.reason, si.started_at AS startedAt, si.ended_at AS endedAt, si.ticket_id AS ticketId';
  const sources = plan.raw.map(
    (_, i) => `SELECT ${i} AS seg, ${columns}
      FROM (SELECT tool_id, MAX(started_at) AS st FROM state_intervals
             WHERE module_key = 0 AND started_at < :seg${i}From${scopeSql(scope, 'state_intervals')}
             GROUP BY tool_id ORDER BY NULL) m
      JOIN state_intervals si ON si.tool_id = m.tool_id AND si.module_key = 0 AND si.started_at = m.st
     WHERE si.ended_at > :seg${i}From`,
  );
  sources.push(`SELECT -1 AS seg, ${columns} FROM state_intervals si
    WHERE si.open_flag = 1 AND si.module_key = 0 AND si.started_at < :to${scopeSql(scope, 'si')}`);
  return sequelize.query<EdgeRow>(sources.join('\nUNION ALL\n'), { type: QueryTypes.SELECT, replacements: planReplacements(plan, scope) });
}

// Stretch starts are kept by the triggers of migration 0006 (see there): each unscheduled one
// is a failure, counted in the period in which it starts.
async function failureStarts(sequelize: Sequelize, plan: PeriodPlan, scope: Scope): Promise<Map<number, number[]>> {
  // One row per tool with its failure start times (epoch ms, in order): a year of a busy
  // facility has tens of thousands of failures, and one string per tool parses far faster.
  const rows = await sequelize.query<{ toolId: number; starts: string }>(
    `SELECT ss.tool_id AS toolId,
            GROUP_CONCAT(TIMESTAMPDIFF(MICROSECOND, '1970-01-01', ss.started_at) DIV 1000 ORDER BY ss.started_at SEPARATOR ',') AS starts
       FROM state_stretch_starts ss
      WHERE ss.state = 'unscheduled_downtime' AND ss.started_at >= :from AND ss.started_at < :to${scopeSql(scope, 'ss')}
      GROUP BY ss.tool_id ORDER BY NULL`,
    { type: QueryTypes.SELECT, replacements: planReplacements(plan, scope) },
  );
  return new Map(rows.map((row) => [row.toolId, String(row.starts).split(',').map(Number)]));
}

async function scheduledDowntimeEvents(sequelize: Sequelize, plan: PeriodPlan, scope: Scope) {
  return sequelize.query<{ toolId: number; events: number }>(
    `SELECT ss.tool_id AS toolId, COUNT(*) AS events FROM state_stretch_starts ss
      WHERE ss.state = 'scheduled_downtime' AND ss.started_at >= :from AND ss.started_at < :to${scopeSql(scope, 'ss')}
      GROUP BY ss.tool_id`,
    { type: QueryTypes.SELECT, replacements: planReplacements(plan, scope) },
  );
}

async function assistsByTool(sequelize: Sequelize, plan: PeriodPlan, scope: Scope) {
  return sequelize.query<{ toolId: number; assists: number }>(
    `SELECT si.tool_id AS toolId, COUNT(*) AS assists FROM tickets si
      WHERE si.fixed_at >= :from AND si.fixed_at < :to AND si.fix_kind = 'assist'${scopeSql(scope, 'si')}
      GROUP BY si.tool_id`,
    { type: QueryTypes.SELECT, replacements: planReplacements(plan, scope) },
  );
}

interface ParetoSqlRow {
  mode: string | null;
  category: string | null;
  tickets: number;
  us: number | string;
}

/**
 * Unscheduled downtime hours by the failure mode and category of the linked ticket. The edge
 * intervals' hours (clipped in Node) come in as `edgeHours` per ticket (0: none), so that
 * every ticket is counted once.
 */
async function downtimeByTicket(
  sequelize: Sequelize,
  plan: PeriodPlan,
  scope: Scope,
  edgeHours: Map<number, number>,
): Promise<ParetoSqlRow[]> {
  const replacements = planReplacements(plan, scope);
  const sources: string[] = [];
  [...edgeHours.entries()].forEach(([ticketId, us], i) => {
    replacements[`edgeTicket${i}`] = ticketId;
    replacements[`edgeUs${i}`] = Math.round(us);
    sources.push(`SELECT :edgeTicket${i} AS ticket_id, :edgeUs${i} AS us`);
  });
  if (plan.rollup) {
    sources.push(`SELECT d.ticket_id, d.micros AS us FROM downtime_hours_by_ticket d
      WHERE d.month >= :rollupFrom AND d.month < :rollupTo${scopeSql(scope, 'd')}`);
  }
  plan.raw.forEach((_, i) =>
    sources.push(
      rawSegmentSource(scope, i, (us) => `COALESCE(si.ticket_id, 0) AS ticket_id, ${us} AS us`, ` AND si.state = 'unscheduled_downtime'`),
    ),
  );
  if (sources.length === 0) return [];
  // Grouped by the plain column (the collation already ignores case and trailing spaces);
  // buildReport folds leading spaces and empty modes. A ticket has one mode and category, so
  // the distinct counts of folded groups add up.
  return sequelize.query<ParetoSqlRow>(
    `SELECT tk.failure_mode AS mode, tk.category, COUNT(DISTINCT tk.id) AS tickets, SUM(x.us) AS us
       FROM (${sources.join('\nUNION ALL\n')}) x
       LEFT JOIN tickets tk ON tk.id = x.ticket_id
      GROUP BY tk.failure_mode, tk.category ORDER BY NULL`,
    { type: QueryTypes.SELECT, replacements },
  );
}

interface ToolInfo {
  id: number;
  code: string;
  name: string;
  areaId: number;
  areaName: string;
}

async function toolsInScope(sequelize: Sequelize, scope: Scope): Promise<ToolInfo[]> {
  return sequelize.query<ToolInfo>(
    `SELECT t.id, t.code, t.name, t.area_id AS areaId, a.name AS areaName
       FROM tools t JOIN areas a ON a.id = t.area_id
      WHERE 1 = 1${scopeSql(scope, 't', true)}
      ORDER BY a.sort_order, a.name, t.code`,
    { type: QueryTypes.SELECT, replacements: scopeReplacements(scope) },
  );
}

/** The scope's display name; 404 when the area or tool does not exist. */
async function describeScope(sequelize: Sequelize, scope: Scope): Promise<AnalyticsScope> {
  if (scope.kind === 'facility') return { kind: 'facility', id: null, code: null, name: 'Whole facility' };
  if (scope.kind === 'area') {
    const [row] = await sequelize.query<{ name: string; code: string }>('SELECT name, code FROM areas WHERE id = :id', {
      type: QueryTypes.SELECT,
      replacements: { id: scope.areaId },
    });
    if (!row) throw notFound('That area');
    return { kind: 'area', id: scope.areaId, code: row.code, name: row.name };
  }
  const [row] = await sequelize.query<{ name: string; code: string }>('SELECT name, code FROM tools WHERE id = :id', {
    type: QueryTypes.SELECT,
    replacements: { id: scope.toolId },
  });
  if (!row) throw notFound('That tool');
  return { kind: 'tool', id: scope.toolId, code: row.code, name: `${row.code} · ${row.name}` };
}

type ParetoTally = Map<string, { kind: ParetoKind; key: string | null; hours: number; tickets: number }>;

function addPareto(map: ParetoTally, kind: ParetoKind, key: string | null, hours: number, tickets: number) {
  // Modes are free text: "Turbo pump fault" and " turbo PUMP fault " are one mode.
  const id = `${kind}:${(key ?? '').toLocaleLowerCase()}`;
  const entry = map.get(id) ?? { kind, key, hours: 0, tickets: 0 };
  entry.hours += hours;
  entry.tickets += tickets;
  map.set(id, entry);
}

function paretoRows(entries: ParetoTally, totalHours: number): ParetoRow[] {
  const sorted = [...entries.values()]
    .filter((row) => row.hours > 0)
    .sort((a, b) => b.hours - a.hours || String(a.key).localeCompare(String(b.key)));
  let cumulative = 0;
  return sorted.map((row) => {
    cumulative += row.hours;
    return {
      kind: row.kind,
      key: row.key,
      hours: row.hours,
      tickets: row.tickets,
      share: totalHours > 0 ? row.hours / totalHours : 0,
      cumulativeShare: totalHours > 0 ? cumulative / totalHours : 0,
    };
  });
}

export function scopeOf(query: Pick<AnalyticsQuery, 'scope' | 'areaId' | 'toolId'>): Scope {
  if (query.scope === 'area') return { kind: 'area', areaId: query.areaId! };
  if (query.scope === 'tool') return { kind: 'tool', toolId: query.toolId! };
  return { kind: 'facility' };
}

/** One edge interval's share of the period, split by month bucket. */
interface EdgePiece {
  toolId: number;
  state: E10State;
  reason: StateReason;
  ticketId: number | null;
  serial: number;
  us: number;
}

/** Clips the edge intervals: a straddler to its raw segment, an open interval to the period. */
function edgePieces(edges: EdgeRow[], plan: PeriodPlan): EdgePiece[] {
  const pieces: EdgePiece[] = [];
  for (const row of edges) {
    const base = { toolId: row.toolId, state: row.state, reason: row.reason, ticketId: row.ticketId };
    if (row.seg >= 0) {
      const segment = plan.raw[row.seg];
      const end = Math.min(new Date(row.endedAt!).getTime(), segment.to.getTime());
      const us = (end - segment.from.getTime()) * 1000;
      if (us > 0) pieces.push({ ...base, serial: monthSerial(segment.from), us });
      continue;
    }
    // An open interval runs to the end of the period (which is never later than now).
    const start = Math.max(new Date(row.startedAt).getTime(), plan.from.getTime());
    for (const month of plan.months) {
      const us = (month.to.getTime() - Math.max(start, month.from.getTime())) * 1000;
      if (us > 0) pieces.push({ ...base, serial: month.serial, us });
    }
  }
  return pieces;
}

/** Per-tool tallies and failure start times for a period: the core of every figure. */
async function tallyTools(sequelize: Sequelize, plan: PeriodPlan, scope: Scope, edges: Promise<EdgePiece[]>) {
  const [hours, pieces, failures, sdtEvents, assists] = await Promise.all([
    hoursByTool(sequelize, plan, scope),
    edges,
    failureStarts(sequelize, plan, scope),
    scheduledDowntimeEvents(sequelize, plan, scope),
    assistsByTool(sequelize, plan, scope),
  ]);
  const tallies = new Map<number, Tally>();
  const tallyFor = (toolId: number) => {
    let tally = tallies.get(toolId);
    if (!tally) tallies.set(toolId, (tally = emptyTally()));
    return tally;
  };
  for (const row of hours) addHours(tallyFor(row.toolId), row.state, row.reason, n(row.us) / MICROS_PER_HOUR);
  const rawMonthRows: MonthRow[] = hours
    .filter((row) => n(row.seg) >= 0)
    .map((row) => ({ serial: monthSerial(plan.raw[n(row.seg)].from), state: row.state, us: row.us }));
  for (const piece of pieces) addHours(tallyFor(piece.toolId), piece.state, piece.reason, piece.us / MICROS_PER_HOUR);
  const starts = failures;
  for (const [toolId, list] of starts) {
    const tally = tallyFor(toolId);
    tally.failures += list.length;
    tally.downtimeEvents += list.length;
  }
  for (const row of sdtEvents) tallyFor(row.toolId).downtimeEvents += n(row.events);
  for (const row of assists) tallyFor(row.toolId).assists += n(row.assists);
  return { tallies, starts, rawMonthRows };
}

function edgesOf(sequelize: Sequelize, plan: PeriodPlan, scope: Scope): Promise<EdgePiece[]> {
  if (plan.months.length === 0) return Promise.resolve([]);
  return periodEdges(sequelize, plan, scope).then((rows) => edgePieces(rows, plan));
}

/** The full manager report for a period and scope. */
export async function buildReport(deps: AppDeps, query: AnalyticsQuery, now = new Date()): Promise<AnalyticsReport> {
  const { sequelize } = deps;
  const scope = scopeOf(query);
  const plan = planPeriod(query.from, query.to, now);
  const edges = edgesOf(sequelize, plan, scope);
  const pareto = edges.then((pieces) => {
    const byTicket = new Map<number, number>();
    for (const p of pieces)
      if (p.state === 'unscheduled_downtime') byTicket.set(p.ticketId ?? 0, (byTicket.get(p.ticketId ?? 0) ?? 0) + p.us);
    return downtimeByTicket(sequelize, plan, scope, byTicket);
  });

  const [scopeInfo, tools, { tallies, starts, rawMonthRows }, rollupMonths, pieces, paretoRowsSql, response] = await Promise.all([
    describeScope(sequelize, scope),
    toolsInScope(sequelize, scope),
    tallyTools(sequelize, plan, scope, edges),
    rollupHoursByMonth(sequelize, plan, scope),
    edges,
    pareto,
    responseFigures(sequelize, plan, scope, now),
  ]);

  const total = emptyTally();
  const areaTallies = new Map<number, { name: string; tools: number; tally: Tally }>();
  const toolRows: AnalyticsToolRow[] = [];
  const fromMs = plan.from.getTime();
  const toMs = plan.to.getTime();
  for (const tool of tools) {
    const tally = tallies.get(tool.id);
    // A tool with no log in the period (added later) has no figures to show.
    if (!tally) continue;
    addTally(total, tally);
    const area = areaTallies.get(tool.areaId) ?? { name: tool.areaName, tools: 0, tally: emptyTally() };
    area.tools += 1;
    addTally(area.tally, tally);
    areaTallies.set(tool.areaId, area);
    toolRows.push({ ...tool, figures: figuresOf(tally), ...trendOf(starts.get(tool.id) ?? [], fromMs, toMs) });
  }
  toolRows.sort((a, b) => (a.figures.availabilityPct ?? 101) - (b.figures.availabilityPct ?? 101) || a.code.localeCompare(b.code));

  const failuresByMonth = new Map<number, number>();
  for (const list of starts.values()) {
    for (const t of list) {
      const d = new Date(t);
      const serial = d.getUTCFullYear() * 12 + d.getUTCMonth();
      failuresByMonth.set(serial, (failuresByMonth.get(serial) ?? 0) + 1);
    }
  }
  const monthHours = new Map<number, ReturnType<typeof emptyStateHours>>();
  const addMonthHours = (serial: number, state: E10State, us: number) => {
    const hours = monthHours.get(serial) ?? emptyStateHours();
    hours[STATE_KEY[state]] += us / MICROS_PER_HOUR;
    monthHours.set(serial, hours);
  };
  for (const row of [...rollupMonths, ...rawMonthRows]) addMonthHours(n(row.serial), row.state, n(row.us));
  for (const piece of pieces) addMonthHours(piece.serial, piece.state, piece.us);
  const monthRows: AnalyticsMonthRow[] = plan.months.map((m) => {
    const hours = monthHours.get(m.serial) ?? emptyStateHours();
    const operations = uptimeOf(hours) + hours.scheduledDowntime + hours.unscheduledDowntime;
    return {
      month: m.start.toISOString(),
      from: m.from.toISOString(),
      to: m.to.toISOString(),
      partial:
        m.from.getTime() !== m.start.getTime() || m.to.getTime() !== Date.UTC(m.start.getUTCFullYear(), m.start.getUTCMonth() + 1, 1),
      hours,
      availabilityPct: operations > 0 ? (uptimeOf(hours) / operations) * 100 : null,
      failures: failuresByMonth.get(m.serial) ?? 0,
    };
  });

  const byMode: ParetoTally = new Map();
  const byCategory: ParetoTally = new Map();
  let unscheduledHours = 0;
  for (const row of paretoRowsSql) {
    const hours = n(row.us) / MICROS_PER_HOUR;
    const tickets = n(row.tickets);
    unscheduledHours += hours;
    // Every ticket has a category, so a missing one means no ticket is linked.
    if (row.category === null) {
      addPareto(byMode, 'no_ticket', null, hours, tickets);
      addPareto(byCategory, 'no_ticket', null, hours, tickets);
      continue;
    }
    const mode = row.mode?.trim() || null;
    addPareto(byMode, mode === null ? 'not_recorded' : 'recorded', mode, hours, tickets);
    addPareto(byCategory, 'recorded', row.category, hours, tickets);
  }

  const areaRows: AnalyticsAreaRow[] = [...areaTallies.entries()]
    .map(([id, a]) => ({ id, name: a.name, toolCount: a.tools, figures: figuresOf(a.tally) }))
    .sort((a, b) => a.name.localeCompare(b.name));

  return {
    scope: scopeInfo,
    period: {
      from: plan.from.toISOString(),
      to: plan.to.toISOString(),
      requestedTo: query.to.toISOString(),
      hours: (toMs - fromMs) / 3_600_000,
    },
    generatedAt: now.toISOString(),
    notes: NOTES,
    totals: figuresOf(total),
    months: monthRows,
    pareto: { unscheduledHours, byFailureMode: paretoRows(byMode, unscheduledHours), byCategory: paretoRows(byCategory, unscheduledHours) },
    response,
    tools: toolRows,
    areas: areaRows,
  };
}

/** The reduced figures of one tool for the tool page: 30 and 365 days to now. */
export async function toolReliability(deps: AppDeps, toolId: number, now = new Date()): Promise<ToolReliability> {
  const [exists] = await deps.sequelize.query<{ id: number }>('SELECT id FROM tools WHERE id = :id', {
    type: QueryTypes.SELECT,
    replacements: { id: toolId },
  });
  if (!exists) throw notFound('That tool');
  const scope: Scope = { kind: 'tool', toolId };
  const windows = await Promise.all(
    TOOL_RELIABILITY_WINDOWS.map(async (days) => {
      const plan = planPeriod(new Date(now.getTime() - days * 86_400_000), now, now);
      const { tallies } = await tallyTools(deps.sequelize, plan, scope, edgesOf(deps.sequelize, plan, scope));
      const figures = figuresOf(tallies.get(toolId) ?? emptyTally());
      return {
        days,
        from: plan.from.toISOString(),
        to: plan.to.toISOString(),
        availabilityPct: figures.availabilityPct,
        uptimeHours: figures.uptimeHours,
        failures: figures.failures,
        mtbfHours: figures.mtbf.point,
        mttrHours: figures.mttrHours,
      };
    }),
  );
  return { toolId, mtbfBasis: 'uptime', windows };
}

const OPTIONS_LIMIT = 5000;

/** Areas and tools for the scope picker (a facility has a few hundred tools at most). */
export async function scopeOptions(deps: AppDeps): Promise<ScopeOptions> {
  const [areas, tools] = await Promise.all([
    deps.sequelize.query<{ id: number; code: string; name: string }>(
      `SELECT id, code, name FROM areas ORDER BY sort_order, name LIMIT ${OPTIONS_LIMIT}`,
      { type: QueryTypes.SELECT },
    ),
    deps.sequelize.query<{ id: number; code: string; name: string; areaId: number; retired: number }>(
      `SELECT id, code, name, area_id AS areaId, retired_at IS NOT NULL AS retired FROM tools ORDER BY code LIMIT ${OPTIONS_LIMIT}`,
      { type: QueryTypes.SELECT },
    ),
  ]);
  return { areas, tools: tools.map((t) => ({ ...t, retired: Boolean(t.retired) })) };
}
