// When a preventive-maintenance plan is next due. Common practice (EN 13306 gives no
// formula): the interval runs from the actual completion; a usage plan counts from the
// counter reading at completion; with both triggers the plan is due at whichever comes
// first. The grace window (default 1.25 × the interval) follows the published precedent of
// the US NRC Standard Technical Specifications, SR 3.0.2 — a design choice, settable.

export const DEFAULT_GRACE_FACTOR = 1.25;

const DAY_MS = 24 * 60 * 60 * 1000;

export interface NextDueInput {
  everyDays?: number | null;
  everyUnits?: number | null;
  lastDoneAt: Date | string;
  lastDoneCounter?: number | null;
  counterNow?: number | null;
  graceFactor?: number | null;
}

export interface NextDue {
  /** Calendar due time (ISO, UTC); null for a usage-only plan. */
  dueAt: string | null;
  /** Counter reading at which the plan is due; null without a usage trigger. */
  dueAtCounter: number | null;
  /** Units left before due (negative when past); null without a usage trigger or reading. */
  unitsLeft: number | null;
  /** Share of the usage interval used, in %; null without a usage trigger or reading. */
  usedPct: number | null;
  /** End of the calendar grace window (ISO, UTC). */
  graceUntil: string | null;
  /** Counter reading at the end of the usage grace window. */
  graceUntilCounter: number | null;
}

function positiveOrNull(name: string, value: number | null | undefined): number | null {
  if (value === null || value === undefined) return null;
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`${name} must be a number > 0, got ${value}`);
  }
  return value;
}

export function nextDue(input: NextDueInput): NextDue {
  const everyDays = positiveOrNull('everyDays', input.everyDays);
  const everyUnits = positiveOrNull('everyUnits', input.everyUnits);
  if (everyDays === null && everyUnits === null) throw new RangeError('a plan needs everyDays, everyUnits or both');
  const grace = input.graceFactor ?? DEFAULT_GRACE_FACTOR;
  if (!(grace >= 1)) throw new RangeError(`graceFactor must be >= 1, got ${grace}`);
  const doneMs = new Date(input.lastDoneAt).getTime();
  if (Number.isNaN(doneMs)) throw new RangeError(`lastDoneAt is not a date: ${String(input.lastDoneAt)}`);

  let dueAt: string | null = null;
  let graceUntil: string | null = null;
  if (everyDays !== null) {
    dueAt = new Date(doneMs + everyDays * DAY_MS).toISOString();
    graceUntil = new Date(doneMs + everyDays * grace * DAY_MS).toISOString();
  }

  let dueAtCounter: number | null = null;
  let graceUntilCounter: number | null = null;
  let unitsLeft: number | null = null;
  let usedPct: number | null = null;
  if (everyUnits !== null) {
    const base = input.lastDoneCounter ?? 0;
    dueAtCounter = base + everyUnits;
    graceUntilCounter = base + everyUnits * grace;
    const now = input.counterNow ?? null;
    if (now !== null) {
      unitsLeft = dueAtCounter - now;
      usedPct = ((now - base) / everyUnits) * 100;
    }
  }
  return { dueAt, dueAtCounter, unitsLeft, usedPct, graceUntil, graceUntilCounter };
}

/**
 * Whether a plan should have its work order created now: within `leadDays` of the calendar
 * due time, or within `leadUnits` of the counter due reading — whichever comes first.
 */
export function isWithinLead(
  due: NextDue,
  lead: { leadDays?: number | null; leadUnits?: number | null },
  now: Date,
  counterNow: number | null,
): boolean {
  if (due.dueAt !== null) {
    const openAt = new Date(due.dueAt).getTime() - (lead.leadDays ?? 0) * DAY_MS;
    if (now.getTime() >= openAt) return true;
  }
  if (due.dueAtCounter !== null && counterNow !== null) {
    if (counterNow >= due.dueAtCounter - (lead.leadUnits ?? 0)) return true;
  }
  return false;
}
