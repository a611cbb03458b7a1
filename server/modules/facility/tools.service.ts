import { Op, QueryTypes, type Transaction, type WhereOptions } from 'sequelize';
import { Area, Tool, ToolModule } from './facility.model';
import { activePeople, peopleByIds, searchStaff, type Person } from '../users/user-directory';
import { ticketToolId } from '../tickets/ticket-lookup';
import { likePattern } from '../../lib/like-pattern';
import { allowedToolActions, authorizeToolAction } from './tool.policy';
import { findTool } from './tool-directory';
import { ToolFollow } from './facility.model';
import { AppError, badRequest, conflict, notFound } from '../../lib/errors';
import type { AppDeps, AuthUser } from '../../lib/http';
import { changeState, openInitialState, requestStateChange } from './state.service';
import { loadBoardTools, openStateSetter } from './board.service';
import { availabilityForPeriod } from './availability.service';
import { isStaff } from '../../../shared/roles';
import type {
  AreaCreateInput,
  AreaUpdateInput,
  HistoryEntry,
  ModuleCreateInput,
  ModuleUpdateInput,
  Page,
  PersonRef,
  StateChangeInput,
  ToolCreateInput,
  ToolDetail,
  ToolUpdateInput,
  adminListQuery,
  historyQuery,
  engineerListQuery,
} from '../../../shared/schemas/facility';
import type { z } from 'zod';

type AdminListQuery = z.infer<typeof adminListQuery>;
type HistoryQuery = z.infer<typeof historyQuery>;
type EngineerListQuery = z.infer<typeof engineerListQuery>;

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

/** Admin changes to areas, tools and modules: the board and tool pages refetch. */
function announce(deps: AppDeps, toolId: number | null, transaction: Parameters<AppDeps['events']['publish']>[1]) {
  deps.events.publish({ type: 'facility.updated', audience: 'all', payload: { toolId } }, transaction);
}

// ---- Areas ------------------------------------------------------------------------------

export function presentArea(a: Area) {
  return { id: a.id, name: a.name, code: a.code, description: a.description, sortOrder: a.sortOrder, retiredAt: iso(a.retiredAt) };
}

export async function listAreas(query: { includeRetired?: boolean; limit: number; offset: number }) {
  const where = query.includeRetired ? {} : { retiredAt: null };
  const { rows, count } = await Area.findAndCountAll({
    where,
    order: [
      ['sortOrder', 'ASC'],
      ['name', 'ASC'],
    ],
    limit: query.limit,
    offset: query.offset,
  });
  return { items: rows.map(presentArea), total: count, limit: query.limit, offset: query.offset };
}

export async function createArea(deps: AppDeps, input: AreaCreateInput) {
  return deps.sequelize.transaction(async (transaction) => {
    const area = await Area.create(
      { name: input.name, code: input.code, description: input.description ?? null, sortOrder: input.sortOrder ?? 0, retiredAt: null },
      { transaction },
    );
    announce(deps, null, transaction);
    return presentArea(area);
  });
}

export async function updateArea(deps: AppDeps, id: number, input: AreaUpdateInput) {
  return deps.sequelize.transaction(async (transaction) => {
    const area = await Area.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!area) throw notFound('Area');
    const { retired, ...fields } = input;
    if (retired === true && !area.retiredAt) {
      const active = await Tool.count({ where: { areaId: id, retiredAt: null }, transaction });
      if (active > 0)
        throw conflict(`This area still has ${active} active tool${active === 1 ? '' : 's'}. Move or retire them first.`, 'area_in_use');
      area.retiredAt = new Date();
    } else if (retired === false) {
      area.retiredAt = null;
    }
    area.set(fields);
    await area.save({ transaction });
    announce(deps, null, transaction);
    return presentArea(area);
  });
}

// ---- Staff who can look after tools ---------------------------------------------------------

export async function listEngineers(query: EngineerListQuery) {
  const { items, total } = await searchStaff({ search: query.q, byEmail: true, limit: query.limit, offset: query.offset });
  return { items, total, limit: query.limit, offset: query.offset };
}

