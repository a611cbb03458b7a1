import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import type { AppDeps } from '../../lib/http';
import { counterKey, ingestCounterReadings, runningCounters } from '../alarms/counters.service';

// Usage counters (wafers, run hours) as maintenance plans read them. The readings belong to
// the equipment ingest (alarms module, counter_readings); this is the one place that asks it.
// Plans compare running totals (the counter plus what each reset wiped out), so a counter
// reset never makes use go back: a plan's basis and due reading stay in that one scale, which
// equals the tool's own counter until its first reset.

/** The running total of a tool's counter, or null when it has no reading. */
export async function counterReading(
  deps: AppDeps,
  toolId: number,
  counterName: string,
  transaction?: Transaction,
): Promise<number | null> {
  return (await runningCounters(deps, [toolId], transaction)).get(counterKey(toolId, counterName)) ?? null;
}

/** A reading typed in by a person (POST /api/tools/:toolId/counter-readings), stored as the ingest stores any. */
export async function recordCounterReading(deps: AppDeps, toolId: number, counter: string, value: number, at: Date) {
  await ingestCounterReadings(deps, toolId, [{ id: `manual-${randomUUID()}`, counter, value, at: at.toISOString() }]);
}

/** The running total of every counter of the given tools, keyed `${toolId}|${counter}` (for lists). */
export async function latestReadings(deps: AppDeps, toolIds: number[], transaction?: Transaction): Promise<Map<string, number>> {
  return runningCounters(deps, toolIds, transaction);
}

export const readingKey = counterKey;
