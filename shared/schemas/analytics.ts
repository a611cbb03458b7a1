import { z } from 'zod';
import { isoInstant } from './text';
import type { Priority } from '../priority';
import type { E10StateHours, ReliabilityTrend } from '../reliability';

// Inputs and answers of the analytics API, shared by the manager pages and the server.

export const ANALYTICS_SCOPES = ['facility', 'area', 'tool'] as const;
export type AnalyticsScopeKind = (typeof ANALYTICS_SCOPES)[number];

/** A period longer than this is refused: five years and a leap day, plus slack for time zones. */
export const MAX_PERIOD_DAYS = 1830;
const DAY_MS = 86_400_000;

/** Two-sided confidence of the MTBF interval shown everywhere. */
export const MTBF_CONFIDENCE = 0.9;
/** One-sided confidence of the trend test on each tool's failure gaps. */
export const TREND_CONFIDENCE = 0.95;

const instant = (what: string) =>
  isoInstant(`Give the ${what} as an ISO date and time, e.g. 2025-01-31T00:00:00Z.`).transform((v) => new Date(v));
const id = z.coerce.number().int().positive();

/** The period [from, to) and the scope of an analytics report. */
export const analyticsQuerySchema = z
  .strictObject({
    from: instant('start'),
    to: instant('end'),
    scope: z.enum(ANALYTICS_SCOPES).default('facility'),
    areaId: id.optional(),
    toolId: id.optional(),
  })
  .superRefine((v, ctx) => {
    // Refinements run even when a field failed to parse; only compare real dates.
    if (v.from instanceof Date && v.to instanceof Date) {
      if (v.to.getTime() <= v.from.getTime()) ctx.addIssue({ code: 'custom', path: ['to'], message: 'The end must come after the start.' });
      if (v.to.getTime() - v.from.getTime() > MAX_PERIOD_DAYS * DAY_MS) {
        ctx.addIssue({ code: 'custom', path: ['from'], message: 'Choose a period of at most five years.' });
      }
    }
    if (v.scope === 'area' && v.areaId === undefined) ctx.addIssue({ code: 'custom', path: ['areaId'], message: 'Choose the area.' });
    if (v.scope === 'tool' && v.toolId === undefined) ctx.addIssue({ code: 'custom', path: ['toolId'], message: 'Choose the tool.' });
    if (v.scope !== 'area' && v.areaId !== undefined)
      ctx.addIssue({ code: 'custom', path: ['areaId'], message: 'An area goes with the area scope only.' });
    if (v.scope !== 'tool' && v.toolId !== undefined)
      ctx.addIssue({ code: 'custom', path: ['toolId'], message: 'A tool goes with the tool scope only.' });
  });
export type AnalyticsQueryInput = z.input<typeof analyticsQuerySchema>;
export type AnalyticsQuery = z.output<typeof analyticsQuerySchema>;

// ---- Answers -----------------------------------------------------------------------------

/** Hours in each SEMI E10 state, as the answers carry them. */
export type StateHours = E10StateHours;

/** Hours of the downtime sub-reasons the E10 figures need. */
export interface DowntimeDetail {
  /** Waiting on the facility's side (the user), in scheduled or unscheduled downtime. */
  maintenanceDelayUser: number;
  /** Waiting on the supplier: vendor service or parts. */
  maintenanceDelaySupplier: number;
  facilitiesRelated: number;
  outOfSpecInput: number;
  /** Unscheduled downtime spent repairing, testing and verifying (no waiting). */
  repair: number;
}

export interface MtbfFigure {
  /**
   * 'uptime': productive + standby + engineering hours per failure. Faultline has no feed of
   * real run time, so productive and standby cannot be told apart (idle running is logged as
   * standby); E10's MTBF(p) over productive hours alone would be meaningless here.
   */
  basis: 'uptime';
  hours: number;
  failures: number;
  /** Hours; null without failures. */
  point: number | null;
  /** Two-sided chi-square interval at `confidence`, constant failure rate assumed. */
  lower: number | null;
  upper: number | null;
  confidence: number;
}

export interface ReliabilityFigures {
  /** Hours of calendar time covered (the tool's log within the period). */
  totalHours: number;
  hours: StateHours;
  downtime: DowntimeDetail;
  uptimeHours: number;
  /** Total time minus non-scheduled time. */
  operationsHours: number;
  failures: number;
  assists: number;
  /** Separate stretches of scheduled or unscheduled downtime (for MTOL). */
  downtimeEvents: number;
  /** E10 operational uptime: uptime ÷ operations time, in %. */
  availabilityPct: number | null;
  equipmentDependentUptimePct: number | null;
  supplierDependentUptimePct: number | null;
  mtbf: MtbfFigure;
  /** E10 MTTR: repair hours (excluding maintenance delay) per failure. */
  mttrHours: number | null;
  /** Unscheduled downtime hours per failure, waiting included. */
  meanDownHoursPerFailure: number | null;
  /** Mean time off-line: scheduled plus unscheduled downtime per downtime event. */
  mtolHours: number | null;
  /** Mean uptime between assists. */
  mtbaHours: number | null;
}

