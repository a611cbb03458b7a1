// How a period is read: whole calendar months (UTC) come from the monthly rollup
// (state_hours_monthly), the partial months at either edge from the raw state log. Each raw
// segment lies inside one month, so the monthly chart can put it in its bucket directly.

export interface Segment {
  from: Date;
  to: Date;
}

export interface MonthBucket {
  /** Months since year 0 (year × 12 + month index): the key the SQL groups by. */
  serial: number;
  start: Date;
  /** The part of the month inside the period. */
  from: Date;
  to: Date;
}

export interface PeriodPlan {
  from: Date;
  /** The requested end, clipped to now: open intervals have not run beyond the present. */
  to: Date;
  rollup: Segment | null;
  raw: Segment[];
  months: MonthBucket[];
}

export function monthStart(date: Date): Date {
  return new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), 1));
}

export function addMonths(month: Date, count: number): Date {
  return new Date(Date.UTC(month.getUTCFullYear(), month.getUTCMonth() + count, 1));
}

export function monthSerial(date: Date): number {
  return date.getUTCFullYear() * 12 + date.getUTCMonth();
}

function monthCeil(date: Date): Date {
  const start = monthStart(date);
  return start.getTime() === date.getTime() ? start : addMonths(start, 1);
}

const later = (a: Date, b: Date) => (a.getTime() >= b.getTime() ? a : b);
const earlier = (a: Date, b: Date) => (a.getTime() <= b.getTime() ? a : b);

/** Splits [from, min(to, now)) into a rollup part and raw edges. Empty when it starts after now. */
export function planPeriod(from: Date, requestedTo: Date, now: Date): PeriodPlan {
  const to = earlier(requestedTo, now);
  if (to.getTime() <= from.getTime()) return { from, to: from, rollup: null, raw: [], months: [] };

  const headEnd = earlier(monthCeil(from), to);
  const rollupTo = later(monthStart(to), headEnd);
  const raw: Segment[] = [];
  if (from < headEnd) raw.push({ from, to: headEnd });
  const rollup = headEnd < rollupTo ? { from: headEnd, to: rollupTo } : null;
  if (rollupTo < to) raw.push({ from: rollupTo, to });

  const months: MonthBucket[] = [];
  for (let m = monthStart(from); m < to; m = addMonths(m, 1)) {
    months.push({ serial: monthSerial(m), start: m, from: later(m, from), to: earlier(addMonths(m, 1), to) });
  }
  return { from, to, rollup, raw, months };
}
