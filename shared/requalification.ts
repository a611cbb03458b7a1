// Requalification arithmetic: the summary of a set of measurements (film thickness at nine
// points, hot-plate temperature at five), the non-uniformity figures in the ways the trade
// quotes them, process capability against spec limits (NIST/SEMATECH e-Handbook §6.1.6) and
// the individuals control chart of a figure's history (§6.3.2.2). Pure, shared by the
// record form in the browser and the server that decides pass or fail.

export interface Uniformity {
  n: number;
  mean: number;
  min: number;
  max: number;
  range: number;
  /** Sample standard deviation (n − 1); null with a single value. */
  stdDev: number | null;
  /** (max − min) / (2 · mean) × 100, quoted as "± x %". Null when the mean is 0. */
  halfRangePct: number | null;
  /** (max − min) / mean × 100. */
  rangePct: number | null;
  /** s / mean × 100 (1σ). */
  sigmaPct: number | null;
  /** 3 · s / mean × 100 (3σ). */
  threeSigmaPct: number | null;
}

function requireValues(values: number[]): void {
  if (!Array.isArray(values) || values.length === 0) throw new RangeError('at least one measurement is needed');
  for (const v of values) {
    if (typeof v !== 'number' || !Number.isFinite(v)) throw new RangeError(`measurements must be finite numbers, got ${v}`);
  }
}

function percentOfMean(part: number | null, mean: number): number | null {
  if (part === null || mean === 0) return null;
  return (part / Math.abs(mean)) * 100;
}

export function uniformity(values: number[]): Uniformity {
  requireValues(values);
  const n = values.length;
  const mean = values.reduce((a, b) => a + b, 0) / n;
  const min = Math.min(...values);
  const max = Math.max(...values);
  const range = max - min;
  const stdDev = n < 2 ? null : Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (n - 1));
  return {
    n,
    mean,
    min,
    max,
    range,
    stdDev,
    halfRangePct: percentOfMean(range / 2, mean),
    rangePct: percentOfMean(range, mean),
    sigmaPct: percentOfMean(stdDev, mean),
    threeSigmaPct: percentOfMean(stdDev === null ? null : 3 * stdDev, mean),
  };
}

export interface Capability {
  cp: number | null;
  cpu: number | null;
  cpl: number | null;
  cpk: number | null;
}

/**
 * Cp = (USL − LSL) / 6σ, Cpu = (USL − μ) / 3σ, Cpl = (μ − LSL) / 3σ, Cpk = min(Cpu, Cpl).
 * With one limit missing, Cp and that side are null and Cpk is the other side. With no
 * spread (σ 0 or unknown) nothing can be said: all null.
 */
export function capability(input: { mean: number; stdDev: number | null; lsl?: number | null; usl?: number | null }): Capability {
  const { mean, stdDev } = input;
  const lsl = input.lsl ?? null;
  const usl = input.usl ?? null;
  if (lsl !== null && usl !== null && lsl > usl) throw new RangeError(`the lower limit ${lsl} is above the upper limit ${usl}`);
  if (stdDev === null || !(stdDev > 0)) return { cp: null, cpu: null, cpl: null, cpk: null };
  const cpu = usl === null ? null : (usl - mean) / (3 * stdDev);
  const cpl = lsl === null ? null : (mean - lsl) / (3 * stdDev);
  const cp = usl === null || lsl === null ? null : (usl - lsl) / (6 * stdDev);
  const sides = [cpu, cpl].filter((v): v is number => v !== null);
  return { cp, cpu, cpl, cpk: sides.length === 0 ? null : Math.min(...sides) };
}

export interface IndividualsChart {
  center: number;
  /** Mean moving range of consecutive points; null with a single point. */
  mrBar: number | null;
  ucl: number | null;
  lcl: number | null;
  /** Upper limit of the moving-range chart, 3.267 · MR̄ (D4 for n = 2). */
  mrUcl: number | null;
  /** Indices of the points outside [lcl, ucl] (Western Electric rule 1). */
  beyond: number[];
}

/** d2 for moving ranges of two points. */
const D2 = 1.128;
/** D4 for moving ranges of two points. */
const D4 = 3.267;

/** Individuals chart after NIST/SEMATECH e-Handbook §6.3.2.2: x̄ ± 3 · MR̄ / 1.128. */
export function individualsChart(values: number[]): IndividualsChart {
  requireValues(values);
  const center = values.reduce((a, b) => a + b, 0) / values.length;
  if (values.length < 2) return { center, mrBar: null, ucl: null, lcl: null, mrUcl: null, beyond: [] };
  let sum = 0;
  for (let i = 1; i < values.length; i++) sum += Math.abs(values[i] - values[i - 1]);
  const mrBar = sum / (values.length - 1);
  const ucl = center + (3 * mrBar) / D2;
  const lcl = center - (3 * mrBar) / D2;
  const beyond: number[] = [];
  values.forEach((v, i) => {
    if (v > ucl || v < lcl) beyond.push(i);
  });
  return { center, mrBar, ucl, lcl, mrUcl: D4 * mrBar, beyond };
}

/** The figure a requalification limit applies to; the label is always shown with the limit. */
export const UNIFORMITY_FIGURES = ['mean', 'halfRangePct', 'rangePct', 'sigmaPct', 'threeSigmaPct', 'range'] as const;
export type UniformityFigure = (typeof UNIFORMITY_FIGURES)[number];

export const FIGURE_LABELS: Record<UniformityFigure, string> = {
  mean: 'mean',
  halfRangePct: 'non-uniformity, half-range (± %)',
  rangePct: 'non-uniformity, range (%)',
  sigmaPct: 'non-uniformity, 1σ (%)',
  threeSigmaPct: 'non-uniformity, 3σ (%)',
  range: 'range (max − min)',
};

export interface FigureLimit {
  figure: UniformityFigure;
  min: number | null;
  max: number | null;
}

export interface LimitVerdict extends FigureLimit {
  value: number | null;
  pass: boolean;
}

/** Pass/fail of each limit; a figure that cannot be computed (one value, mean 0) fails. */
export function judgeLimits(summary: Uniformity, limits: FigureLimit[]): LimitVerdict[] {
  return limits.map((limit) => {
    const value = summary[limit.figure];
    const pass = value !== null && (limit.min === null || value >= limit.min) && (limit.max === null || value <= limit.max);
    return { ...limit, value, pass };
  });
}

/**
 * Reads a pasted column (one value a line, as from a metrology export): accepts a header
 * line, blank lines, tabs/semicolons (takes the last numeric cell) and a decimal comma.
 * Returns the numbers and the 1-based lines that could not be read.
 */
export function parseMeasurementColumn(text: string): { values: number[]; badLines: number[] } {
  const values: number[] = [];
  const badLines: number[] = [];
  text.split(/\r?\n/).forEach((raw, i) => {
    const line = raw.trim();
    if (line === '') return;
    const cells = line.split(/[\t;]|\s{2,}/).map((c) => c.trim().replace(/^(-?\d+),(\d+)$/, '$1.$2'));
    const numeric = cells.filter((c) => /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(c));
    if (numeric.length === 0) {
      // A header on the first line is normal; anything else is reported.
      if (!(i === 0 && /[a-z]/i.test(line))) badLines.push(i + 1);
      return;
    }
    values.push(Number(numeric[numeric.length - 1]));
  });
  return { values, badLines };
}
