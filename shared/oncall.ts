// On-call rota and escalation: pure rules shared by the server and the admin page.

export const DUTIES = ['on_call', 'backup'] as const;
export type Duty = (typeof DUTIES)[number];
export const DUTY_LABELS: Record<Duty, string> = { on_call: 'On call', backup: 'Backup' };

/** hazard: hazard reports and safety alarms (always page); p1: other P1 tickets (night window only). */
export const SEVERITIES = ['hazard', 'p1'] as const;
export type Severity = (typeof SEVERITIES)[number];
export const SEVERITY_LABELS: Record<Severity, string> = {
  hazard: 'Hazard reports and safety alarms',
  p1: 'Other P1 tickets',
};

/** The steps of every escalation, in order: the person on call, the backup, then the manager. */
export const STEPS = ['on_call', 'backup', 'manager'] as const;
export type Step = (typeof STEPS)[number];
export const STEP_LABELS: Record<Step, string> = { on_call: 'On call', backup: 'Backup', manager: 'Manager' };

export const DEFAULT_STEP_MINUTES = 10;
export const WEEK_MS = 7 * 24 * 3_600_000;

export interface ShiftLike {
  id: number;
  userId: number;
  duty: Duty;
  startsAt: Date;
  endsAt: Date;
  weekly: boolean;
  repeatUntil: Date | null;
}

export interface CoverLike {
  id: number;
  userId: number;
  duty: Duty;
  startsAt: Date;
  endsAt: Date;
}

/** The start of the shift's turn that holds `t`, or null (a weekly shift repeats every 7 days). */
export function turnAt(shift: ShiftLike, t: Date): Date | null {
  const start = shift.startsAt.getTime();
  const length = shift.endsAt.getTime() - start;
  const at = t.getTime();
  if (at < start) return null;
  if (!shift.weekly) return at < start + length ? shift.startsAt : null;
  // Weekly turns last at most a week, so only the latest turn that began can hold t.
  const turn = start + Math.floor((at - start) / WEEK_MS) * WEEK_MS;
  if (shift.repeatUntil && turn >= shift.repeatUntil.getTime()) return null;
  return at < turn + length ? new Date(turn) : null;
}

/**
 * Who holds a duty at `t`: a cover wins over the rota (the newest cover if several), then the
 * shift whose turn began last. Null when nobody does (a gap in the rota).
 */
export function whoHolds(duty: Duty, shifts: readonly ShiftLike[], covers: readonly CoverLike[], t: Date): number | null {
  const at = t.getTime();
  const cover = covers
    .filter((c) => c.duty === duty && c.startsAt.getTime() <= at && at < c.endsAt.getTime())
    .sort((a, b) => b.id - a.id)[0];
  if (cover) return cover.userId;
  let best: { userId: number; turn: number } | null = null;
  for (const s of shifts) {
    if (s.duty !== duty) continue;
    const turn = turnAt(s, t);
    if (turn && (!best || turn.getTime() > best.turn)) best = { userId: s.userId, turn: turn.getTime() };
  }
  return best?.userId ?? null;
}

/** Minutes since local midnight of `t` in the time zone. */
export function localMinutes(t: Date, timeZone: string): number {
  const parts = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).formatToParts(t);
  const get = (type: string) => Number(parts.find((p) => p.type === type)?.value ?? 0);
  return get('hour') * 60 + get('minute');
}

const hhmm = (s: string) => Number(s.slice(0, 2)) * 60 + Number(s.slice(3, 5));

/** Whether `t` falls in the local window [starts, ends) ("22:00"–"06:00" wraps past midnight). */
export function inNightWindow(t: Date, timeZone: string, starts: string | null, ends: string | null): boolean {
  if (!starts || !ends) return false;
  const m = localMinutes(t, timeZone);
  const a = hhmm(starts);
  const b = hhmm(ends);
  if (a === b) return true; // a window from a time to the same time is the whole day
  return a < b ? m >= a && m < b : m >= a || m < b;
}

/** A four-digit code a paged person may text back (any reply from their number also counts). */
export function replyCodeFrom(bytes: Uint8Array): string {
  const n = ((bytes[0] << 8) | bytes[1]) % 9000;
  return String(1000 + n);
}
