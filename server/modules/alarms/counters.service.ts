import { Op, QueryTypes, type Transaction } from 'sequelize';
import { CounterReading } from './alarms.model';
import { ingestTransaction, lockToolSettings } from './ingest.service';
import type { AppDeps } from '../../lib/http';
import type { IngestAnswer } from '../../../shared/schemas/alarms';

// Usage counters (wafers, run hours, custom) as cumulative readings. A reading lower than the
// one before it in time is a reset of the counter, recorded as such — never negative use.
// Other modules read them only through this file: latestCounter / counterReadingsSince /
// usageSince, runningCounters (maintenance plans) and counterUsageByTool (MCBF); manual
// readings are written through ingestCounterReadings like any other.

export interface CounterReadingInput {
  id: string;
  counter: string;
  value: number;
  at: string;
}

export async function ingestCounterReadings(
  deps: AppDeps,
  toolId: number,
  readings: readonly CounterReadingInput[],
  now = new Date(),
): Promise<IngestAnswer> {
  return ingestTransaction(deps, toolId, async (transaction) => {
    await lockToolSettings(toolId, transaction);
    const ids = [...new Set(readings.map((r) => r.id))];
    const existing = await CounterReading.findAll({ where: { toolId, senderId: ids }, attributes: ['senderId'], transaction });
    const seen = new Set(existing.map((r) => r.senderId));
    const fresh: CounterReadingInput[] = [];
    for (const r of readings) {
      if (seen.has(r.id)) continue;
      seen.add(r.id);
      fresh.push(r);
    }
    if (fresh.length) {
      await CounterReading.bulkCreate(
        fresh.map((r) => ({
          toolId,
          senderId: r.id,
          counter: r.counter,
          value: r.value,
          at: new Date(r.at),
          isReset: false,
          receivedAt: now,
        })),
        { transaction },
      );
      // Re-mark resets from the earliest new reading on, per counter (readings may come late).
      const byCounter = new Map<string, number>();
      for (const r of fresh) byCounter.set(r.counter, Math.min(byCounter.get(r.counter) ?? Infinity, Date.parse(r.at)));
      for (const [counter, fromMs] of byCounter) {
        const from = new Date(fromMs);
        const before = await CounterReading.findOne({
          where: { toolId, counter, at: { [Op.lt]: from } },
          order: [
            ['at', 'DESC'],
            ['id', 'DESC'],
          ],
          transaction,
        });
        const series = await CounterReading.findAll({
          where: { toolId, counter, at: { [Op.gte]: from } },
          order: [
            ['at', 'ASC'],
            ['id', 'ASC'],
          ],
          transaction,
        });
        let previous = before?.value ?? null;
        for (const row of series) {
          const isReset = previous !== null && row.value < previous;
          if (row.isReset !== isReset) await row.update({ isReset }, { transaction });
          previous = row.value;
        }
      }
    }
    return { accepted: fresh.length, duplicates: readings.length - fresh.length };
  });
}

export interface CounterPoint {
  value: number;
  at: Date;
  isReset: boolean;
}

/** The latest reading of a tool's counter (by the tool's time), or null if it never sent one. */
export async function latestCounter(toolId: number, counter: string): Promise<CounterPoint | null> {
  const row = await CounterReading.findOne({
    where: { toolId, counter },
    order: [
      ['at', 'DESC'],
      ['id', 'DESC'],
    ],
  });
  return row ? { value: row.value, at: row.at, isReset: row.isReset } : null;
}

/** Readings of a tool's counter at or after `since`, oldest first (at most `limit`). */
export async function counterReadingsSince(toolId: number, counter: string, since: Date, limit = 10_000): Promise<CounterPoint[]> {
  const rows = await CounterReading.findAll({
    where: { toolId, counter, at: { [Op.gte]: since } },
    order: [
      ['at', 'ASC'],
      ['id', 'ASC'],
    ],
    limit,
  });
  return rows.map((r) => ({ value: r.value, at: r.at, isReset: r.isReset }));
}

/**
 * Use since a time (wafers processed, run hours): the sum of increases between readings,
 * where a reset counts its new value as use since the reset.
 */