async function checkEngineers(input: { primaryEngineerId?: number | null; backupEngineerId?: number | null }, transaction: Transaction) {
  const ids = [input.primaryEngineerId, input.backupEngineerId].filter((v): v is number => typeof v === 'number');
  if (ids.length === 0) return;
  const ok = new Set((await activePeople(ids, { staffOnly: true, transaction })).map((u) => u.id));
  const fields: Record<string, string[]> = {};
  if (input.primaryEngineerId && !ok.has(input.primaryEngineerId)) fields.primaryEngineerId = ['Choose an active member of staff.'];
  if (input.backupEngineerId && !ok.has(input.backupEngineerId)) fields.backupEngineerId = ['Choose an active member of staff.'];
  if (Object.keys(fields).length) throw badRequest('An engineer must be an active member of staff.', fields);
}

// ---- Tools (admin) ---------------------------------------------------------------------

function presentModule(m: ToolModule) {
  return { id: m.id, toolId: m.toolId, name: m.name, code: m.code, sortOrder: m.sortOrder, retiredAt: iso(m.retiredAt) };
}

export async function listToolsAdmin(query: AdminListQuery) {
  const where: WhereOptions<Tool> = {};
  if (!query.includeRetired) Object.assign(where, { retiredAt: null });
  if (query.areaId) Object.assign(where, { areaId: query.areaId });
  if (query.q)
    Object.assign(where, { [Op.or]: [{ name: { [Op.like]: likePattern(query.q) } }, { code: { [Op.like]: likePattern(query.q) } }] });
  const { rows, count } = await Tool.findAndCountAll({
    where,
    include: [{ model: Area, as: 'area', attributes: ['id', 'name', 'code'] }],
    order: [['name', 'ASC']],
    limit: query.limit,
    offset: query.offset,
  });
  const byId = await peopleByIds(rows.flatMap((t) => [t.primaryEngineerId, t.backupEngineerId]));
  const moduleCounts = rows.length
    ? ((await ToolModule.count({ where: { toolId: rows.map((t) => t.id), retiredAt: null }, group: ['toolId'] })) as unknown as {
        toolId: number;
        count: number;
      }[])
    : [];
  const modulesOf = new Map(moduleCounts.map((c) => [c.toolId, Number(c.count)]));
  return {
    items: rows.map((t) => {
      const area = (t as Tool & { area?: Area }).area;
      return {
        ...presentTool(t),
        area: area ? { id: area.id, name: area.name, code: area.code } : null,
        primaryEngineer: person(t.primaryEngineerId ? byId.get(t.primaryEngineerId) : null, true),
        backupEngineer: person(t.backupEngineerId ? byId.get(t.backupEngineerId) : null, true),
        moduleCount: modulesOf.get(t.id) ?? 0,
      };
    }),
    total: count,
    limit: query.limit,
    offset: query.offset,
  };
}

function presentTool(t: Tool) {
  return {
    id: t.id,
    code: t.code,
    name: t.name,
    areaId: t.areaId,
    description: t.description,
    criticality: t.criticality,
    primaryEngineerId: t.primaryEngineerId,
    backupEngineerId: t.backupEngineerId,
    retiredAt: iso(t.retiredAt),
    version: t.version,
  };
}

export async function getToolForEdit(id: number) {
  const tool = await Tool.findByPk(id);
  if (!tool) throw notFound('Tool');
  const modules = await ToolModule.findAll({
    where: { toolId: id },
    order: [
      ['sortOrder', 'ASC'],
      ['name', 'ASC'],
    ],
  });
  return { ...presentTool(tool), modules: modules.map(presentModule) };
}

async function activeArea(areaId: number, transaction: Transaction) {
  const area = await Area.findByPk(areaId, { transaction });
  if (!area || area.retiredAt) throw badRequest('Choose an active area.', { areaId: ['Choose an active area.'] });
  return area;
}

