import { HAZARD_LABELS, IMPACT_LABELS, type Hazard, type Impact } from './report-options';

// Ticket priority from impact × urgency, the usual service-desk practice: impact says how much
// of the facility's work is blocked, urgency how fast harm grows if nobody acts. The server sets
// the priority when a report arrives; staff may still change it by hand afterwards.

export const PRIORITIES = ['P1', 'P2', 'P3', 'P4'] as const;
export type Priority = (typeof PRIORITIES)[number];

export const PRIORITY_LABELS: Record<Priority, string> = {
  P1: 'P1 · Urgent',
  P2: 'P2 · High',
  P3: 'P3 · Normal',
  P4: 'P4 · Low',
};

export const LEVELS = ['high', 'medium', 'low'] as const;
export type Level = (typeof LEVELS)[number];

/** How much a tool matters to the facility, set per tool by an admin. */
export const CRITICALITIES = ['high', 'normal', 'low'] as const;
export type Criticality = (typeof CRITICALITIES)[number];

export const CRITICALITY_LABELS: Record<Criticality, string> = {
  high: 'High: few or no alternatives in the facility',
  normal: 'Normal',
  low: 'Low: spare capacity elsewhere',
};

/**
 * PRIORITY_MATRIX[impact][urgency]. Faultline's own table, shaped like the common
 * impact × urgency grid:
 *
 *                 urgency high   urgency medium   urgency low
 *   impact high        P1              P2              P2
 *   impact medium      P1              P2              P3
 *   impact low         P1              P3              P4
 *
 * - High urgency means someone may be in danger, so that whole column is P1 whatever the
 *   impact. (computePriority also forces P1 for any hazard on its own, so a later edit of this
 *   table can never push a safety report down the queue.)
 * - A stopped tool is P2 even with no wafers inside: everyone booked on it is blocked, and a
 *   P2 target brings it back within the day.
 * - Wafers left in a stopped tool keep it at P2 rather than P1: they usually sit safely in a
 *   closed chamber for hours, and the P1 pager target is kept for real danger. The wafers
 *   still appear in the reasons so triage can raise the ticket by hand.
 * - A limited tool with wafers at risk is P2 because someone's work may be lost; without
 *   wafers at risk it is ordinary P3 work.
 * - A tool that still works is P4 unless wafers are at risk (P3).
 */
export const PRIORITY_MATRIX: Record<Level, Record<Level, Priority>> = {
  high: { high: 'P1', medium: 'P2', low: 'P2' },
  medium: { high: 'P1', medium: 'P2', low: 'P3' },
  low: { high: 'P1', medium: 'P3', low: 'P4' },
};

const IMPACT_LEVEL: Record<Impact, Level> = {
  tool_stopped: 'high',
  tool_limited: 'medium',
  still_usable: 'low',
};

function shift(level: Level, steps: -1 | 1): Level {
  // LEVELS runs from high (index 0) to low, so raising a level means a smaller index.
  const index = Math.min(LEVELS.length - 1, Math.max(0, LEVELS.indexOf(level) - steps));
  return LEVELS[index];
}

export interface PriorityInput {
  impact: Impact;
  hazards: readonly Hazard[];
  /** Wafers left in the tool (0 when none). */
  wafersAtRisk: number;
  /** True when the reporter says the wafers left inside are safe (e.g. parked in a load lock). */
  wafersKnownSafe?: boolean;
  criticality: Criticality;
}

export interface PriorityResult {
  priority: Priority;
  impactLevel: Level;
  urgencyLevel: Level;
  /** Plain-words explanations of what moved the priority, shown beside it on the ticket. */
  reasons: string[];
}

export function computePriority(input: PriorityInput): PriorityResult {
  const { impact, hazards, wafersAtRisk, wafersKnownSafe = false, criticality } = input;
  const reasons: string[] = [];

  const uniqueHazards = [...new Set(hazards)];
  for (const hazard of uniqueHazards) {
    reasons.push(`Hazard reported: ${HAZARD_LABELS[hazard].toLowerCase()}`);
  }

  const reportedLevel = IMPACT_LEVEL[impact];
  if (impact !== 'still_usable') reasons.push(IMPACT_LABELS[impact]);

  let impactLevel = reportedLevel;
  if (criticality === 'high') impactLevel = shift(reportedLevel, 1);
  if (criticality === 'low') impactLevel = shift(reportedLevel, -1);
  // Mention criticality only when it actually moved the level, so the reasons never claim an
  // effect that did not happen.
  if (impactLevel !== reportedLevel) {
    reasons.push(criticality === 'high' ? 'High-criticality tool' : 'Low-criticality tool (impact lowered one step)');
  }

  const wafers = Number.isFinite(wafersAtRisk) ? Math.max(0, Math.floor(wafersAtRisk)) : 0;
  const wafersThreatened = wafers > 0 && !wafersKnownSafe;
  if (wafersThreatened) reasons.push(`${wafers} ${wafers === 1 ? 'wafer' : 'wafers'} left in the tool`);

  const urgencyLevel: Level = uniqueHazards.length > 0 ? 'high' : wafersThreatened ? 'medium' : 'low';

  // A safety report always goes to the top, independent of the matrix.
  const priority = uniqueHazards.length > 0 ? 'P1' : PRIORITY_MATRIX[impactLevel][urgencyLevel];

  return { priority, impactLevel, urgencyLevel, reasons };
}

export interface ServiceTarget {
  /** Minutes from report to acknowledgement. */
  acknowledgeMinutes: number;
  /** Minutes from report to the tool being back in service. */
  restoreMinutes: number;
}

const HOUR = 60;
const DAY = 24 * HOUR;

/**
 * Defaults for a university cleanroom staffed in the daytime; admins can change them.
 * The timers count elapsed clock time, not working hours, so "one working day" for P2 is
 * taken as 24 h: a fault reported in the afternoon is due by the next afternoon rather than
 * being missed overnight.
 */
export const SERVICE_TARGET_DEFAULTS: Record<Priority, ServiceTarget> = {
  P1: { acknowledgeMinutes: 15, restoreMinutes: 4 * HOUR },
  P2: { acknowledgeMinutes: 1 * HOUR, restoreMinutes: 1 * DAY },
  P3: { acknowledgeMinutes: 4 * HOUR, restoreMinutes: 3 * DAY },
  P4: { acknowledgeMinutes: 1 * DAY, restoreMinutes: 10 * DAY },
};

/** Share of a target that may be used before its timer turns to a warning. */
export const TARGET_WARNING_FRACTION = 0.75;

export type TargetStatus = 'ok' | 'warning' | 'missed';

/**
 * 'missed' once more time has passed than the target allows, 'warning' from 75 % of it on.
 * Reaching the target to the minute still counts as meeting it.
 */
export function targetStatus(elapsedMinutes: number, targetMinutes: number): TargetStatus {
  if (!Number.isFinite(targetMinutes) || targetMinutes <= 0) {
    throw new RangeError(`A service target must be a positive number of minutes, got ${targetMinutes}.`);
  }
  if (Number.isNaN(elapsedMinutes)) throw new RangeError('Elapsed minutes must be a number.');
  if (elapsedMinutes > targetMinutes) return 'missed';
  if (elapsedMinutes >= targetMinutes * TARGET_WARNING_FRACTION) return 'warning';
  return 'ok';
}
