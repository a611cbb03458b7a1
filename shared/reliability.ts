// Reliability arithmetic for the analytics: SEMI E10 time-state metrics, chi-square
// confidence bounds on MTBF, the reverse-arrangement trend test and the Crow-AMSAA growth
// slope. Pure functions with hours as the unit, so the browser charts and the server's
// reports give the same figures from the same code.

import quantile from '@stdlib/stats-base-dists-chisquare-quantile';

function fail(message: string): never {
  throw new RangeError(message);
}

function isNonNegativeFinite(value: number): boolean {
  return typeof value === 'number' && Number.isFinite(value) && value >= 0;
}

function requireHours(name: string, value: number): void {
  if (!isNonNegativeFinite(value)) fail(`${name} must be a finite number of hours >= 0, got ${value}`);
}

function requireCount(name: string, value: number): void {
  if (!Number.isInteger(value) || value < 0) fail(`${name} must be a whole number >= 0, got ${value}`);
}

function requireConfidence(value: number): void {
  if (typeof value !== 'number' || !(value > 0 && value < 1)) {
    fail(`confidence must be strictly between 0 and 1 (e.g. 0.9 for 90 %), got ${value}`);
  }
}

/** Divides, giving null rather than Infinity/NaN when there is nothing to divide by. */
function ratio(numerator: number, denominator: number): number | null {
  return denominator > 0 ? numerator / denominator : null;
}

// ---------------------------------------------------------------------------------------
// Chi-square quantile
// ---------------------------------------------------------------------------------------

/**
 * Lower-tail quantile of the chi-square distribution: the x with P(X <= x) = p for `dof`
 * degrees of freedom. p = 0 gives 0 and p = 1 gives Infinity.
 */
export function chiSquareQuantile(p: number, dof: number): number {
  if (typeof p !== 'number' || Number.isNaN(p) || p < 0 || p > 1) {
    fail(`chi-square probability must be within [0, 1], got ${p}`);
  }
  if (typeof dof !== 'number' || !Number.isFinite(dof) || dof <= 0) {
    fail(`chi-square degrees of freedom must be a finite number > 0, got ${dof}`);
  }
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  return quantile(p, dof);
}

// ---------------------------------------------------------------------------------------
// Confidence bounds on MTBF (constant failure rate)
// ---------------------------------------------------------------------------------------

export type MtbfSides = 1 | 2;
/**
 * 'time': the observation window ended at a chosen time (the normal case for a tool's
 * history). 'failure': the test stopped at the r-th failure (Type II censoring).
 */
export type MtbfCensoring = 'time' | 'failure';

export interface MtbfBoundsInput {
  /** Productive hours observed (T). */
  hours: number;
  /** Failures counted in those hours (r). */
  failures: number;
  /** Confidence level, e.g. 0.9. */
  confidence: number;
  /** 2 (default): a two-sided interval; 1: each limit is a one-sided limit at `confidence`. */
  sides?: MtbfSides;
  censoring?: MtbfCensoring;
}

export interface MtbfBounds {
  /** T / r; null with no failures (the data give no finite estimate). */
  point: number | null;
  lower: number | null;
  /** null with no failures: nothing bounds MTBF from above. */
  upper: number | null;
}

/**
 * Chi-square confidence limits on MTBF, as in SEMI E10 and the NIST/SEMATECH e-Handbook.
 *
 * With α = 1 − confidence and a = α/2 for a two-sided interval (a = α for one-sided limits):
 *   lower = 2T / χ²(1 − a; 2r + 2)   (time-censored; 2r degrees of freedom if failure-censored)
 *   upper = 2T / χ²(a; 2r)
 * With no failures only the lower limit exists, T / (−ln a). That is the same number as the
 * general lower formula, because χ²(p; 2) = −2 ln(1 − p); using a = α/2 for two sides keeps
 * the zero-failure limit consistent with the two-sided formula (a one-sided 100(1−α/2) %
 * limit) rather than quietly reporting a less conservative one-sided figure.
 */
export function mtbfBounds(input: MtbfBoundsInput): MtbfBounds {
  const { hours, failures, confidence, sides = 2, censoring = 'time' } = input;
  requireHours('hours', hours);
  requireCount('failures', failures);
  requireConfidence(confidence);
  if (sides !== 1 && sides !== 2) fail(`sides must be 1 or 2, got ${String(sides)}`);
  if (censoring !== 'time' && censoring !== 'failure') {
    fail(`censoring must be 'time' or 'failure', got ${String(censoring)}`);
  }

  const alpha = 1 - confidence;
  const tail = sides === 2 ? alpha / 2 : alpha;

  if (failures === 0) {
    // A failure-censored test ends at a failure, so it cannot have none.
    if (censoring === 'failure') fail('a failure-censored test needs at least one failure');
    return { point: null, lower: hours / -Math.log(tail), upper: null };
  }

  const lowerDof = censoring === 'failure' ? 2 * failures : 2 * failures + 2;
  return {
    point: hours / failures,
    lower: (2 * hours) / chiSquareQuantile(1 - tail, lowerDof),
    upper: (2 * hours) / chiSquareQuantile(tail, 2 * failures),
  };
}