export async function createTool(deps: AppDeps, input: ToolCreateInput, actorId: number) {
  return deps.sequelize.transaction(async (transaction) => {
    await activeArea(input.areaId, transaction);
    await checkEngineers(input, transaction);
    const now = new Date();
    const tool = await Tool.create(
      {
        areaId: input.areaId,
        name: input.name,
        code: input.code,
        description: input.description ?? null,
        criticality: input.criticality ?? 'normal',
        primaryEngineerId: input.primaryEngineerId ?? null,
        backupEngineerId: input.backupEngineerId ?? null,
        retiredAt: null,
      },
      { transaction },
    );
    await openInitialState(tool.id, null, now, actorId, transaction);
    for (const [i, m] of (input.modules ?? []).entries()) {
      const mod = await ToolModule.create(
        { toolId: tool.id, name: m.name, code: m.code, sortOrder: m.sortOrder ?? i, retiredAt: null },
        { transaction },
      );
      await openInitialState(tool.id, mod.id, now, actorId, transaction);
    }
    announce(deps, tool.id, transaction);
    const modules = await ToolModule.findAll({ where: { toolId: tool.id }, order: [['sortOrder', 'ASC']], transaction });
    return { ...presentTool(tool), modules: modules.map(presentModule) };
  });
}

/**
 * Edits a tool. The editor sends the version it started from; if someone saved in between,
 * the answer is 409 and nothing changes. Retiring puts the tool Offline first (closing its
 * log with a final interval) and then freezes it; its history stays.
 */
export async function updateTool(deps: AppDeps, id: number, input: ToolUpdateInput, actorId: number) {
  return deps.sequelize.transaction(async (transaction) => {
    const tool = await Tool.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!tool) throw notFound('Tool');
    if (tool.version !== input.version)
      throw new AppError(409, 'stale_version', 'Someone else changed this tool in the meantime. Reload to see their change.');
    const { version: _version, retired, ...fields } = input;
    if (fields.areaId !== undefined && fields.areaId !== tool.areaId) await activeArea(fields.areaId, transaction);
    const primaryEngineerId = fields.primaryEngineerId === undefined ? tool.primaryEngineerId : fields.primaryEngineerId;
    const backupEngineerId = fields.backupEngineerId === undefined ? tool.backupEngineerId : fields.backupEngineerId;
    if (primaryEngineerId && primaryEngineerId === backupEngineerId) {
      throw badRequest('The backup engineer must be someone other than the primary.', {
        backupEngineerId: ['Choose someone other than the primary engineer.'],
      });
    }
    await checkEngineers(fields, transaction);

    if (retired === true && !tool.retiredAt) {
      await changeState(
        deps,
        { toolId: tool.id, state: 'non_scheduled', reason: 'not_staffed', note: 'Retired from service', actorId, source: 'staff' },
        transaction,
      );
      tool.retiredAt = new Date();
    } else if (retired === false && tool.retiredAt) {
      tool.retiredAt = null;
    }
    tool.set({ ...fields, description: fields.description === undefined ? tool.description : fields.description });
    await tool.save({ transaction });
    announce(deps, tool.id, transaction);
    return getToolForEditIn(tool.id, transaction);
  });
}

async function getToolForEditIn(id: number, transaction: Transaction) {
  const tool = await Tool.findByPk(id, { transaction });
  const modules = await ToolModule.findAll({
    where: { toolId: id },
    order: [
      ['sortOrder', 'ASC'],
      ['name', 'ASC'],
    ],
    transaction,
  });
  return { ...presentTool(tool!), modules: modules.map(presentModule) };
}

export async function createModule(deps: AppDeps, toolId: number, input: ModuleCreateInput, actorId: number) {
  return deps.sequelize.transaction(async (transaction) => {
    const tool = await Tool.findByPk(toolId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!tool) throw notFound('Tool');
    if (tool.retiredAt) throw new AppError(409, 'tool_retired', 'This tool is retired; it takes no new modules.');
    const count = await ToolModule.count({ where: { toolId }, transaction });
    const mod = await ToolModule.create(
      { toolId, name: input.name, code: input.code, sortOrder: input.sortOrder ?? count, retiredAt: null },
      { transaction },
    );
    await openInitialState(toolId, mod.id, new Date(), actorId, transaction);
    announce(deps, toolId, transaction);
    return presentModule(mod);
  });
}

export async function updateModule(deps: AppDeps, id: number, input: ModuleUpdateInput) {
  return deps.sequelize.transaction(async (transaction) => {
    const mod = await ToolModule.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!mod) throw notFound('Module');
    const { retired, ...fields } = input;
    if (retired === true && !mod.retiredAt) mod.retiredAt = new Date();
    else if (retired === false) mod.retiredAt = null;
    mod.set(fields);
    await mod.save({ transaction });
    announce(deps, mod.toolId, transaction);
    return presentModule(mod);
  });
}

