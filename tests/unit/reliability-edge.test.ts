// Edges of the reliability arithmetic: bad input, empty periods, and the critical values of
// the reverse-arrangement test recomputed by methods independent of the module's own.

import { describe, expect, it } from 'vitest';
import {
  chiSquareQuantile,
  crowAmsaa,
  e10Metrics,
  mtbfBounds,
  requiredTestHours,
  reverseArrangementCriticalValues,
  reverseArrangements,
  reverseArrangementsTrend,
  type E10Totals,
} from '@shared/reliability';

const emptyPeriod: E10Totals = {
  productive: 0,
  standby: 0,
  engineering: 0,
  scheduledDowntime: 0,
  unscheduledDowntime: 0,
  nonScheduled: 0,
  maintenanceDelayUser: 0,
  maintenanceDelaySupplier: 0,
  outOfSpecInput: 0,
  facilitiesRelated: 0,
  repair: 0,
  failures: 0,
  assists: 0,
  downtimeEvents: 0,
};

describe('chiSquareQuantile guards', () => {
  it('when p is 0 or 1, then it returns 0 and Infinity', () => {
    expect(chiSquareQuantile(0, 4)).toBe(0);
    expect(chiSquareQuantile(1, 4)).toBe(Infinity);
  });

  it('when p or the degrees of freedom are out of range, then it throws a RangeError that says which', () => {
    expect(() => chiSquareQuantile(-0.1, 2)).toThrow(RangeError);
    expect(() => chiSquareQuantile(1.1, 2)).toThrow(/probability/);
    expect(() => chiSquareQuantile(Number.NaN, 2)).toThrow(RangeError);
    expect(() => chiSquareQuantile(0.5, 0)).toThrow(/degrees of freedom/);
    expect(() => chiSquareQuantile(0.5, -3)).toThrow(RangeError);
    expect(() => chiSquareQuantile(0.5, Number.NaN)).toThrow(RangeError);
    expect(() => chiSquareQuantile(0.5, Infinity)).toThrow(RangeError);
  });
});

describe('mtbfBounds edges', () => {
  it('when inputs are invalid, then it throws a RangeError', () => {
    const ok = { hours: 100, failures: 2, confidence: 0.9 };
    expect(() => mtbfBounds({ ...ok, hours: -1 })).toThrow(RangeError);
    expect(() => mtbfBounds({ ...ok, hours: Infinity })).toThrow(RangeError);
    expect(() => mtbfBounds({ ...ok, hours: Number.NaN })).toThrow(RangeError);
    expect(() => mtbfBounds({ ...ok, failures: 1.5 })).toThrow(/whole number/);
    expect(() => mtbfBounds({ ...ok, failures: -1 })).toThrow(RangeError);
    expect(() => mtbfBounds({ ...ok, confidence: 0 })).toThrow(/confidence/);
    expect(() => mtbfBounds({ ...ok, confidence: 1 })).toThrow(RangeError);
    expect(() => mtbfBounds({ ...ok, confidence: 90 })).toThrow(RangeError);
    expect(() => mtbfBounds({ ...ok, sides: 3 as 1 })).toThrow(/sides/);
    expect(() => mtbfBounds({ ...ok, censoring: 'both' as 'time' })).toThrow(/censoring/);
  });

  it('when a failure-censored test reports no failures, then it throws, since such a test ends on a failure', () => {
    expect(() => mtbfBounds({ hours: 100, failures: 0, confidence: 0.9, censoring: 'failure' })).toThrow(RangeError);
  });

  it('when no productive hours were logged, then the bounds are 0 with failures and the point estimate 0', () => {
    expect(mtbfBounds({ hours: 0, failures: 2, confidence: 0.9 })).toEqual({ point: 0, lower: 0, upper: 0 });
    expect(mtbfBounds({ hours: 0, failures: 0, confidence: 0.9 })).toEqual({ point: null, lower: 0, upper: null });
  });

  it('when confidence rises, then the interval widens around the same point estimate', () => {
    const narrow = mtbfBounds({ hours: 500, failures: 5, confidence: 0.8 });
    const wide = mtbfBounds({ hours: 500, failures: 5, confidence: 0.95 });
    expect(wide.point).toBe(narrow.point);
    expect(wide.lower!).toBeLessThan(narrow.lower!);
    expect(wide.upper!).toBeGreaterThan(narrow.upper!);
    expect(narrow.lower!).toBeLessThan(narrow.point!);
    expect(narrow.upper!).toBeGreaterThan(narrow.point!);
  });

  it('when one-sided limits are asked at the same confidence, then they are tighter than the two-sided ones', () => {
    const one = mtbfBounds({ hours: 500, failures: 5, confidence: 0.9, sides: 1 });
    const two = mtbfBounds({ hours: 500, failures: 5, confidence: 0.9, sides: 2 });
    expect(one.lower!).toBeGreaterThan(two.lower!);
    expect(one.upper!).toBeLessThan(two.upper!);
  });
});