export interface RequiredTestHoursInput {
  /** MTBF to be demonstrated, hours. */
  mtbf: number;
  /** Confidence of the demonstration, e.g. 0.8. */
  confidence: number;
  /** Failures allowed during the test. */
  failures: number;
}

/**
 * Productive hours a tool must run, with at most `failures` failures, for the one-sided
 * lower confidence limit on MTBF to reach `mtbf`: mtbf · χ²(confidence; 2r + 2) / 2.
 */
export function requiredTestHours({ mtbf, confidence, failures }: RequiredTestHoursInput): number {
  if (!(Number.isFinite(mtbf) && mtbf > 0)) fail(`mtbf must be a finite number of hours > 0, got ${mtbf}`);
  requireConfidence(confidence);
  requireCount('failures', failures);
  return (mtbf * chiSquareQuantile(confidence, 2 * failures + 2)) / 2;
}

// ---------------------------------------------------------------------------------------
// SEMI E10 time-state metrics
// ---------------------------------------------------------------------------------------

/** Hours in each of the six SEMI E10 basic states. */
export interface E10StateHours {
  productive: number;
  standby: number;
  engineering: number;
  scheduledDowntime: number;
  unscheduledDowntime: number;
  nonScheduled: number;
}

/** The six basic states in E10's order (the order of report columns). */
export const E10_STATE_HOURS_KEYS = [
  'productive',
  'standby',
  'engineering',
  'scheduledDowntime',
  'unscheduledDowntime',
  'nonScheduled',
] as const satisfies readonly (keyof E10StateHours)[];

/** Hours in each E10 state, hours of the downtime sub-states, and event counts for a period. */
export interface E10Totals extends E10StateHours {
  /** Maintenance delay on the user's (facility's) side, in scheduled and unscheduled downtime. */
  maintenanceDelayUser: number;
  /** Maintenance delay on the supplier's side (vendor, parts from the supplier). */
  maintenanceDelaySupplier: number;
  outOfSpecInput: number;
  facilitiesRelated: number;
  /** Repair time: elapsed, including test and verification, excluding maintenance delay. */
  repair: number;
  failures: number;
  assists: number;
  /** Separate stretches of scheduled or unscheduled downtime. */
  downtimeEvents: number;
}

/** Hours, percentages (0–100) and mean times; null where the divisor is zero. */
export interface E10Metrics {
  totalTime: number;
  operationsTime: number;
  uptime: number;
  downtime: number;
  manufacturingTime: number;
  operationalUptimePct: number | null;
  equipmentDependentUptimePct: number | null;
  supplierDependentUptimePct: number | null;
  operationalUtilizationPct: number | null;
  totalUtilizationPct: number | null;
  mtbfP: number | null;
  mttr: number | null;
  mtol: number | null;
  mtbaP: number | null;
}

const E10_HOUR_KEYS = [
  ...E10_STATE_HOURS_KEYS,
  'maintenanceDelayUser',
  'maintenanceDelaySupplier',
  'outOfSpecInput',
  'facilitiesRelated',
  'repair',
] as const satisfies readonly (keyof E10Totals)[];

const E10_COUNT_KEYS = ['failures', 'assists', 'downtimeEvents'] as const satisfies readonly (keyof E10Totals)[];

// Sums of many state intervals pick up rounding error; a microsecond-scale allowance keeps
// that from being mistaken for inconsistent input.
const HOURS_EPSILON = 1e-6;

/**
 * SEMI E10 metrics for one tool (or a sum of tools) over one period.
 *
 * Supplier-dependent uptime leaves out of its base what the supplier does not control: the
 * user's maintenance delay, out-of-spec input and facilities-related downtime. This matches
 * the E10 definition as we recall it and the check value 122/137 of our invented scenario;
 * equipment-dependent uptime additionally leaves out the supplier's maintenance delay.
 */
