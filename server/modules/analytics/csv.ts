// CSV exports of a report: RFC 4180 quoting, CRLF line ends and a byte-order mark so that
// spreadsheet programs read the names as UTF-8. Text that a spreadsheet would take for a
// formula (=, +, -, @ at the start) gets a leading apostrophe (OWASP's CSV-injection advice).

import type { AnalyticsReport, StateHours } from '../../../shared/schemas/analytics';
import { E10_STATE_HOURS_KEYS } from '../../../shared/reliability';

type Cell = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;

export function csvCell(value: Cell): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  const text = FORMULA_START.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv(header: readonly string[], rows: readonly Cell[][]): string {
  return '\uFEFF' + [header, ...rows].map((row) => row.map(csvCell).join(',')).join('\r\n') + '\r\n';
}

const round = (value: number | null, digits = 3) => (value === null ? null : Number(value.toFixed(digits)));

const STATE_COLUMN: Record<keyof StateHours, string> = {
  productive: 'Productive h',
  standby: 'Standby h',
  engineering: 'Engineering h',
  scheduledDowntime: 'Scheduled downtime h',
  unscheduledDowntime: 'Unscheduled downtime h',
  nonScheduled: 'Non-scheduled h',
};

export function toolsCsv(report: AnalyticsReport): string {
  const header = [
    'Tool code',
    'Tool name',
    'Area',
    'Availability %',
    'Uptime h',
    ...E10_STATE_HOURS_KEYS.map((k) => STATE_COLUMN[k]),
    'Failures',
    'Assists',
    'MTBF over uptime h',
    'MTBF 90% lower h',
    'MTBF 90% upper h',
    'MTTR (E10, excl. waiting) h',
    'Mean down time per failure h',
    'Failure trend',
    'Reversals',
    'Crow-AMSAA beta',
  ];
  const rows = report.tools.map((t) => [
    t.code,
    t.name,
    t.areaName,
    round(t.figures.availabilityPct),
    round(t.figures.uptimeHours),
    ...E10_STATE_HOURS_KEYS.map((k) => round(t.figures.hours[k])),
    t.figures.failures,
    t.figures.assists,
    round(t.figures.mtbf.point),
    round(t.figures.mtbf.lower),
    round(t.figures.mtbf.upper),
    round(t.figures.mttrHours),
    round(t.figures.meanDownHoursPerFailure),
    t.trend,
    t.reversals,
    round(t.crowBeta),
  ]);
  return toCsv(header, rows);
}

export function monthsCsv(report: AnalyticsReport): string {
  const header = [
    'Month (UTC)',
    'From',
    'To',
    'Partial month',
    ...E10_STATE_HOURS_KEYS.map((k) => STATE_COLUMN[k]),
    'Availability %',
    'Failures',
  ];
  const rows = report.months.map((m) => [
    m.month.slice(0, 7),
    m.from,
    m.to,
    m.partial,
    ...E10_STATE_HOURS_KEYS.map((k) => round(m.hours[k])),
    round(m.availabilityPct),
    m.failures,
  ]);
  return toCsv(header, rows);
}

/** A file name that says what and when: faultline-tools-area-3-2025-01-01-2025-12-31.csv. */
export function csvFileName(kind: 'tools' | 'months', report: AnalyticsReport): string {
  // The tool's (or area's) code, as people know it, made safe for a file name.
  const code = (report.scope.code ?? String(report.scope.id)).replace(/[^A-Za-z0-9._-]+/g, '_');
  const scope = report.scope.kind === 'facility' ? 'facility' : `${report.scope.kind}-${code}`;
  return `faultline-${kind}-${scope}-${report.period.from.slice(0, 10)}-${report.period.to.slice(0, 10)}.csv`;
}