// ---- Tool page ---------------------------------------------------------------------------

const DAY_MS = 24 * 60 * 60 * 1000;

/** An engineer as the tool page shows them: staff see the e-mail address, members the name only. */
function person(u: Person | undefined | null, viewerIsStaff: boolean): PersonRef | null {
  if (!u) return null;
  return viewerIsStaff ? { id: u.id, name: u.name, email: u.email } : { id: u.id, name: u.name };
}

export async function findToolIdByCode(code: string): Promise<number> {
  const tool = await Tool.findOne({ where: { code }, attributes: ['id'] });
  if (!tool) throw notFound('Tool');
  return tool.id;
}

/** Everything the tool page shows at the top: state, people, modules, 30-day availability. */
export async function getToolDetail(deps: AppDeps, code: string, viewer: AuthUser): Promise<ToolDetail> {
  const viewerIsStaff = isStaff(viewer.role);
  const tool = await Tool.findOne({ where: { code }, include: [{ model: Area, as: 'area', attributes: ['id', 'name', 'code'] }] });
  if (!tool) throw notFound('Tool');
  const now = new Date();
  const from = new Date(now.getTime() - 30 * DAY_MS);
  const [entries, people, follow, availability, setBy] = await Promise.all([
    loadBoardTools(deps.sequelize, { toolIds: [tool.id], includeRetired: true }),
    peopleByIds([tool.primaryEngineerId, tool.backupEngineerId]),
    ToolFollow.findOne({ where: { userId: viewer.id, toolId: tool.id }, attributes: ['userId'] }),
    availabilityForPeriod(deps.sequelize, { from, to: now, toolIds: [tool.id] }),
    openStateSetter(deps.sequelize, tool.id),
  ]);
  const entry = entries[0];
  const area = (tool as Tool & { area: Area }).area;
  const byId = people;
  return {
    ...entry,
    description: tool.description,
    area: { id: area.id, code: area.code, name: area.name },
    primaryEngineer: person(tool.primaryEngineerId ? byId.get(tool.primaryEngineerId) : null, viewerIsStaff),
    backupEngineer: person(tool.backupEngineerId ? byId.get(tool.backupEngineerId) : null, viewerIsStaff),
    retiredAt: iso(tool.retiredAt),
    following: Boolean(follow),
    availability30d: availability.get(tool.id)!,
    setBy,
    allowedActions: allowedToolActions(viewer, tool),
  };
}

/** A state log entry as SQL returns it, before dates become ISO strings and the setter a reference. */
type HistoryRow = Omit<HistoryEntry, 'startedAt' | 'endedAt' | 'expectedReturnAt' | 'confirmed' | 'setBy' | 'previousState'> & {
  startedAt: Date;
  endedAt: Date | null;
  expectedReturnAt: Date | null;
  /** MariaDB's BOOLEAN is a TINYINT. */
  confirmed: number;
  setById: number | null;
  setByName: string | null;
};

/**
 * The state each entry replaced: the one before it in its own log (tool or module), by start
 * time then id. A page is one stretch of the tool's log, so within each module the page's
 * entries follow one another and only each module's oldest entry on the page needs one seek
 * further back: the cost is the page's, not the history's.
 */
async function previousStates(
  deps: AppDeps,
  toolId: number,
  rows: { id: number; moduleKey: number; state: HistoryRow['state']; startedAt: Date }[],
) {
  const previous = new Map<number, HistoryRow['state']>();
  const byModule = new Map<number, typeof rows>();
  for (const r of rows) byModule.set(Number(r.moduleKey), [...(byModule.get(Number(r.moduleKey)) ?? []), r]);
  await Promise.all(
    [...byModule].map(async ([moduleKey, entries]) => {
      for (let i = 0; i + 1 < entries.length; i++) previous.set(Number(entries[i].id), entries[i + 1].state);
      const oldest = entries[entries.length - 1];
      const [before] = await deps.sequelize.query<{ state: HistoryRow['state'] }>(
        `SELECT p.state FROM state_intervals p
          WHERE p.tool_id = :toolId AND p.module_key = :moduleKey AND p.started_at <= :startedAt
            AND (p.started_at < :startedAt OR p.id < :id)
          ORDER BY p.started_at DESC, p.id DESC LIMIT 1`,
        { type: QueryTypes.SELECT, replacements: { toolId, moduleKey, startedAt: oldest.startedAt, id: oldest.id } },
      );
      if (before) previous.set(Number(oldest.id), before.state);
    }),
  );
  return previous;
}

