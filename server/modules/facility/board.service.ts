import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  BOARD_LOOK,
  BOARD_STATUSES,
  boardStatusOf,
  type BoardStatus,
  type E10State,
  type StateReason,
} from '../../../shared/equipment-state';
import { OPEN_STATUSES } from '../../../shared/ticket-workflow';
import type { BoardData, BoardModule, BoardQuery, BoardTool, ToolCriticality } from '../../../shared/schemas/facility';
import { matchesSearch } from '../../../shared/search';
import { summarizeStatus } from './status-summary';

// The status board: every active tool with its rolled-up status, in two indexed queries
// (tools with their open interval and open-ticket count; the open intervals of their
// modules), whatever the number of tools. Both use the unique key on
// (tool_id, module_key, open_flag), so each open interval is one index lookup.

interface ToolRow {
  id: number;
  code: string;
  name: string;
  areaId: number;
  criticality: ToolCriticality;
  areaCode: string;
  areaName: string;
  state: E10State | null;
  reason: StateReason | null;
  note: string | null;
  restriction: string | null;
  startedAt: Date | null;
  expectedReturnAt: Date | null;
  source: string | null;
  confirmed: number | boolean | null;
  openTickets: number;
}

interface ModuleRow {
  id: number;
  toolId: number;
  code: string;
  name: string;
  state: E10State;
  reason: StateReason;
  note: string | null;
  startedAt: Date;
  expectedReturnAt: Date | null;
}

const openStatusList = OPEN_STATUSES.map((s) => `'${s}'`).join(',');

export interface BoardRowFilter {
  /** Only these tools (tool page, notifications); absent for the whole board. */
  toolIds?: number[];
  /** Retired tools keep their page; the board leaves them out. */
  includeRetired?: boolean;
}

/** Loads the board entries of the chosen tools, rolled up. Order: area, then tool name. */
export async function loadBoardTools(sequelize: Sequelize, filter: BoardRowFilter = {}, transaction?: Transaction): Promise<BoardTool[]> {
  const { tools } = await loadRows(sequelize, filter, transaction);
  return tools.map((t) => t.tool);
}

