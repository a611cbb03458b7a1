// Pure alarm logic shared by the server, the client and outside checks: the SEMI E5 alarm
// code byte, and the alarm-management figures (chattering, flood, stale, alarm load).
// The defaults are common practice (alarm-management guidance); see docs/ingest-api.md.

/** SEMI E5 ALCD categories (bits 1–7 of the alarm code byte). 0 is "not used" by the standard. */
export const ALARM_CATEGORY_LABELS: Readonly<Record<number, string>> = {
  0: 'Not categorised',
  1: 'Personal safety',
  2: 'Equipment safety',
  3: 'Parameter control warning',
  4: 'Parameter control error',
  5: 'Irrecoverable error',
  6: 'Equipment status warning',
  7: 'Attention flags',
  8: 'Data integrity',
};

/** Categories whose alarms always reach the on-call list and are never held back. */
export const SAFETY_CATEGORIES: readonly number[] = [1, 2];

/** Categories that SEMI E5 allows never to send a clear report. */
export const MAY_NEVER_CLEAR_CATEGORIES: readonly number[] = [5, 7];

/** Bit 8 of ALCD says set (1) or cleared (0); bits 1–7 carry the category. */
export function decodeAlcd(alcd: number): { set: boolean; category: number } {
  if (!Number.isInteger(alcd) || alcd < 0 || alcd > 255) throw new RangeError(`ALCD must be an integer 0–255, got ${alcd}`);
  return { set: (alcd & 0x80) !== 0, category: alcd & 0x7f };
}

export const CHATTER_DEFAULTS = { count: 3, windowMs: 60_000 } as const;
/** A chattering alarm's notifications are held until it has stayed clear this long. */
export const CHATTER_QUIET_MS = 10 * 60_000;
export const FLOOD_PERIOD_MS = 10 * 60_000;
/** More than this many alarms in one 10-minute period is a flood (exactly 10 is not). */
export const FLOOD_THRESHOLD = 10;
export const STALE_AFTER_MS = 24 * 60 * 60_000;

/** True when some `count` of the set times fall within `windowMs` of each other. */
export function isChattering(setTimesMs: number[], opts: { count?: number; windowMs?: number } = {}): boolean {
  const count = opts.count ?? CHATTER_DEFAULTS.count;
  const windowMs = opts.windowMs ?? CHATTER_DEFAULTS.windowMs;
  if (count < 2) return setTimesMs.length >= count;
  const times = [...setTimesMs].sort((a, b) => a - b);
  for (let i = 0; i + count - 1 < times.length; i++) {
    if (times[i + count - 1] - times[i] < windowMs) return true;
  }
  return false;
}

/** An alarm still set more than 24 hours after it was set is stale. */
export function isStale(setAtMs: number, nowMs: number): boolean {
  return nowMs - setAtMs > STALE_AFTER_MS;
}

export interface AlarmLoad {
  count: number;
  perDay: number;
  perHour: number;
  per10Min: number;
  /** Fixed 10-minute periods counted from `fromMs` (the last one may be partial). */
  periods: number;
  floodPeriods: number;
  /** Share of periods in flood, in per cent. */
  floodPct: number;
}

/** Alarm rates over [fromMs, toMs) and how many fixed 10-minute periods were floods. */
export function alarmLoad(setTimesMs: number[], fromMs: number, toMs: number): AlarmLoad {
  const span = toMs - fromMs;
  if (!(span > 0)) return { count: 0, perDay: 0, perHour: 0, per10Min: 0, periods: 0, floodPeriods: 0, floodPct: 0 };
  const periods = Math.ceil(span / FLOOD_PERIOD_MS);
  const perPeriod = new Map<number, number>();
  let count = 0;
  for (const t of setTimesMs) {
    if (t < fromMs || t >= toMs) continue;
    count++;
    const p = Math.floor((t - fromMs) / FLOOD_PERIOD_MS);
    perPeriod.set(p, (perPeriod.get(p) ?? 0) + 1);
  }
  let floodPeriods = 0;
  for (const n of perPeriod.values()) if (n > FLOOD_THRESHOLD) floodPeriods++;
  return {
    count,
    perDay: (count * 86_400_000) / span,
    perHour: (count * 3_600_000) / span,
    per10Min: (count * FLOOD_PERIOD_MS) / span,
    periods,
    floodPeriods,
    floodPct: (floodPeriods / periods) * 100,
  };
}

/** Common-practice targets (alarm-management guidance) the analytics compare against. */
export const ALARM_TARGETS = {
  acceptablePerDay: 150,
  manageablePerDay: 300,
  floodPctMax: 1,
  chatteringMax: 0,
  staleMax: 0,
  topTenSharePctMax: 5,
} as const;
