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