async function loadRows(sequelize: Sequelize, filter: BoardRowFilter, transaction?: Transaction) {
  if (filter.toolIds && filter.toolIds.length === 0) return { tools: [] as { tool: BoardTool; areaCode: string; areaName: string }[] };
  const where: string[] = [];
  const replacements: Record<string, unknown> = {};
  if (!filter.includeRetired) where.push('t.retired_at IS NULL');
  if (filter.toolIds) {
    where.push('t.id IN (:toolIds)');
    replacements.toolIds = filter.toolIds;
  }
  const whereSql = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const moduleWhere = filter.toolIds ? 'AND m.tool_id IN (:toolIds)' : '';
  const retiredJoin = filter.includeRetired ? '' : 'AND t.retired_at IS NULL';

  const [toolRows, moduleRows] = await Promise.all([
    sequelize.query<ToolRow>(
      `SELECT t.id, t.code, t.name, t.area_id AS areaId, t.criticality,
              a.code AS areaCode, a.name AS areaName,
              si.state, si.reason, si.note, si.restriction, si.started_at AS startedAt,
              si.expected_return_at AS expectedReturnAt, si.source, si.confirmed,
              COALESCE(k.n, 0) AS openTickets
         FROM tools t
         JOIN areas a ON a.id = t.area_id
         LEFT JOIN state_intervals si ON si.tool_id = t.id AND si.module_key = 0 AND si.open_flag = 1
         LEFT JOIN (SELECT tool_id, COUNT(*) AS n FROM tickets WHERE status IN (${openStatusList}) GROUP BY tool_id) k ON k.tool_id = t.id
         ${whereSql}
        ORDER BY a.sort_order, a.name, t.name`,
      { type: QueryTypes.SELECT, replacements, transaction },
    ),
    sequelize.query<ModuleRow>(
      `SELECT m.id, m.tool_id AS toolId, m.code, m.name,
              si.state, si.reason, si.note, si.started_at AS startedAt, si.expected_return_at AS expectedReturnAt
         FROM modules m
         JOIN tools t ON t.id = m.tool_id ${retiredJoin}
         JOIN state_intervals si ON si.tool_id = m.tool_id AND si.module_key = m.id AND si.open_flag = 1
        WHERE m.retired_at IS NULL ${moduleWhere}
        ORDER BY m.tool_id, m.sort_order, m.name`,
      { type: QueryTypes.SELECT, replacements, transaction },
    ),
  ]);

  const modulesByTool = new Map<number, ModuleRow[]>();
  for (const m of moduleRows) {
    const list = modulesByTool.get(m.toolId);
    if (list) list.push(m);
    else modulesByTool.set(m.toolId, [m]);
  }

  const tools = toolRows.map((row) => {
    const mods = modulesByTool.get(row.id) ?? [];
    // A tool always has an open interval once created; a missing one (a half-imported tool)
    // reads as Offline rather than breaking the board.
    const own = {
      state: row.state ?? 'non_scheduled',
      note: row.note,
      restriction: row.restriction,
      startedAt: row.startedAt ?? new Date(0),
      expectedReturnAt: row.expectedReturnAt,
    };
    const summary = summarizeStatus(own, mods);
    const modules: BoardModule[] = mods.map((m) => ({
      id: m.id,
      code: m.code,
      name: m.name,
      state: m.state,
      status: boardStatusOf(m.state),
      reason: m.reason,
      note: m.note,
      since: m.startedAt.toISOString(),
      expectedReturnAt: m.expectedReturnAt?.toISOString() ?? null,
    }));
    const tool: BoardTool = {
      id: row.id,
      code: row.code,
      name: row.name,
      areaId: row.areaId,
      criticality: row.criticality,
      status: summary.status,
      state: own.state,
      reason: row.reason ?? 'none',
      note: summary.note,
      restriction: row.restriction,
      since: summary.since.toISOString(),
      expectedReturnAt: summary.expectedReturnAt?.toISOString() ?? null,
      confirmed: row.confirmed === null ? true : Boolean(row.confirmed),
      source: row.source ?? 'system',
      openTickets: Number(row.openTickets),
      modules,
    };
    return { tool, areaCode: row.areaCode, areaName: row.areaName };
  });
  return { tools };
}

/**
 * Everything the board shows, in one call. The whole facility is a bounded set (hundreds of
 * tools), and the status counts describe all of it, so filters apply after the roll-up:
 * a tool's status is computed from its modules, not stored.
 */
export async function getBoard(sequelize: Sequelize, query: BoardQuery = {}): Promise<BoardData> {
  const { tools } = await loadRows(sequelize, {});
  const counts = Object.fromEntries(BOARD_STATUSES.map((s) => [s, 0])) as Record<BoardStatus, number>;
  for (const { tool } of tools) counts[tool.status]++;

  const areas = new Map<number, BoardData['areas'][number]>();
  for (const { tool, areaCode, areaName } of tools) {
    if (query.areaId && tool.areaId !== query.areaId) continue;
    if (query.status && tool.status !== query.status) continue;
    if (!matchesSearch(query.q, [tool.code, tool.name, areaName])) continue;
    let area = areas.get(tool.areaId);
    if (!area) {
      area = { id: tool.areaId, code: areaCode, name: areaName, tools: [] };
      areas.set(tool.areaId, area);
    }
    area.tools.push(tool);
  }
  return { generatedAt: new Date().toISOString(), areas: [...areas.values()], counts, total: tools.length };
}

/** Worst first, then by name: for summaries such as the lobby display's "needs attention". */
export function byUrgency(a: BoardTool, b: BoardTool) {
  return BOARD_LOOK[a.status].rank - BOARD_LOOK[b.status].rank || a.name.localeCompare(b.name);
}
