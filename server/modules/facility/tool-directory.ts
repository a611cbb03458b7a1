import { Op, literal, where as where_, type Transaction } from 'sequelize';
import { Tool, ToolModule, Area } from './facility.model';
import { likePattern } from '../../lib/like-pattern';
import type { Criticality } from '../../../shared/priority';
import { searchKey, sqlSearchKey } from '../../../shared/search';

// What other modules may ask of the facility about tools and modules. The state log has its
// own interface in state.service.ts.

export interface ToolFacts {
  id: number;
  code: string;
  name: string;
  areaId: number;
  criticality: Criticality;
  primaryEngineerId: number | null;
  backupEngineerId: number | null;
  retiredAt: Date | null;
}

export interface ModuleRef {
  id: number;
  code: string;
  name: string;
}

const FACTS = ['id', 'code', 'name', 'areaId', 'criticality', 'primaryEngineerId', 'backupEngineerId', 'retiredAt'] as const;
const facts = (t: Tool): ToolFacts => ({
  id: t.id,
  code: t.code,
  name: t.name,
  areaId: t.areaId,
  criticality: t.criticality,
  primaryEngineerId: t.primaryEngineerId,
  backupEngineerId: t.backupEngineerId,
  retiredAt: t.retiredAt,
});

export async function findTool(id: number, transaction?: Transaction): Promise<ToolFacts | null> {
  const t = await Tool.findByPk(id, { attributes: [...FACTS], transaction });
  return t ? facts(t) : null;
}

/**
 * Locks the tool row for the rest of the transaction. Everything that changes a tool's tickets
 * or states locks the tool first, so such changes queue up in one order and never deadlock.
 */
export async function lockTool(id: number, transaction: Transaction): Promise<ToolFacts | null> {
  const t = await Tool.findByPk(id, { attributes: [...FACTS], transaction, lock: transaction.LOCK.UPDATE });
  return t ? facts(t) : null;
}

/** True when the module belongs to the tool and is not retired. */
export async function isActiveModuleOf(toolId: number, moduleId: number, transaction?: Transaction): Promise<boolean> {
  return (await ToolModule.count({ where: { id: moduleId, toolId, retiredAt: null }, transaction })) > 0;
}

/** The primary and backup engineer ids of the given tools (no duplicates). */
export async function engineerIdsOf(toolIds: readonly number[], transaction?: Transaction): Promise<number[]> {
  if (toolIds.length === 0) return [];
  const rows = await Tool.findAll({ where: { id: [...toolIds] }, attributes: ['primaryEngineerId', 'backupEngineerId'], transaction });
  return [...new Set(rows.flatMap((t) => [t.primaryEngineerId, t.backupEngineerId]).filter((id): id is number => id !== null))];
}

/** The modules in service of each tool, in board order. */
export async function activeModules(toolIds: readonly number[]): Promise<Map<number, ModuleRef[]>> {
  const byTool = new Map<number, ModuleRef[]>();
  if (toolIds.length === 0) return byTool;
  const rows = await ToolModule.findAll({
    where: { toolId: [...toolIds], retiredAt: null },
    order: [
      ['sortOrder', 'ASC'],
      ['id', 'ASC'],
    ],
    attributes: ['id', 'toolId', 'code', 'name'],
  });
  for (const m of rows) {
    const list = byTool.get(m.toolId) ?? [];
    list.push({ id: m.id, code: m.code, name: m.name });
    byTool.set(m.toolId, list);
  }
  return byTool;
}

/** Tools to pick on the report form (by search text, exact code from a QR label, or id). */
export async function toolChoices(query: { q?: string; code?: string; id?: number; limit: number }) {
  // The shared search rule (shared/search.ts) in SQL: code, name and bay name, ignoring case and separators.
  const needle = query.q ? searchKey(query.q) : '';
  const where = {
    retiredAt: null,
    ...(query.id ? { id: query.id } : {}),
    ...(query.code ? { code: query.code.toUpperCase() } : {}),
    ...(needle
      ? {
          [Op.or]: ['`Tool`.`code`', '`Tool`.`name`', '`area`.`name`'].map((column) =>
            where_(literal(sqlSearchKey(column)), Op.like, likePattern(needle)),
          ),
        }
      : {}),
  };
  const tools = await Tool.findAll({
    where,
    include: [{ model: Area, as: 'area', attributes: ['id', 'name'] }],
    attributes: ['id', 'code', 'name', 'areaId'],
    order: [['name', 'ASC']],
    limit: query.limit,
  });
  const modules = await activeModules(tools.map((t) => t.id));
  return {
    items: tools.map((t) => ({
      id: t.id,
      code: t.code,
      name: t.name,
      areaName: (t as Tool & { area?: Area }).area?.name ?? null,
      modules: modules.get(t.id) ?? [],
    })),
  };
}