describe('requiredTestHours edges', () => {
  it('when no failure is allowed, then the test length is mtbf · (−ln(1 − confidence))', () => {
    expect(requiredTestHours({ mtbf: 100, confidence: 0.9, failures: 0 })).toBeCloseTo(100 * Math.log(10), 9);
  });

  it('when inputs are invalid, then it throws a RangeError', () => {
    expect(() => requiredTestHours({ mtbf: 0, confidence: 0.8, failures: 1 })).toThrow(RangeError);
    expect(() => requiredTestHours({ mtbf: 100, confidence: 1, failures: 1 })).toThrow(RangeError);
    expect(() => requiredTestHours({ mtbf: 100, confidence: 0.8, failures: 0.5 })).toThrow(RangeError);
  });
});

describe('e10Metrics edges', () => {
  it('when a period is empty, then every ratio is null rather than NaN or Infinity', () => {
    const m = e10Metrics(emptyPeriod);
    expect(m).toEqual({
      totalTime: 0,
      operationsTime: 0,
      uptime: 0,
      downtime: 0,
      manufacturingTime: 0,
      operationalUptimePct: null,
      equipmentDependentUptimePct: null,
      supplierDependentUptimePct: null,
      operationalUtilizationPct: null,
      totalUtilizationPct: null,
      mtbfP: null,
      mttr: null,
      mtol: null,
      mtbaP: null,
    });
  });

  it('when the tool was non-scheduled all period, then total utilisation is 0 % and the operations-based ratios are null', () => {
    const m = e10Metrics({ ...emptyPeriod, nonScheduled: 168 });
    expect(m.totalTime).toBe(168);
    expect(m.totalUtilizationPct).toBe(0);
    expect(m.operationalUptimePct).toBeNull();
    expect(m.operationalUtilizationPct).toBeNull();
  });

  it('when a tool ran with no failures, assists or downtime, then the mean times are null and uptime is 100 %', () => {
    const m = e10Metrics({ ...emptyPeriod, productive: 100, standby: 20 });
    expect(m.operationalUptimePct).toBe(100);
    expect(m.equipmentDependentUptimePct).toBe(100);
    expect(m.mtbfP).toBeNull();
    expect(m.mttr).toBeNull();
    expect(m.mtol).toBeNull();
    expect(m.mtbaP).toBeNull();
  });

  it('when a whole period was downtime waiting on the user, then the supplier-dependent base is empty and null', () => {
    const m = e10Metrics({ ...emptyPeriod, unscheduledDowntime: 10, maintenanceDelayUser: 10, failures: 1, downtimeEvents: 1 });
    expect(m.operationalUptimePct).toBe(0);
    expect(m.supplierDependentUptimePct).toBeNull();
    expect(m.equipmentDependentUptimePct).toBeNull();
  });

  it('when any figure is negative, fractional where a count is meant, or not finite, then it throws a RangeError', () => {
    expect(() => e10Metrics({ ...emptyPeriod, productive: -1 })).toThrow(/productive/);
    expect(() => e10Metrics({ ...emptyPeriod, standby: Number.NaN })).toThrow(RangeError);
    expect(() => e10Metrics({ ...emptyPeriod, nonScheduled: Infinity })).toThrow(RangeError);
    expect(() => e10Metrics({ ...emptyPeriod, failures: 1.5 })).toThrow(/failures/);
    expect(() => e10Metrics({ ...emptyPeriod, downtimeEvents: -2 })).toThrow(/downtimeEvents/);
  });

  it('when the downtime sub-states add up to more than the downtime, then it throws rather than report over 100 %', () => {
    expect(() => e10Metrics({ ...emptyPeriod, productive: 10, unscheduledDowntime: 5, repair: 4, maintenanceDelayUser: 2 })).toThrow(
      /sub-states/,
    );
    // Rounding noise from summing many intervals is tolerated.
    expect(() => e10Metrics({ ...emptyPeriod, unscheduledDowntime: 0.3, repair: 0.1 + 0.2, failures: 1, downtimeEvents: 1 })).not.toThrow();
  });
});