export function e10Metrics(totals: E10Totals): E10Metrics {
  for (const key of E10_HOUR_KEYS) requireHours(key, totals[key]);
  for (const key of E10_COUNT_KEYS) requireCount(key, totals[key]);

  const {
    productive,
    standby,
    engineering,
    scheduledDowntime,
    unscheduledDowntime,
    nonScheduled,
    maintenanceDelayUser,
    maintenanceDelaySupplier,
    outOfSpecInput,
    facilitiesRelated,
    repair,
  } = totals;

  const downtime = scheduledDowntime + unscheduledDowntime;
  const insideDowntime = maintenanceDelayUser + maintenanceDelaySupplier + outOfSpecInput + facilitiesRelated + repair;
  if (insideDowntime > downtime + HOURS_EPSILON) {
    fail(
      `downtime sub-states (maintenance delay, out-of-spec input, facilities, repair) add up to ` +
        `${insideDowntime} h, more than the ${downtime} h of scheduled plus unscheduled downtime`,
    );
  }

  const uptime = productive + standby + engineering;
  const totalTime = uptime + downtime + nonScheduled;
  const operationsTime = totalTime - nonScheduled;
  const notSupplierControlled = maintenanceDelayUser + outOfSpecInput + facilitiesRelated;
  const notEquipmentCaused = notSupplierControlled + maintenanceDelaySupplier;

  const pct = (part: number, whole: number): number | null => {
    const r = ratio(part, whole);
    return r === null ? null : r * 100;
  };

  return {
    totalTime,
    operationsTime,
    uptime,
    downtime,
    manufacturingTime: productive + standby,
    operationalUptimePct: pct(uptime, operationsTime),
    equipmentDependentUptimePct: pct(uptime, operationsTime - notEquipmentCaused),
    supplierDependentUptimePct: pct(uptime, operationsTime - notSupplierControlled),
    operationalUtilizationPct: pct(productive, operationsTime),
    totalUtilizationPct: pct(productive, totalTime),
    mtbfP: ratio(productive, totals.failures),
    mttr: ratio(repair, totals.failures),
    mtol: ratio(downtime, totals.downtimeEvents),
    mtbaP: ratio(productive, totals.assists),
  };
}

// ---------------------------------------------------------------------------------------
// Reverse-arrangement trend test
// ---------------------------------------------------------------------------------------

/** Below this many gaps the test cannot say anything useful. */
export const REVERSE_ARRANGEMENT_MIN_GAPS = 4;
// Up to here the exact distribution is cheap (about n³/2 additions); above, the normal
// approximation with continuity correction agrees with it to within one reversal.
const EXACT_DISTRIBUTION_MAX_GAPS = 50;

function requireTrendConfidence(confidence: number): void {
  // A one-sided test at 50 % or less would flag both trends at once.
  if (typeof confidence !== 'number' || !(confidence > 0.5 && confidence < 1)) {
    fail(`trend confidence must be strictly between 0.5 and 1 (e.g. 0.95), got ${confidence}`);
  }
}

function requireGaps(gaps: readonly number[]): void {
  if (!Array.isArray(gaps)) fail('gaps must be an array of hours');
  gaps.forEach((gap, i) => requireHours(`gaps[${i}]`, gap));
}

/**
 * Probability of each reversal count 0 … n(n−1)/2 when n gaps arrive in random order
 * (the Mahonian distribution): adding the k-th element adds 0 … k−1 reversals with equal
 * chance. Probabilities rather than counts so nothing overflows.
 */
function reversalDistribution(n: number): number[] {
  let dist = [1];
  for (let k = 2; k <= n; k++) {
    const max = (k * (k - 1)) / 2;
    const next = new Array<number>(max + 1);
    let window = 0;
    for (let c = 0; c <= max; c++) {
      window += dist[c] ?? 0;
      if (c - k >= 0) window -= dist[c - k] ?? 0;
      next[c] = window / k;
    }
    dist = next;
  }
  return dist;
}

export interface ReverseArrangementCriticalValues {
  /** Largest count that signals a worsening tool (count <= lower); null if none can. */
  lower: number | null;
  /** Smallest count that signals an improving tool (count >= upper); null if none can. */
  upper: number | null;
}

/**
 * One-sided critical numbers of reversals for n gaps at `confidence`, each with a chance of
 * at most 1 − confidence under "no trend". Both are inclusive: published tables that give
 * the number to be exceeded print `upper − 1`.
 */
