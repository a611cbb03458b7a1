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

/** One CSV column: its header and how a row fills it. Header and value cannot drift apart. */
export interface Column<Row> {
  header: string;
  value: (row: Row) => Cell;
}

export function toCsv<Row>(columns: readonly Column<Row>[], rows: readonly Row[]): string {
  const lines = [columns.map((c) => c.header), ...rows.map((row) => columns.map((c) => c.value(row)))];
  return '\uFEFF' + lines.map((line) => line.map(csvCell).join(',')).join('\r\n') + '\r\n';
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

type ToolRow = AnalyticsReport['tools'][number];
type MonthRow = AnalyticsReport['months'][number];

const stateColumns = <Row>(hours: (row: Row) => StateHours): Column<Row>[] =>
  E10_STATE_HOURS_KEYS.map((k) => ({ header: STATE_COLUMN[k], value: (row: Row) => round(hours(row)[k]) }));

const TOOL_COLUMNS: readonly Column<ToolRow>[] = [
  { header: 'Tool code', value: (t) => t.code },
  { header: 'Tool name', value: (t) => t.name },
  { header: 'Area', value: (t) => t.areaName },
  { header: 'Availability %', value: (t) => round(t.figures.availabilityPct) },
  { header: 'Uptime h', value: (t) => round(t.figures.uptimeHours) },
  ...stateColumns<ToolRow>((t) => t.figures.hours),
  { header: 'Failures', value: (t) => t.figures.failures },
  { header: 'Assists', value: (t) => t.figures.assists },
  { header: 'MTBF over uptime h', value: (t) => round(t.figures.mtbf.point) },
  { header: 'MTBF 90% lower h', value: (t) => round(t.figures.mtbf.lower) },
  { header: 'MTBF 90% upper h', value: (t) => round(t.figures.mtbf.upper) },
  { header: 'MTTR (E10, excl. waiting) h', value: (t) => round(t.figures.mttrHours) },
  { header: 'Mean down time per failure h', value: (t) => round(t.figures.meanDownHoursPerFailure) },
  { header: 'Failure trend', value: (t) => t.trend },
  { header: 'Reversals', value: (t) => t.reversals },
  { header: 'Crow-AMSAA beta', value: (t) => round(t.crowBeta) },
];

const MONTH_COLUMNS: readonly Column<MonthRow>[] = [
  { header: 'Month (UTC)', value: (m) => m.month.slice(0, 7) },
  { header: 'From', value: (m) => m.from },
  { header: 'To', value: (m) => m.to },
  { header: 'Partial month', value: (m) => m.partial },
  ...stateColumns<MonthRow>((m) => m.hours),
  { header: 'Availability %', value: (m) => round(m.availabilityPct) },
  { header: 'Failures', value: (m) => m.failures },
];

export const toolsCsv = (report: AnalyticsReport): string => toCsv(TOOL_COLUMNS, report.tools);
export const monthsCsv = (report: AnalyticsReport): string => toCsv(MONTH_COLUMNS, report.months);

/** A file name that says what and when: faultline-tools-area-3-2025-01-01-2025-12-31.csv. */
export function csvFileName(kind: 'tools' | 'months', report: AnalyticsReport): string {
  const scope = report.scope.kind === 'facility' ? 'facility' : `${report.scope.kind}-${report.scope.id}`;
  return `faultline-${kind}-${scope}-${report.period.from.slice(0, 10)}-${report.period.to.slice(0, 10)}.csv`;
}
