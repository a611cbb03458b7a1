import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { E10_STATES, type E10State } from '../../../shared/equipment-state';
import type { AvailabilityFigure } from '../../../shared/schemas/facility';

// Time in each E10 state over a period, computed in SQL by clipping every interval of the
// tool's own log (module_key 0) to the period. Modules have logs of their own; the tool's
// availability is about the tool's state, as E10 measures equipment, not its parts.

export interface PeriodQuery {
  from: Date;
  /** Clipped to now: the open interval has not run beyond the present. */
  to: Date;
  /** Absent for every tool. */
  toolIds?: number[];
}

/** States that count against availability: E10 downtime plus non-scheduled time. */
export const NOT_AVAILABLE: readonly E10State[] = ['scheduled_downtime', 'unscheduled_downtime', 'non_scheduled'];

const emptyByState = () => Object.fromEntries(E10_STATES.map((s) => [s, 0])) as Record<E10State, number>;

/** Milliseconds per tool and state within [from, to). Tools with no time in the period are absent. */
export async function stateTimeInPeriod(
  sequelize: Sequelize,
  period: PeriodQuery,
  transaction?: Transaction,
): Promise<Map<number, Record<E10State, number>>> {
  const to = new Date(Math.min(period.to.getTime(), Date.now()));
  const result = new Map<number, Record<E10State, number>>();
  if (to <= period.from || (period.toolIds && period.toolIds.length === 0)) return result;
  const rows = await sequelize.query<{ toolId: number; state: E10State; ms: number }>(
    `SELECT tool_id AS toolId, state,
            SUM(TIMESTAMPDIFF(MICROSECOND, GREATEST(started_at, :from), LEAST(COALESCE(ended_at, :to), :to))) DIV 1000 AS ms
       FROM state_intervals
      WHERE module_key = 0
        AND started_at < :to
        AND (ended_at IS NULL OR ended_at > :from)
        ${period.toolIds ? 'AND tool_id IN (:toolIds)' : ''}
      GROUP BY tool_id, state`,
    { type: QueryTypes.SELECT, replacements: { from: period.from, to, toolIds: period.toolIds ?? [] }, transaction },
  );
  for (const row of rows) {
    let byState = result.get(row.toolId);
    if (!byState) result.set(row.toolId, (byState = emptyByState()));
    byState[row.state] = Number(row.ms);
  }
  return result;
}

/** Turns time per state into the availability figure shown on the tool page. */
export function availabilityFrom(byState: Record<E10State, number>, from: Date, to: Date): AvailabilityFigure {
  const coveredMs = E10_STATES.reduce((sum, s) => sum + byState[s], 0);
  const downMs = NOT_AVAILABLE.reduce((sum, s) => sum + byState[s], 0);
  return {
    from: from.toISOString(),
    to: to.toISOString(),
    coveredMs,
    downMs,
    availability: coveredMs > 0 ? (coveredMs - downMs) / coveredMs : null,
    byState,
  };
}

/**
 * Availability per tool over a period: the share of the time the tool existed in the period
 * that was not scheduled downtime, unscheduled downtime or non-scheduled time. Time before a
 * tool was added is not counted against it.
 */
export async function availabilityForPeriod(
  sequelize: Sequelize,
  period: PeriodQuery,
  transaction?: Transaction,
): Promise<Map<number, AvailabilityFigure>> {
  const to = new Date(Math.min(period.to.getTime(), Date.now()));
  const times = await stateTimeInPeriod(sequelize, { ...period, to }, transaction);
  const out = new Map<number, AvailabilityFigure>();
  for (const id of period.toolIds ?? times.keys()) out.set(id, availabilityFrom(times.get(id) ?? emptyByState(), period.from, to));
  return out;
}