/** Reversal counts of every permutation of n distinct values, by brute force. */
function bruteForceReversalCounts(n: number): number[] {
  const counts = new Array<number>((n * (n - 1)) / 2 + 1).fill(0);
  const values = Array.from({ length: n }, (_, i) => i);
  const permute = (k: number): void => {
    if (k === n) {
      counts[reverseArrangements(values).count]++;
      return;
    }
    for (let i = k; i < n; i++) {
      [values[k], values[i]] = [values[i], values[k]];
      permute(k + 1);
      [values[k], values[i]] = [values[i], values[k]];
    }
  };
  permute(0);
  return counts;
}

/** Exact integer counts of permutations by reversals: the product Π (1 + x + … + x^(k−1)). */
function exactReversalCounts(n: number): bigint[] {
  let poly: bigint[] = [1n];
  for (let k = 2; k <= n; k++) {
    const next = new Array<bigint>(poly.length + k - 1).fill(0n);
    poly.forEach((c, i) => {
      for (let j = 0; j < k; j++) next[i + j] += c;
    });
    poly = next;
  }
  return poly;
}

/** Largest c with P(count <= c) <= alpha, from exact integer counts. */
function exactLowerCritical(n: number, alpha: number): number | null {
  const counts = exactReversalCounts(n);
  const total = counts.reduce((a, b) => a + b, 0n);
  // Compare cumulative/total <= alpha in integers, with alpha as a ratio of 10^6.
  const scale = 1_000_000n;
  const limit = BigInt(Math.round(alpha * 1_000_000));
  let cumulative = 0n;
  let lower: number | null = null;
  for (let c = 0; c < counts.length; c++) {
    cumulative += counts[c];
    if (cumulative * scale > limit * total) break;
    lower = c;
  }
  return lower;
}

describe('reverse-arrangement critical values', () => {
  it('when n is small, then the critical values match a brute-force count over all permutations', () => {
    for (const n of [4, 5, 6, 7]) {
      const counts = bruteForceReversalCounts(n);
      const total = counts.reduce((a, b) => a + b, 0);
      for (const confidence of [0.9, 0.95, 0.99]) {
        let cumulative = 0;
        let lower: number | null = null;
        for (let c = 0; c < counts.length; c++) {
          cumulative += counts[c];
          if (cumulative / total > 1 - confidence + 1e-12) break;
          lower = c;
        }
        const max = (n * (n - 1)) / 2;
        expect(reverseArrangementCriticalValues(n, confidence), `n=${n} at ${confidence}`).toEqual({
          lower,
          upper: lower === null ? null : max - lower,
        });
      }
    }
  });

  it('when n = 4 at 95 %, then only 0 reversals is worsening (1/24 ≈ 4.2 %) and at 99 % nothing can be', () => {
    expect(reverseArrangementCriticalValues(4, 0.95)).toEqual({ lower: 0, upper: 6 });
    expect(reverseArrangementCriticalValues(4, 0.99)).toEqual({ lower: null, upper: null });
    expect(reverseArrangements([40, 30, 20, 10], 0.99)).toEqual({ count: 0, significant: false, critical: null });
  });

  it('when n is up to 50, then the exact values agree with exact integer counts', () => {
    for (const n of [12, 17, 25, 50]) {
      expect(reverseArrangementCriticalValues(n, 0.95).lower, `n=${n}`).toBe(exactLowerCritical(n, 0.05));
      expect(reverseArrangementCriticalValues(n, 0.99).lower, `n=${n}`).toBe(exactLowerCritical(n, 0.01));
    }
  });

  it('when n is above 50, then the normal approximation is within one reversal of the exact value', () => {
    for (const n of [51, 64]) {
      for (const confidence of [0.9, 0.95, 0.99]) {
        const approx = reverseArrangementCriticalValues(n, confidence);
        const exact = exactLowerCritical(n, 1 - confidence) as number;
        expect(Math.abs((approx.lower as number) - exact), `n=${n} at ${confidence}`).toBeLessThanOrEqual(1);
        expect(approx.upper).toBe((n * (n - 1)) / 2 - (approx.lower as number));
      }
    }
  });

  it('when confidence is 0.5 or less, or n is not a count, then it throws a RangeError', () => {
    expect(() => reverseArrangementCriticalValues(10, 0.5)).toThrow(RangeError);
    expect(() => reverseArrangementCriticalValues(10, 1)).toThrow(RangeError);
    expect(() => reverseArrangementCriticalValues(-1)).toThrow(RangeError);
    expect(() => reverseArrangementCriticalValues(3.5)).toThrow(RangeError);
  });
});

