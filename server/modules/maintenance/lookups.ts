import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { notFound } from '../../lib/errors';

// Small reads of other modules' data this module needs (tool names, engineers, followers).
// Read-only SQL rather than other modules' models, so those stay private to their modules.

export interface ToolInfo {
  id: number;
  code: string;
  name: string;
  areaId: number;
  primaryEngineerId: number | null;
  backupEngineerId: number | null;
  retiredAt: Date | null;
}

export async function toolInfo(sequelize: Sequelize, toolId: number, transaction?: Transaction): Promise<ToolInfo> {
  const [row] = await sequelize.query<ToolInfo>(
    `SELECT id, code, name, area_id AS areaId, primary_engineer_id AS primaryEngineerId,
            backup_engineer_id AS backupEngineerId, retired_at AS retiredAt
       FROM tools WHERE id = :toolId`,
    { type: QueryTypes.SELECT, replacements: { toolId }, transaction },
  );
  if (!row) throw notFound('That tool');
  return row;
}

/** The module belongs to the tool (or is null). */
export async function moduleBelongs(sequelize: Sequelize, toolId: number, moduleId: number | null, transaction?: Transaction) {
  if (moduleId === null) return true;
  const rows = await sequelize.query(`SELECT id FROM modules WHERE id = :moduleId AND tool_id = :toolId AND retired_at IS NULL`, {
    type: QueryTypes.SELECT,
    replacements: { toolId, moduleId },
    transaction,
  });
  return rows.length > 0;
}

export interface Person {
  userId: number;
  email: string;
  name: string;
}

export async function followersOf(
  sequelize: Sequelize,
  toolId: number,
  exceptUserId: number | null,
  transaction: Transaction,
): Promise<Person[]> {
  return sequelize.query<Person>(
    `SELECT f.user_id AS userId, u.email, u.name FROM tool_follows f JOIN users u ON u.id = f.user_id
      WHERE f.tool_id = :toolId AND u.active = 1 AND f.user_id <> :except`,
    { type: QueryTypes.SELECT, replacements: { toolId, except: exceptUserId ?? 0 }, transaction },
  );
}

/** Active primary and backup engineers of the given tools. */
export async function engineersOf(sequelize: Sequelize, toolIds: number[], transaction: Transaction): Promise<Person[]> {
  if (toolIds.length === 0) return [];
  return sequelize.query<Person>(
    `SELECT DISTINCT u.id AS userId, u.email, u.name FROM tools t
       JOIN users u ON u.id IN (t.primary_engineer_id, t.backup_engineer_id)
      WHERE t.id IN (:toolIds) AND u.active = 1`,
    { type: QueryTypes.SELECT, replacements: { toolIds }, transaction },
  );
}

/** The tool's (or module's) open state, to know whether a work order holds it in downtime. */
export async function openState(sequelize: Sequelize, toolId: number, moduleId: number | null, transaction?: Transaction) {
  const [row] = await sequelize.query<{ state: string; reason: string }>(
    `SELECT state, reason FROM state_intervals WHERE tool_id = :toolId AND module_key = :moduleKey AND open_flag = 1`,
    { type: QueryTypes.SELECT, replacements: { toolId, moduleKey: moduleId ?? 0 }, transaction },
  );
  return row ?? null;
}
