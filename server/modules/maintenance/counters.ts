import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

// Usage counters (wafers, run hours) as maintenance plans read them. This is the one place
// that knows where readings are stored: today the usage_readings table; when the equipment
// ingest keeps its own counters, only this function changes.

/** The latest reading of a tool's counter, or null when it has none. */
export async function counterReading(
  sequelize: Sequelize,
  toolId: number,
  counterName: string,
  transaction?: Transaction,
): Promise<number | null> {
  const [row] = await sequelize.query<{ value: number }>(
    `SELECT value FROM usage_readings WHERE tool_id = :toolId AND counter = :counterName ORDER BY at DESC, id DESC LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { toolId, counterName }, transaction },
  );
  return row ? Number(row.value) : null;
}

export async function recordCounterReading(
  sequelize: Sequelize,
  toolId: number,
  counter: string,
  value: number,
  at: Date,
  transaction?: Transaction,
) {
  await sequelize.query(`INSERT INTO usage_readings (tool_id, counter, value, at) VALUES (:toolId, :counter, :value, :at)`, {
    replacements: { toolId, counter, value, at },
    transaction,
  });
}

/** The latest reading of every counter of the given tools, keyed `${toolId}|${counter}` (for lists). */
export async function latestReadings(sequelize: Sequelize, toolIds: number[], transaction?: Transaction): Promise<Map<string, number>> {
  const map = new Map<string, number>();
  if (toolIds.length === 0) return map;
  const rows = await sequelize.query<{ toolId: number; counter: string; value: number }>(
    `SELECT r.tool_id AS toolId, r.counter, r.value FROM usage_readings r
       JOIN (SELECT tool_id, counter, MAX(at) AS at FROM usage_readings WHERE tool_id IN (:toolIds) GROUP BY tool_id, counter) m
         ON m.tool_id = r.tool_id AND m.counter = r.counter AND m.at = r.at
      ORDER BY r.id`,
    { type: QueryTypes.SELECT, replacements: { toolIds: [...new Set(toolIds)] }, transaction },
  );
  for (const r of rows) map.set(`${r.toolId}|${r.counter}`, Number(r.value));
  return map;
}

export const readingKey = (toolId: number, counter: string) => `${toolId}|${counter}`;