export interface AnalyticsToolRow {
  id: number;
  code: string;
  name: string;
  areaId: number;
  areaName: string;
  figures: ReliabilityFigures;
  /** Reverse-arrangement test on the calendar gaps between failure starts in the period. */
  trend: ReliabilityTrend;
  reversals: number | null;
  /** Crow-AMSAA shape over calendar time in the period: above 1, failures come faster. */
  crowBeta: number | null;
}

export interface AnalyticsAreaRow {
  id: number;
  name: string;
  toolCount: number;
  figures: ReliabilityFigures;
}

export interface AnalyticsMonthRow {
  /** First instant of the calendar month (UTC), ISO. */
  month: string;
  /** The part of the month inside the period: [from, to). */
  from: string;
  to: string;
  partial: boolean;
  hours: StateHours;
  availabilityPct: number | null;
  failures: number;
}

export type ParetoKind = 'recorded' | 'not_recorded' | 'no_ticket';

export interface ParetoRow {
  /**
   * 'recorded': `key` is the failure mode as written on the ticket, or the category key.
   * 'not_recorded': the linked ticket has no failure mode (yet). 'no_ticket': downtime that
   * no ticket is linked to.
   */
  kind: ParetoKind;
  key: string | null;
  hours: number;
  /** Tickets whose linked downtime falls in the period. */
  tickets: number;
  /** Share of all unscheduled downtime hours in the period, 0–1. */
  share: number;
  cumulativeShare: number;
}

export interface ResponseRow {
  priority: Priority | 'all';
  /** Tickets reported in the period (merged duplicates left out). */
  tickets: number;
  acknowledged: number;
  ackMeanMinutes: number | null;
  ackP90Minutes: number | null;
  /** null for the 'all' row: each priority has its own target. */
  ackTargetMinutes: number | null;
  /**
   * Acknowledged within target ÷ (acknowledged + still unacknowledged past target). A ticket
   * still open past its target counts as missed even when it was reported before the period,
   * so "100 %" never shows while one is open.
   */
  ackMetShare: number | null;
  /** Tickets (reported in the period or before) still unacknowledged past their target at the period's end. */
  ackOverdue: number;
  restored: number;
  restoreMeanMinutes: number | null;
  restoreP90Minutes: number | null;
  restoreTargetMinutes: number | null;
  restoreMetShare: number | null;
  /** Tickets still not restored past their target at the period's end. */
  restoreOverdue: number;
}

export interface AnalyticsScope {
  kind: AnalyticsScopeKind;
  id: number | null;
  /** The tool's or area's code (null for the facility): CSV file names carry it. */
  code: string | null;
  name: string;
}

export interface AnalyticsReport {
  scope: AnalyticsScope;
  /** `to` is clipped to the moment the report was made. */
  period: { from: string; to: string; requestedTo: string; hours: number };
  generatedAt: string;
  /** Plain-words notes on definitions the page shows beside the figures. */
  notes: { mtbf: string; mttr: string; months: string; pareto: string; trend: string };
  totals: ReliabilityFigures;
  months: AnalyticsMonthRow[];
  pareto: { unscheduledHours: number; byFailureMode: ParetoRow[]; byCategory: ParetoRow[] };
  response: { byPriority: ResponseRow[]; overall: ResponseRow };
  tools: AnalyticsToolRow[];
  areas: AnalyticsAreaRow[];
}

export interface ScopeOptions {
  areas: { id: number; code: string; name: string }[];
  tools: { id: number; code: string; name: string; areaId: number; retired: boolean }[];
}

/** The reduced figures on the tool page, open to every signed-in user. */
export interface ToolReliabilityWindow {
  days: number;
  from: string;
  to: string;
  availabilityPct: number | null;
  uptimeHours: number;
  failures: number;
  mtbfHours: number | null;
  mttrHours: number | null;
}

export interface ToolReliability {
  toolId: number;
  mtbfBasis: 'uptime';
  windows: ToolReliabilityWindow[];
}

export const TOOL_RELIABILITY_WINDOWS = [30, 365] as const;

// ---- Period presets (client) ---------------------------------------------------------------

export const PERIOD_PRESETS = ['30d', '90d', '12m', 'custom'] as const;
export type PeriodPreset = (typeof PERIOD_PRESETS)[number];

export const PERIOD_PRESET_LABELS: Record<PeriodPreset, string> = {
  '30d': 'Last 30 days',
  '90d': 'Last 90 days',
  '12m': 'Last 12 months',
  custom: 'Custom dates',
};

/** [from, to) of a preset ending at `now`. 12 months go back to the same day a year ago. */
export function presetPeriod(preset: Exclude<PeriodPreset, 'custom'>, now: Date): { from: Date; to: Date } {
  const to = new Date(now.getTime());
  if (preset === '30d') return { from: new Date(to.getTime() - 30 * DAY_MS), to };
  if (preset === '90d') return { from: new Date(to.getTime() - 90 * DAY_MS), to };
  const from = new Date(to.getTime());
  from.setFullYear(from.getFullYear() - 1);
  return { from, to };
}