export async function usageSince(deps: AppDeps, toolId: number, counter: string, since: Date): Promise<number> {
  const rows = await deps.sequelize.query<{ value: number; isReset: number }>(
    `(SELECT value, is_reset AS isReset, at, id FROM counter_readings WHERE tool_id = :toolId AND counter = :counter AND at < :since ORDER BY at DESC, id DESC LIMIT 1)
     UNION ALL
     (SELECT value, is_reset AS isReset, at, id FROM counter_readings WHERE tool_id = :toolId AND counter = :counter AND at >= :since)
     ORDER BY at, id`,
    { replacements: { toolId, counter, since }, type: QueryTypes.SELECT },
  );
  let used = 0;
  for (let i = 1; i < rows.length; i++)
    used += Number(rows[i].isReset) ? Number(rows[i].value) : Number(rows[i].value) - Number(rows[i - 1].value);
  return used;
}

/**
 * The running total of each asked counter: its latest value plus, for every reset, the value
 * the counter had just before it. It never goes back, so the difference of two running totals
 * is the use between them (as usageSince counts it) even across resets. Keyed
 * `${toolId}|${counter}`; a counter that never sent a reading is missing.
 */
export async function runningCounters(
  deps: AppDeps,
  toolIds: readonly number[],
  transaction?: Transaction | null,
): Promise<Map<string, number>> {
  const totals = new Map<string, number>();
  if (toolIds.length === 0) return totals;
  const ids = [...new Set(toolIds)];
  const latest = await deps.sequelize.query<{ toolId: number; counter: string; value: number }>(
    `SELECT r.tool_id AS toolId, r.counter, r.value FROM counter_readings r
       JOIN (SELECT tool_id, counter, MAX(at) AS at FROM counter_readings WHERE tool_id IN (:ids) GROUP BY tool_id, counter) m
         ON m.tool_id = r.tool_id AND m.counter = r.counter AND m.at = r.at
      ORDER BY r.id`,
    { type: QueryTypes.SELECT, replacements: { ids }, transaction },
  );
  for (const r of latest) totals.set(counterKey(r.toolId, r.counter), Number(r.value));
  // Resets are rare: add the value each reset wiped out.
  const carried = await deps.sequelize.query<{ toolId: number; counter: string; carried: number | null }>(
    `SELECT x.toolId, x.counter, SUM(x.before_reset) AS carried FROM (
       SELECT r.tool_id AS toolId, r.counter,
              (SELECT p.value FROM counter_readings p
                WHERE p.tool_id = r.tool_id AND p.counter = r.counter AND (p.at < r.at OR (p.at = r.at AND p.id < r.id))
                ORDER BY p.at DESC, p.id DESC LIMIT 1) AS before_reset
         FROM counter_readings r WHERE r.tool_id IN (:ids) AND r.is_reset = 1) x
     GROUP BY x.toolId, x.counter`,
    { type: QueryTypes.SELECT, replacements: { ids }, transaction },
  );
  for (const c of carried) {
    const key = counterKey(c.toolId, c.counter);
    if (totals.has(key)) totals.set(key, totals.get(key)! + Number(c.carried ?? 0));
  }
  return totals;
}

export const counterKey = (toolId: number, counter: string) => `${toolId}|${counter}`;

/**
 * Use of one counter within [from, to) per tool that sent readings in that period: the sum of
 * increases between the period's readings, where a reset counts its new value (for MCBF).
 */
export async function counterUsageByTool(
  deps: AppDeps,
  counter: string,
  period: { from: Date; to: Date; toolId?: number },
): Promise<{ toolId: number; used: number }[]> {
  const rows = await deps.sequelize.query<{ toolId: number; used: number | null }>(
    `SELECT toolId, SUM(CASE WHEN prev IS NULL THEN 0 WHEN isReset = 1 THEN value ELSE value - prev END) AS used FROM (
       SELECT tool_id AS toolId, value, is_reset AS isReset,
              LAG(value) OVER (PARTITION BY tool_id ORDER BY at, id) AS prev
         FROM counter_readings
        WHERE counter = :counter AND at >= :from AND at < :to ${period.toolId ? 'AND tool_id = :toolId' : ''}) x
     GROUP BY toolId`,
    { type: QueryTypes.SELECT, replacements: { counter, from: period.from, to: period.to, toolId: period.toolId ?? 0 } },
  );
  return rows.map((r) => ({ toolId: Number(r.toolId), used: Number(r.used ?? 0) }));
}
