// Turns summed hours and counts into the figures of a report, through the shared E10 and
// MTBF arithmetic, so the server's numbers are the ones the reference tests check.

import { delayKind, type E10State, type StateReason } from '../../../shared/equipment-state';
import {
  crowAmsaa,
  e10Metrics,
  mtbfBounds,
  REVERSE_ARRANGEMENT_MIN_GAPS,
  reverseArrangementCriticalValues,
  type MtbfBounds,
  type ReliabilityTrend,
  type ReverseArrangementCriticalValues,
} from '../../../shared/reliability';
import {
  MTBF_CONFIDENCE,
  TREND_CONFIDENCE,
  type DowntimeDetail,
  type ReliabilityFigures,
  type StateHours,
} from '../../../shared/schemas/analytics';

export const HOUR_MS = 3_600_000;
export const MICROS_PER_HOUR = 3_600_000_000;

export const STATE_KEY: Record<E10State, keyof StateHours> = {
  productive: 'productive',
  standby: 'standby',
  engineering: 'engineering',
  scheduled_downtime: 'scheduledDowntime',
  unscheduled_downtime: 'unscheduledDowntime',
  non_scheduled: 'nonScheduled',
};

/** Summed hours and event counts for one tool, area or the facility. */
export interface Tally {
  hours: StateHours;
  downtime: DowntimeDetail;
  failures: number;
  assists: number;
  downtimeEvents: number;
}

export function emptyStateHours(): StateHours {
  return { productive: 0, standby: 0, engineering: 0, scheduledDowntime: 0, unscheduledDowntime: 0, nonScheduled: 0 };
}

export function emptyTally(): Tally {
  return {
    hours: emptyStateHours(),
    downtime: { maintenanceDelayUser: 0, maintenanceDelaySupplier: 0, facilitiesRelated: 0, outOfSpecInput: 0, repair: 0 },
    failures: 0,
    assists: 0,
    downtimeEvents: 0,
  };
}

// E10 repair time runs from the start of the repair through test and verification, without
// the waits: unscheduled downtime marked as repair, as qualification (the verification after
// a repair) or with no reason given counts as repair.
const REPAIR_REASONS: readonly StateReason[] = ['repair', 'qualification', 'none'];

/** Books hours of one state and reason, including the sub-reasons the E10 figures need. */
export function addHours(tally: Tally, state: E10State, reason: StateReason, hours: number) {
  tally.hours[STATE_KEY[state]] += hours;
  if (state !== 'scheduled_downtime' && state !== 'unscheduled_downtime') return;
  const delay = delayKind(reason);
  if (delay === 'user') tally.downtime.maintenanceDelayUser += hours;
  else if (delay === 'supplier') tally.downtime.maintenanceDelaySupplier += hours;
  else if (reason === 'facilities_related') tally.downtime.facilitiesRelated += hours;
  else if (reason === 'out_of_spec_input') tally.downtime.outOfSpecInput += hours;
  else if (state === 'unscheduled_downtime' && REPAIR_REASONS.includes(reason)) tally.downtime.repair += hours;
}

export function addTally(into: Tally, from: Tally) {
  for (const key of Object.keys(into.hours) as (keyof StateHours)[]) into.hours[key] += from.hours[key];
  for (const key of Object.keys(into.downtime) as (keyof DowntimeDetail)[]) into.downtime[key] += from.downtime[key];
  into.failures += from.failures;
  into.assists += from.assists;
  into.downtimeEvents += from.downtimeEvents;
}

export function uptimeOf(hours: StateHours): number {
  return hours.productive + hours.standby + hours.engineering;
}

// A facility report computes figures for a few hundred tools. The chi-square quantiles and the
// exact reversal distribution behind them cost tens of microseconds each, so they are worked
// out once per failure count (bounds scale with the hours: every limit is hours × a factor
// of r alone) and once per number of gaps.
const mtbfFactors = new Map<number, MtbfBounds>();

/** mtbfBounds for `hours` and `failures`, via the per-hour factors of that failure count. */
export function mtbfBoundsFast(hours: number, failures: number): MtbfBounds {
  let factor = mtbfFactors.get(failures);
  if (!factor) {
    factor = mtbfBounds({ hours: 1, failures, confidence: MTBF_CONFIDENCE, sides: 2 });
    mtbfFactors.set(failures, factor);
  }
  const scale = (v: number | null) => (v === null ? null : v * hours);
  return { point: scale(factor.point), lower: scale(factor.lower), upper: scale(factor.upper) };
}

