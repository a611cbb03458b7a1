// Durations are shown with their two largest units, rounded down, because "down 2 h 14 min"
// must never claim more time than has passed. Seconds appear only under a minute.

const SECOND = 1000;
const MINUTE = 60 * SECOND;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

/** "45 s", "14 min", "2 h 14 min", "2 h", "3 d 4 h". Negative input counts as its size. */
export function formatDuration(ms: number): string {
  if (!Number.isFinite(ms)) return '—';
  const size = Math.abs(ms);
  if (size < MINUTE) return `${Math.floor(size / SECOND)} s`;
  if (size < HOUR) return `${Math.floor(size / MINUTE)} min`;
  if (size < DAY) {
    const hours = Math.floor(size / HOUR);
    const minutes = Math.floor((size % HOUR) / MINUTE);
    return minutes > 0 ? `${hours} h ${minutes} min` : `${hours} h`;
  }
  const days = Math.floor(size / DAY);
  const hours = Math.floor((size % DAY) / HOUR);
  return hours > 0 ? `${days} d ${hours} h` : `${days} d`;
}

/** Below this, a moment is "just now" rather than a count of seconds that keeps jumping. */
const JUST_NOW_MS = 5 * SECOND;

/** "2 h 14 min ago", "in 3 h", "just now". */
export function formatRelative(date: Date, now: number = Date.now()): string {
  const diff = date.getTime() - now;
  if (Math.abs(diff) < JUST_NOW_MS) return 'just now';
  return diff < 0 ? `${formatDuration(diff)} ago` : `in ${formatDuration(diff)}`;
}

const exactFormat = new Intl.DateTimeFormat(undefined, {
  weekday: 'short',
  day: 'numeric',
  month: 'short',
  year: 'numeric',
  hour: '2-digit',
  minute: '2-digit',
});

/** The exact local time, e.g. "Tue, 14 May 2025, 14:32". */
export function formatExact(date: Date): string {
  return exactFormat.format(date);
}

/** Accepts what the API sends (ISO strings) as well as dates and epoch milliseconds. */
export function toDate(value: Date | string | number): Date {
  return value instanceof Date ? value : new Date(value);
}