export function reverseArrangementCriticalValues(n: number, confidence = 0.95): ReverseArrangementCriticalValues {
  requireCount('n', n);
  requireTrendConfidence(confidence);
  const alpha = 1 - confidence;
  const max = (n * (n - 1)) / 2;

  if (n <= EXACT_DISTRIBUTION_MAX_GAPS) {
    const dist = reversalDistribution(Math.max(n, 1));
    let lower: number | null = null;
    let cumulative = 0;
    for (let c = 0; c <= max; c++) {
      cumulative += dist[c];
      // The allowance keeps 1 − 0.9 = 0.0999… from rejecting a tail of exactly 0.1.
      if (cumulative > alpha + 1e-12) break;
      lower = c;
    }
    // The distribution is symmetric about max/2.
    return { lower, upper: lower === null ? null : max - lower };
  }

  const mean = max / 2;
  const sd = Math.sqrt((2 * n ** 3 + 3 * n ** 2 - 5 * n) / 72);
  // One-sided normal quantile from the chi-square with 1 degree of freedom: z² ~ χ²(1).
  const z = Math.sqrt(chiSquareQuantile(1 - 2 * alpha, 1));
  const lower = Math.floor(mean - 0.5 - z * sd);
  return lower < 0 ? { lower: null, upper: null } : { lower, upper: max - lower };
}

export interface ReverseArrangementResult {
  /** Pairs i < j with gaps[i] < gaps[j]: a later gap longer than an earlier one. */
  count: number;
  /** True when the count is at or below `critical`: failures are coming faster. */
  significant: boolean;
  /** The lower (worsening) critical value; null with too few gaps or none reachable. */
  critical: number | null;
}

function countReversals(gaps: readonly number[]): number {
  let count = 0;
  for (let i = 0; i < gaps.length; i++) {
    for (let j = i + 1; j < gaps.length; j++) {
      if (gaps[i] < gaps[j]) count++;
    }
  }
  return count;
}

/**
 * Reverse-arrangement test on the gaps between successive failures, in time order. Many
 * reversals mean the gaps grow (an improving tool); few mean they shrink. Only the
 * worsening side sets `significant`, because that is the one a technician must act on;
 * ties count as no reversal.
 */
export function reverseArrangements(gaps: number[], confidence = 0.95): ReverseArrangementResult {
  requireGaps(gaps);
  requireTrendConfidence(confidence);
  const count = countReversals(gaps);
  if (gaps.length < REVERSE_ARRANGEMENT_MIN_GAPS) return { count, significant: false, critical: null };
  const { lower } = reverseArrangementCriticalValues(gaps.length, confidence);
  return { count, significant: lower !== null && count <= lower, critical: lower };
}

export type ReliabilityTrend = 'worsening' | 'improving' | 'none' | 'insufficient';

/** Which way the failure gaps are heading, one-sided on each side at `confidence`. */
export function reverseArrangementsTrend(gaps: number[], confidence = 0.95): ReliabilityTrend {
  requireGaps(gaps);
  requireTrendConfidence(confidence);
  if (gaps.length < REVERSE_ARRANGEMENT_MIN_GAPS) return 'insufficient';
  const count = countReversals(gaps);
  const { lower, upper } = reverseArrangementCriticalValues(gaps.length, confidence);
  if (lower !== null && count <= lower) return 'worsening';
  if (upper !== null && count >= upper) return 'improving';
  return 'none';
}

// ---------------------------------------------------------------------------------------
// Crow-AMSAA reliability growth
// ---------------------------------------------------------------------------------------

export interface CrowAmsaaResult {
  /** Shape β̂: below 1 the failures thin out (growth), above 1 they crowd in. */
  beta: number;
  /** Growth slope 1 − β̂. */
  slope: number;
  /** MTBF at the end of the window, T / (r·β̂), hours. */
  instantaneousMtbf: number;
}

/**
 * Crow-AMSAA (power-law) fit of failure times within a window of `totalHours` productive
 * hours that ended at a chosen time: β̂ = (r − 1) / Σ ln(T / tᵢ), the unbiased
 * time-truncated estimate. Null with fewer than two failures, or when every failure sits
 * at the end of the window and the data hold no information about β.
 */
export function crowAmsaa(failureTimes: number[], totalHours: number): CrowAmsaaResult | null {
  if (!(Number.isFinite(totalHours) && totalHours > 0)) {
    fail(`totalHours must be a finite number of hours > 0, got ${totalHours}`);
  }
  if (!Array.isArray(failureTimes)) fail('failureTimes must be an array of hours');
  failureTimes.forEach((t, i) => {
    if (!(Number.isFinite(t) && t > 0 && t <= totalHours)) {
      fail(`failureTimes[${i}] must be within (0, ${totalHours}] hours, got ${t}`);
    }
  });

  const r = failureTimes.length;
  if (r < 2) return null;
  const logSum = failureTimes.reduce((sum, t) => sum + Math.log(totalHours / t), 0);
  if (!(logSum > 0)) return null;
  const beta = (r - 1) / logSum;
  return { beta, slope: 1 - beta, instantaneousMtbf: totalHours / (r * beta) };
}
