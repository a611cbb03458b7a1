// Checks of the reliability arithmetic against published figures. Each check names its
// source; "computed" marks a figure derived from the published formula rather than printed.

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

/** |actual − expected| <= tolerance, with a message that shows both. */
function expectWithin(actual: number | null, expected: number, tolerance: number): void {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected), `${actual} vs ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

const HOURS = 0.01;

describe('chi-square quantiles', () => {
  // NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.4, table of the chi-square
  // distribution: x with P(X <= x) = p, printed to three decimals.
  const upperTail: Record<number, [number, number, number, number]> = {
    1: [2.706, 3.841, 5.024, 6.635],
    2: [4.605, 5.991, 7.378, 9.21],
    4: [7.779, 9.488, 11.143, 13.277],
    6: [10.645, 12.592, 14.449, 16.812],
    10: [15.987, 18.307, 20.483, 23.209],
  };
  const lowerTail: Record<number, [number, number, number, number]> = {
    2: [0.211, 0.103, 0.051, 0.02],
    4: [1.064, 0.711, 0.484, 0.297],
    6: [2.204, 1.635, 1.237, 0.872],
  };

  for (const [dof, values] of Object.entries(upperTail)) {
    it(`when ν = ${dof} and p = 0.90/0.95/0.975/0.99, then it matches the NIST table to ±0.0005`, () => {
      // NIST/SEMATECH e-Handbook, §1.3.6.7.4 chi-square table (upper-tail critical values)
      [0.9, 0.95, 0.975, 0.99].forEach((p, i) => expectWithin(chiSquareQuantile(p, Number(dof)), values[i], 0.0005));
    });
  }

  for (const [dof, values] of Object.entries(lowerTail)) {
    it(`when ν = ${dof} and p = 0.10/0.05/0.025/0.01, then it matches the NIST table to ±0.0005`, () => {
      // NIST/SEMATECH e-Handbook, §1.3.6.7.4 chi-square table (lower-tail critical values)
      [0.1, 0.05, 0.025, 0.01].forEach((p, i) => expectWithin(chiSquareQuantile(p, Number(dof)), values[i], 0.0005));
    });
  }

  it('when ν = 2, then χ²(p; 2) = −2 ln(1 − p), the identity behind the zero-failure bound', () => {
    // Closed form of the chi-square with 2 degrees of freedom (an exponential with mean 2).
    for (const p of [0.05, 0.5, 0.8, 0.9, 0.95, 0.975]) {
      expect(chiSquareQuantile(p, 2)).toBeCloseTo(-2 * Math.log(1 - p), 10);
    }
  });
});

describe('MTBF confidence bounds — SEMI E10 worked examples', () => {
  // SEMI E10-0304E, §7.6 worked example: T = 1,200 productive hours. E10 prints factors from a
  // table to three figures; the exact values below are computed from its formulas.
  const T = 1200;

  it('when 6 failures occur in 1,200 h, then the point estimate is 200 h', () => {
    // SEMI E10-0304E, §7.6 worked example
    expectWithin(mtbfBounds({ hours: T, failures: 6, confidence: 0.9, sides: 1 }).point, 200, HOURS);
  });

  it('when 6 failures occur in 1,200 h, then the 90 % one-sided lower limit is 114.0 h (factor 0.570)', () => {
    const { point, lower } = mtbfBounds({ hours: T, failures: 6, confidence: 0.9, sides: 1 });
    // SEMI E10-0304E, §7.6 worked example: printed 114.0 h from table factor 0.570
    expectWithin(lower, 114.0, 0.1);
    expect(Number(((lower as number) / (point as number)).toFixed(3))).toBe(0.57);
    // computed from the E10 formula 2T/χ²(0.90; 14)
    expectWithin(lower, 113.938, HOURS);
  });

  it('when 6 failures occur in 1,200 h, then the 90 % one-sided upper limit is 380.8 h (factor 1.904)', () => {
    const { point, upper } = mtbfBounds({ hours: T, failures: 6, confidence: 0.9, sides: 1 });
    // SEMI E10-0304E, §7.6 worked example: printed 380.8 h from table factor 1.904
    expectWithin(upper, 380.8, 0.1);
    expect(Number(((upper as number) / (point as number)).toFixed(3))).toBe(1.904);
    // computed from the E10 formula 2T/χ²(0.10; 12)
    expectWithin(upper, 380.723, HOURS);
  });

  it('when the two 90 % one-sided limits are taken together, then they are the 80 % two-sided interval', () => {
    // SEMI E10-0304E, confidence bounds on MTBF(p): two one-sided 90 % limits form an 80 % two-sided interval
    const oneSided = mtbfBounds({ hours: T, failures: 6, confidence: 0.9, sides: 1 });
    const twoSided = mtbfBounds({ hours: T, failures: 6, confidence: 0.8, sides: 2 });
    expect(twoSided.lower).toBeCloseTo(oneSided.lower as number, 9);
    expect(twoSided.upper).toBeCloseTo(oneSided.upper as number, 9);
  });

  it('when no failure occurs in 1,200 h, then the 90 % lower limit is T/(−ln 0.1) and there is no upper limit', () => {
    const { point, lower, upper } = mtbfBounds({ hours: T, failures: 0, confidence: 0.9, sides: 1 });
    expect(point).toBeNull();
    expect(upper).toBeNull();
    // SEMI E10-0304E, §7.6 worked example: printed 520.8 h = 1,200 × table factor 0.434. The
    // exact factor 1/ln 10 = 0.43429 rounds to the printed 0.434; the exact limit is 521.153 h
    // (computed), so the printed hours differ from it by the factor's rounding, not by the method.
    expect(Number(((lower as number) / T).toFixed(3))).toBe(0.434);
    expect(T * Number(((lower as number) / T).toFixed(3))).toBeCloseTo(520.8, 6);
    expectWithin(lower, 521.153, HOURS);
  });

  it('when MTBF ≥ 400 h must be shown at 80 % with at most 4 failures, then the test needs 2,688 h (factor 6.72)', () => {
    const hours = requiredTestHours({ mtbf: 400, confidence: 0.8, failures: 4 });
    // SEMI E10-0304E, §7.6 worked example: printed 2,688 h from table factor 6.72
    expectWithin(hours, 2688, 1);
    expect(Number((hours / 400).toFixed(2))).toBe(6.72);
    // computed: 400 · χ²(0.80; 10) / 2
    expectWithin(hours, 2688.39, HOURS);
    // Running exactly that long with 4 failures puts the 80 % one-sided lower limit at 400 h.
    expectWithin(mtbfBounds({ hours, failures: 4, confidence: 0.8, sides: 1 }).lower, 400, 1e-6);
  });
});

describe('MTBF confidence bounds — NIST/SEMATECH e-Handbook', () => {
  it('when 2 failures occur in 800 h, then MTBF is 400 h with a 90 % two-sided interval (127.07, 2251.23) h', () => {
    const { point, lower, upper } = mtbfBounds({ hours: 800, failures: 2, confidence: 0.9, sides: 2 });
    // NIST/SEMATECH e-Handbook of Statistical Methods, §8.4.5.1 example
    expectWithin(point, 400, HOURS);
    expectWithin(lower, 127.07, HOURS);
    expectWithin(upper, 2251.23, HOURS);
    // NIST/SEMATECH e-Handbook, §8.4.5.1: the interval as factors of the point estimate
    expectWithin((lower as number) / 400, 0.3177, 0.00005);
    expectWithin((upper as number) / 400, 5.6281, 0.00005);
  });

  it('when sides is left out, then the interval is two-sided', () => {
    // NIST/SEMATECH e-Handbook, §8.4.5.1 example (two-sided is the default)
    const { lower, upper } = mtbfBounds({ hours: 800, failures: 2, confidence: 0.9 });
    expectWithin(lower, 127.07, HOURS);
    expectWithin(upper, 2251.23, HOURS);
  });

  it('when 72 h pass with no failure, then the 95 % one-sided lower limit is 72/(−ln 0.05) = 24.034 h', () => {
    // NIST/SEMATECH e-Handbook, §8.4.5.1: zero failures give only a lower bound T/(−ln α)
    const { point, lower, upper } = mtbfBounds({ hours: 72, failures: 0, confidence: 0.95, sides: 1 });
    expect(point).toBeNull();
    expect(upper).toBeNull();
    expectWithin(lower, 24.034, HOURS);
  });

  it('when no failure occurs and the interval is two-sided, then the lower limit uses α/2 and equals 2T/χ²(1−α/2; 2)', () => {
    // NIST/SEMATECH e-Handbook, §8.4.5.1: the two-sided lower limit is 2T/χ²(1−α/2; 2r+2);
    // with r = 0 that is 2T/χ²(1−α/2; 2) = T/(−ln(α/2)), since χ²(p; 2) = −2 ln(1 − p).
    const T = 72;
    const alpha = 0.05;
    const { lower, upper } = mtbfBounds({ hours: T, failures: 0, confidence: 1 - alpha, sides: 2 });
    expect(upper).toBeNull();
    expect(lower).toBeCloseTo(T / -Math.log(alpha / 2), 9);
    expect(lower).toBeCloseTo((2 * T) / chiSquareQuantile(1 - alpha / 2, 2), 9);
    // computed: 72 / ln 40 = 19.518 h, lower (more conservative) than the one-sided 24.034 h
    expectWithin(lower, 19.518, HOURS);
  });

  it('when a single failure occurs, then the limits use 4 and 2 degrees of freedom', () => {
    // NIST/SEMATECH e-Handbook, §8.4.5.1 formula with r = 1; ν = 4 and ν = 2 quantiles from
    // the §1.3.6.7.4 table: χ²(0.95; 4) = 9.488, χ²(0.05; 2) = 0.103 (computed 0.10259).
    const { point, lower, upper } = mtbfBounds({ hours: 100, failures: 1, confidence: 0.9, sides: 2 });
    expectWithin(point, 100, HOURS);
    expectWithin(lower, 200 / 9.488, 0.01);
    // computed: 200 / 0.102587 = 1,949.57 h
    expectWithin(upper, 1949.57, HOURS);
  });
});

describe('failure-censored (Type II) bounds', () => {
  it('when the test stops at the 6th failure after 1,200 h, then the 90 % lower limit uses 2r = 12 degrees of freedom', () => {
    // SEMI E10-0304E, confidence bounds on MTBF(p): failure-censored lower limit 2T/χ²(1−α; 2r)
    const failureCensored = mtbfBounds({ hours: 1200, failures: 6, confidence: 0.9, sides: 1, censoring: 'failure' });
    const timeCensored = mtbfBounds({ hours: 1200, failures: 6, confidence: 0.9, sides: 1, censoring: 'time' });
    // computed: 2400 / χ²(0.90; 12) = 2400 / 18.549 = 129.386 h
    expectWithin(failureCensored.lower, 129.386, HOURS);
    expect(failureCensored.lower).toBeCloseTo(2400 / chiSquareQuantile(0.9, 12), 9);
    // Knowing the window closed on a failure gives a less pessimistic lower limit …
    expect(failureCensored.lower as number).toBeGreaterThan(timeCensored.lower as number);
    // … and leaves the point estimate and upper limit unchanged.
    expect(failureCensored.point).toBe(timeCensored.point);
    expect(failureCensored.upper).toBeCloseTo(timeCensored.upper as number, 9);
  });
});

describe('SEMI E10 metrics — invented scenario', () => {
  // Invented data built on the SEMI E10-0304E §4–7 formulas (not a published example): one
  // 168 h week. SDT 12 h holds 8 h PM, 2 h maintenance delay (1 h on the user's side) and 2 h
  // facilities; UDT 10 h holds 6 h repair, 3 h user maintenance delay and 1 h out-of-spec input.
  const week: E10Totals = {
    productive: 80,
    standby: 36,
    engineering: 6,
    scheduledDowntime: 12,
    unscheduledDowntime: 10,
    nonScheduled: 24,
    maintenanceDelayUser: 1 + 3,
    maintenanceDelaySupplier: 1,
    outOfSpecInput: 1,
    facilitiesRelated: 2,
    repair: 6,
    failures: 4,
    assists: 0,
    // 4 failures (each one stretch of UDT) and 2 scheduled-downtime events
    downtimeEvents: 6,
  };
  const m = e10Metrics(week);

  it('when the six states are summed, then total, operations, uptime, downtime and manufacturing time follow', () => {
    // SEMI E10-0304E, §4–7 definitions, invented scenario
    expect(m.totalTime).toBe(168);
    expect(m.operationsTime).toBe(144);
    expect(m.uptime).toBe(122);
    expect(m.downtime).toBe(22);
    expect(m.manufacturingTime).toBe(116);
  });

  it('when uptime and utilisation are computed, then they match the scenario percentages', () => {
    // SEMI E10-0304E, §4–7 uptime and utilisation definitions, invented scenario
    expectWithin(m.operationalUptimePct, 84.722, 0.001);
    expectWithin(m.equipmentDependentUptimePct, (122 / 136) * 100, 1e-9);
    expectWithin(m.equipmentDependentUptimePct, 89.706, 0.001);
    expectWithin(m.supplierDependentUptimePct, (122 / 137) * 100, 1e-9);
    expectWithin(m.supplierDependentUptimePct, 89.051, 0.001);
    expectWithin(m.totalUtilizationPct, 47.619, 0.001);
    expectWithin(m.operationalUtilizationPct, 55.556, 0.001);
  });

  it('when mean times are computed, then MTBF(p) is 20 h, MTTR 1.5 h and MTOL 3.667 h', () => {
    // SEMI E10-0304E, §4–7 MTBF(p), MTTR and MTOL definitions, invented scenario
    expectWithin(m.mtbfP, 20, HOURS);
    expectWithin(m.mttr, 1.5, HOURS);
    expectWithin(m.mtol, 3.667, HOURS);
    // No assists in the scenario, so MTBA(p) has no divisor.
    expect(m.mtbaP).toBeNull();
  });

  it('when the week has 3 assists, then MTBA(p) is productive time over assists', () => {
    // SEMI E10-0304E, §4–7 MTBA(p) definition, invented scenario with 3 assists added
    expectWithin(e10Metrics({ ...week, assists: 3 }).mtbaP, 80 / 3, 1e-9);
  });

  it('when 4 failures occur in 80 productive hours, then the 90 % one-sided MTBF(p) limits are 10.008 h and 45.851 h', () => {
    // SEMI E10-0304E, confidence bounds on MTBF(p), invented scenario (computed)
    const { lower, upper } = mtbfBounds({ hours: week.productive, failures: week.failures, confidence: 0.9, sides: 1 });
    expectWithin(lower, 10.008, HOURS);
    expectWithin(upper, 45.851, HOURS);
  });
});

describe('reverse-arrangement trend test', () => {
  it('when failures occur at 30, 160, 220 and 360 h, then the gaps 30, 130, 60, 140 hold 5 reversals', () => {
    // SEMI E10-0304E, Appendix 2 reverse-arrangement example
    const times = [30, 160, 220, 360];
    const gaps = times.map((t, i) => t - (i === 0 ? 0 : times[i - 1]));
    expect(gaps).toEqual([30, 130, 60, 140]);
    expect(reverseArrangements(gaps).count).toBe(5);
  });

  it('when there are 17 gaps, then more than 88 of 136 reversals signals improvement at 95 %', () => {
    // SEMI E10-0304E, Appendix 2: with 17 failures the 95 % critical number of reversals is
    // 88 of a possible 136. That printed number is on the improving (many reversals) side and
    // is the count to be exceeded: our inclusive upper critical value is 89, one above it.
    // The worsening side mirrors it: 136 − 89 = 47 reversals or fewer.
    const { lower, upper } = reverseArrangementCriticalValues(17, 0.95);
    expect(upper).toBe(89);
    expect((upper as number) - 1).toBe(88);
    expect(lower).toBe(136 - 89);

    // 17 gaps with exactly `reversals` later-longer pairs: take the values 17…1 in turn, each
    // time picking one with as many still-unplaced longer values as reversals remain.
    const gapsWithReversals = (reversals: number): number[] => {
      const pool = Array.from({ length: 17 }, (_, i) => 17 - i);
      const gaps: number[] = [];
      let left = reversals;
      while (pool.length > 0) {
        const longerAfter = Math.min(left, pool.length - 1);
        gaps.push(pool.splice(longerAfter, 1)[0]);
        left -= longerAfter;
      }
      return gaps;
    };
    expect(reverseArrangements(gapsWithReversals(88)).count).toBe(88);
    expect(reverseArrangementsTrend(gapsWithReversals(88), 0.95)).toBe('none');
    expect(reverseArrangementsTrend(gapsWithReversals(89), 0.95)).toBe('improving');
    expect(reverseArrangements(gapsWithReversals(48), 0.95)).toEqual({ count: 48, significant: false, critical: 47 });
    expect(reverseArrangements(gapsWithReversals(47), 0.95)).toEqual({ count: 47, significant: true, critical: 47 });
    expect(reverseArrangementsTrend(gapsWithReversals(47), 0.95)).toBe('worsening');
  });

  it('when the 11 failures of the growth example are turned into gaps, then there are 40 reversals', () => {
    // SEMI E10-0304E, Appendix 2 reliability-growth (AMSAA/Crow) example
    const times = [18, 20, 35, 41, 67, 180, 252, 287, 390, 410, 511];
    const gaps = times.map((t, i) => t - (i === 0 ? 0 : times[i - 1]));
    expect(reverseArrangements(gaps).count).toBe(40);
  });
});

describe('Crow-AMSAA reliability growth', () => {
  it('when 11 failures occur in 550 productive hours, then β̂ = 0.5731, slope 0.43 and instantaneous MTBF 87.2 h', () => {
    // SEMI E10-0304E, Appendix 2 reliability-growth (AMSAA/Crow) example
    const fit = crowAmsaa([18, 20, 35, 41, 67, 180, 252, 287, 390, 410, 511], 550);
    expect(fit).not.toBeNull();
    expectWithin(fit!.beta, 0.5731, 0.00005);
    expectWithin(fit!.slope, 0.43, 0.005);
    expectWithin(fit!.instantaneousMtbf, 87.2, 0.05);
    // computed to the precision of the formula: 550 / (11 · 0.573104) = 87.244 h
    expectWithin(fit!.instantaneousMtbf, 87.244, HOURS);
    // versus the cumulative MTBF of 550 / 11 = 50 h that ignores the growth
    expect(fit!.instantaneousMtbf).toBeGreaterThan(550 / 11);
  });
});