const criticalValues = new Map<number, ReverseArrangementCriticalValues>();

function criticalFor(gaps: number): ReverseArrangementCriticalValues {
  let values = criticalValues.get(gaps);
  if (!values) {
    values = reverseArrangementCriticalValues(gaps, TREND_CONFIDENCE);
    criticalValues.set(gaps, values);
  }
  return values;
}

/** Pairs i < j with gaps[i] < gaps[j], as shared/reliability.ts counts reversals. */
export function countReversals(gaps: readonly number[]): number {
  let count = 0;
  for (let i = 0; i < gaps.length; i++) {
    for (let j = i + 1; j < gaps.length; j++) if (gaps[i] < gaps[j]) count++;
  }
  return count;
}

/** reverseArrangementsTrend at TREND_CONFIDENCE, with the critical values cached by size. */
export function trendOfGaps(gaps: readonly number[]): { trend: ReliabilityTrend; count: number } {
  const count = countReversals(gaps);
  if (gaps.length < REVERSE_ARRANGEMENT_MIN_GAPS) return { trend: 'insufficient', count };
  const { lower, upper } = criticalFor(gaps.length);
  if (lower !== null && count <= lower) return { trend: 'worsening', count };
  if (upper !== null && count >= upper) return { trend: 'improving', count };
  return { trend: 'none', count };
}

export function figuresOf(tally: Tally): ReliabilityFigures {
  const { hours, downtime } = tally;
  const metrics = e10Metrics({
    productive: hours.productive,
    standby: hours.standby,
    engineering: hours.engineering,
    scheduledDowntime: hours.scheduledDowntime,
    unscheduledDowntime: hours.unscheduledDowntime,
    nonScheduled: hours.nonScheduled,
    maintenanceDelayUser: downtime.maintenanceDelayUser,
    maintenanceDelaySupplier: downtime.maintenanceDelaySupplier,
    outOfSpecInput: downtime.outOfSpecInput,
    facilitiesRelated: downtime.facilitiesRelated,
    repair: downtime.repair,
    failures: tally.failures,
    assists: tally.assists,
    downtimeEvents: tally.downtimeEvents,
  });
  const uptime = metrics.uptime;
  const bounds = mtbfBoundsFast(uptime, tally.failures);
  return {
    totalHours: metrics.totalTime,
    hours: { ...hours },
    downtime: { ...downtime },
    uptimeHours: uptime,
    operationsHours: metrics.operationsTime,
    failures: tally.failures,
    assists: tally.assists,
    downtimeEvents: tally.downtimeEvents,
    availabilityPct: metrics.operationalUptimePct,
    equipmentDependentUptimePct: metrics.equipmentDependentUptimePct,
    supplierDependentUptimePct: metrics.supplierDependentUptimePct,
    mtbf: {
      basis: 'uptime',
      hours: uptime,
      failures: tally.failures,
      point: bounds.point,
      // Without uptime there is nothing to bound.
      lower: uptime > 0 ? bounds.lower : null,
      upper: bounds.upper,
      confidence: MTBF_CONFIDENCE,
    },
    mttrHours: metrics.mttr,
    meanDownHoursPerFailure: tally.failures > 0 ? hours.unscheduledDowntime / tally.failures : null,
    mtolHours: metrics.mtol,
    mtbaHours: tally.assists > 0 ? uptime / tally.assists : null,
  };
}

export interface TrendResult {
  trend: ReliabilityTrend;
  reversals: number | null;
  crowBeta: number | null;
}

/**
 * Trend of one tool's failures over the period: the reverse-arrangement test on the calendar
 * gaps between failure starts (the first gap counted from the start of the period) and the
 * Crow-AMSAA shape over the period's calendar hours.
 */
export function trendOf(failureStarts: readonly number[], fromMs: number, toMs: number): TrendResult {
  const times = failureStarts.map((t) => (t - fromMs) / HOUR_MS);
  const gaps = times.map((t, i) => t - (i === 0 ? 0 : times[i - 1]));
  const periodHours = (toMs - fromMs) / HOUR_MS;
  const crow =
    periodHours > 0
      ? crowAmsaa(
          times.filter((t) => t > 0 && t <= periodHours),
          periodHours,
        )
      : null;
  const { trend, count } = trendOfGaps(gaps);
  return { trend, reversals: gaps.length > 0 ? count : null, crowBeta: crow ? crow.beta : null };
}