/**
 * The state log of a tool and its modules, newest first, a page at a time. Each entry names
 * the state it replaced (from → to), who set it and when.
 */
export async function getToolHistory(deps: AppDeps, toolId: number, query: HistoryQuery): Promise<Page<HistoryEntry>> {
  const tool = await Tool.findByPk(toolId, { attributes: ['id'] });
  if (!tool) throw notFound('Tool');
  const replacements: Record<string, unknown> = { toolId, limit: query.limit, offset: query.offset };
  let scope = '';
  if (query.moduleId !== undefined) {
    scope = 'AND p.module_key = :moduleKey';
    replacements.moduleKey = query.moduleId === 'tool' ? 0 : query.moduleId;
  }
  const [rows, totals] = await Promise.all([
    // The page's ids first, read from the index newest first (the hint: MariaDB otherwise
    // sorts the whole history), then only those rows.
    deps.sequelize.query<HistoryRow & { moduleKey: number }>(
      `SELECT si.id, si.module_id AS moduleId, si.module_key AS moduleKey, m.name AS moduleName, si.state,
              si.reason, si.note, si.restriction, si.started_at AS startedAt, si.ended_at AS endedAt,
              si.expected_return_at AS expectedReturnAt, si.ticket_id AS ticketId, si.source, si.confirmed,
              si.set_by_id AS setById, u.name AS setByName
         FROM (SELECT p.id FROM state_intervals p FORCE INDEX (${scope ? 'state_tool_time' : 'state_tool_history'})
                WHERE p.tool_id = :toolId ${scope} ORDER BY p.started_at DESC, p.id DESC LIMIT :limit OFFSET :offset) page
         JOIN state_intervals si ON si.id = page.id
         LEFT JOIN modules m ON m.id = si.module_id
         LEFT JOIN users u ON u.id = si.set_by_id
        ORDER BY si.started_at DESC, si.id DESC`,
      { type: QueryTypes.SELECT, replacements },
    ),
    deps.sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM state_intervals p WHERE p.tool_id = :toolId ${scope}`, {
      type: QueryTypes.SELECT,
      replacements,
    }),
  ]);
  const previous = await previousStates(deps, toolId, rows);
  return {
    items: rows.map((r) => ({
      id: Number(r.id),
      moduleId: r.moduleId,
      moduleName: r.moduleName,
      state: r.state,
      previousState: previous.get(Number(r.id)) ?? null,
      reason: r.reason,
      note: r.note,
      restriction: r.restriction,
      startedAt: r.startedAt.toISOString(),
      endedAt: iso(r.endedAt),
      expectedReturnAt: iso(r.expectedReturnAt),
      ticketId: r.ticketId,
      source: r.source,
      confirmed: Boolean(r.confirmed),
      setBy: r.setById ? { id: r.setById, name: r.setByName ?? 'Someone' } : null,
    })),
    total: Number(totals[0].n),
    limit: query.limit,
    offset: query.offset,
  };
}

/** A technician's state change from the API: the request's words become the change. */
export async function setToolState(deps: AppDeps, toolId: number, input: StateChangeInput, actor: AuthUser) {
  const tool = await findTool(toolId);
  if (!tool) throw notFound('Tool');
  authorizeToolAction(actor, tool, 'change_state');
  if (input.ticketId) {
    if ((await ticketToolId(input.ticketId)) !== toolId)
      throw badRequest('That ticket is not about this tool.', { ticketId: ['Choose a ticket about this tool.'] });
  }
  const result = await requestStateChange(deps, toolId, input, { actorId: actor.id, ticketId: input.ticketId });
  const [entry] = await loadBoardTools(deps.sequelize, { toolIds: [toolId], includeRetired: true });
  return {
    interval: {
      id: Number(result.current.id),
      moduleId: result.current.moduleId,
      state: result.current.state,
      previousState: result.previous?.state ?? null,
      reason: result.current.reason,
      note: result.current.note,
      startedAt: result.current.startedAt.toISOString(),
      expectedReturnAt: iso(result.current.expectedReturnAt),
    },
    tool: entry,
  };
}
