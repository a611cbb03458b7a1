import type { StateHours } from '@shared/schemas/analytics';

// Number formats of the analytics pages: figures are rounded for reading, the exact values
// stay in data-value attributes and in the CSV exports.

const whole = new Intl.NumberFormat(undefined, { maximumFractionDigits: 0 });
const oneDecimal = new Intl.NumberFormat(undefined, { minimumFractionDigits: 1, maximumFractionDigits: 1 });

export function formatHours(hours: number | null | undefined): string {
  if (hours === null || hours === undefined || !Number.isFinite(hours)) return '—';
  return `${hours >= 100 ? whole.format(hours) : oneDecimal.format(hours)} h`;
}

export function formatPercent(percent: number | null | undefined): string {
  if (percent === null || percent === undefined || !Number.isFinite(percent)) return '—';
  return `${oneDecimal.format(percent)} %`;
}

export function formatShare(share: number | null | undefined): string {
  if (share === null || share === undefined) return '—';
  // Anything short of all is never rounded up to "100 %": one miss in 300 reads "99 %".
  const pct = share < 1 ? Math.min(99, Math.round(share * 100)) : 100;
  return `${whole.format(pct)} %`;
}

export function formatCount(count: number): string {
  return whole.format(count);
}

/** "12 min", "3 h 5 min", "2.5 d". */
export function formatMinutes(minutes: number | null | undefined): string {
  if (minutes === null || minutes === undefined || !Number.isFinite(minutes)) return '—';
  if (minutes < 60) return `${whole.format(Math.round(minutes))} min`;
  if (minutes < 48 * 60) {
    const h = Math.floor(minutes / 60);
    const m = Math.round(minutes % 60);
    return m === 0 || m === 60 ? `${m === 60 ? h + 1 : h} h` : `${h} h ${m} min`;
  }
  return `${oneDecimal.format(minutes / 1440)} d`;
}

const monthFormat = new Intl.DateTimeFormat(undefined, { month: 'short', year: 'numeric', timeZone: 'UTC' });
const dayFormat = new Intl.DateTimeFormat(undefined, { day: 'numeric', month: 'short', year: 'numeric' });

/** "Mar 2024" for a month bucket (UTC months, as the server counts them). */
export function formatMonth(iso: string): string {
  return monthFormat.format(new Date(iso));
}

export function formatDay(iso: string | Date): string {
  return dayFormat.format(typeof iso === 'string' ? new Date(iso) : iso);
}

/** The period as people say it: the end is exclusive, so the last day shown is the day before. */
export function formatPeriod(fromIso: string, toIso: string): string {
  const to = new Date(toIso);
  const lastMoment = new Date(to.getTime() - 1);
  return `${formatDay(fromIso)} – ${formatDay(lastMoment)}`;
}

export interface StateSeries {
  key: keyof StateHours;
  label: string;
  /** Solid colour, after the state colours of the board (IEC 60073 meanings). */
  color: string;
  /** A hatch for the downtime states, so they read without colour too. */
  pattern: 'down' | 'maintenance' | null;
}

// Bottom to top in the stacked bars: uptime first, downtime on top where the eye lands.
export const STATE_SERIES: readonly StateSeries[] = [
  { key: 'productive', label: 'Productive', color: '#1e7b3f', pattern: null },
  { key: 'standby', label: 'Standby', color: '#7fc08f', pattern: null },
  { key: 'engineering', label: 'Engineering', color: '#4b5a70', pattern: null },
  { key: 'nonScheduled', label: 'Non-scheduled', color: '#bfc1c5', pattern: null },
  { key: 'scheduledDowntime', label: 'Scheduled downtime', color: '#2160c0', pattern: 'maintenance' },
  { key: 'unscheduledDowntime', label: 'Unscheduled downtime', color: '#c42a25', pattern: 'down' },
];