describe('reverse-arrangement test', () => {
  it('when gaps shrink steadily, then the tool is worsening', () => {
    const gaps = [120, 100, 90, 70, 60, 40, 30, 25, 20, 10];
    const result = reverseArrangements(gaps, 0.95);
    expect(result.count).toBe(0);
    expect(result.significant).toBe(true);
    expect(reverseArrangementsTrend(gaps, 0.95)).toBe('worsening');
  });

  it('when gaps grow steadily, then the tool is improving but not flagged as significant', () => {
    const gaps = [10, 20, 25, 30, 40, 60, 70, 90, 100, 120];
    const result = reverseArrangements(gaps, 0.95);
    expect(result.count).toBe(45);
    expect(result.significant).toBe(false);
    expect(reverseArrangementsTrend(gaps, 0.95)).toBe('improving');
  });

  it('when gaps wander with no direction, then there is no trend', () => {
    const gaps = [50, 20, 80, 40, 60, 30, 70, 10, 90, 55];
    expect(reverseArrangements(gaps).significant).toBe(false);
    expect(reverseArrangementsTrend(gaps)).toBe('none');
  });

  it('when gaps are equal, then ties count as no reversal', () => {
    expect(reverseArrangements([5, 5, 5, 5]).count).toBe(0);
    expect(reverseArrangements([5, 5, 6]).count).toBe(2);
  });

  it('when fewer than 4 gaps are known, then the trend is insufficient and nothing is significant', () => {
    expect(reverseArrangementsTrend([], 0.95)).toBe('insufficient');
    expect(reverseArrangementsTrend([30, 20, 10], 0.95)).toBe('insufficient');
    expect(reverseArrangements([30, 20, 10])).toEqual({ count: 0, significant: false, critical: null });
  });

  it('when a gap is negative or not a number, then it throws a RangeError', () => {
    expect(() => reverseArrangements([10, -1, 5, 6])).toThrow(/gaps\[1\]/);
    expect(() => reverseArrangementsTrend([10, Number.NaN, 5, 6])).toThrow(RangeError);
  });
});

describe('crowAmsaa edges', () => {
  it('when fewer than two failures are known, then there is no fit', () => {
    expect(crowAmsaa([], 100)).toBeNull();
    expect(crowAmsaa([40], 100)).toBeNull();
  });

  it('when every failure falls at the end of the window, then there is no fit', () => {
    expect(crowAmsaa([100, 100], 100)).toBeNull();
  });

  it('when failures come evenly, then β̂ is near 1 and the instantaneous MTBF near the cumulative one', () => {
    const times = Array.from({ length: 40 }, (_, i) => (i + 1) * 25);
    const fit = crowAmsaa(times, 1000)!;
    expect(fit.beta).toBeGreaterThan(0.85);
    expect(fit.beta).toBeLessThan(1.15);
    expect(fit.slope).toBeCloseTo(1 - fit.beta, 12);
    expect(fit.instantaneousMtbf).toBeCloseTo(1000 / (40 * fit.beta), 9);
  });

  it('when the times are out of order, then the fit is the same', () => {
    const sorted = crowAmsaa([18, 20, 35, 41, 67, 180], 300)!;
    const shuffled = crowAmsaa([180, 35, 18, 67, 20, 41], 300)!;
    expect(shuffled.beta).toBeCloseTo(sorted.beta, 12);
  });

  it('when a time is outside the window or the window is empty, then it throws a RangeError', () => {
    expect(() => crowAmsaa([10, 0], 100)).toThrow(/failureTimes\[1\]/);
    expect(() => crowAmsaa([10, 120], 100)).toThrow(RangeError);
    expect(() => crowAmsaa([10, 20], 0)).toThrow(/totalHours/);
    expect(() => crowAmsaa([10, 20], Number.NaN)).toThrow(RangeError);
  });
});
