import { Op, QueryTypes } from 'sequelize';
import { CounterReading } from './alarms.model';
import { ingestTransaction, lockToolSettings } from './ingest.service';
import type { AppDeps } from '../../lib/http';
import type { IngestAnswer } from '../../../shared/schemas/alarms';

// Usage counters (wafers, run hours, custom) as cumulative readings. A reading lower than the
// one before it in time is a reset of the counter, recorded as such — never negative use.
// Other modules (maintenance plans, MCBF) read them through latestCounter / counterReadingsSince
// / usageSince below.

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
