// Checks of the requalification and preventive-maintenance arithmetic against the check
// values in the project's references. Each check names its source; "computed" marks a
// figure derived from the published formula rather than printed in the source, "common
// practice" a fact of the trade with no published source, "from memory" data recalled
// rather than copied from the source.

import { describe, expect, it } from 'vitest';
import { capability, individualsChart, judgeLimits, parseMeasurementColumn, uniformity } from '@shared/requalification';
import { isWithinLead, nextDue } from '@shared/maintenance-plan';

function expectWithin(actual: number | null, expected: number, tolerance: number): void {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected), `${actual} vs ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

// Nine-point film thickness example (nm), computed after SEMI MF1618's definitions
// (sample standard deviation, n − 1, common practice).
const NINE_POINTS = [1012, 1005, 998, 1003, 995, 1001, 1008, 990, 1000];

describe('uniformity', () => {
  it('when the nine-point film example is summarised, then mean, range, s and every non-uniformity figure match', () => {
    const u = uniformity(NINE_POINTS);
    expect(u.n).toBe(9);
    expectWithin(u.mean, 1001.333, 0.0005); // nine-point film example (computed)
    expect(u.min).toBe(990);
    expect(u.max).toBe(1012);
    expect(u.range).toBe(22); // nine-point film example (computed)
    expectWithin(u.halfRangePct, 1.0985, 0.00005); // half-range (max − min)/(2·mean), common practice for spun resist
    expectWithin(u.rangePct, 2.1971, 0.00005); // range (max − min)/mean (computed)
    expectWithin(u.stdDev, 6.6708, 0.00005); // sample s, SEMI MF1618 (computed)
    expectWithin(u.sigmaPct, 0.6662, 0.00005); // 1σ/mean, SEMI MF1618 (computed)
    expectWithin(u.threeSigmaPct, 1.9986, 0.00005); // 3σ/mean (computed)
  });

  it('when there is one value, then the spread is zero and the standard deviation is unknown (null), not 0', () => {
    const u = uniformity([1000]);
    expect(u).toMatchObject({ n: 1, mean: 1000, min: 1000, max: 1000, range: 0, stdDev: null, sigmaPct: null });
    expect(u.halfRangePct).toBe(0);
  });

  it('when all values are equal, then range, s and every non-uniformity figure are 0', () => {
    const u = uniformity([90, 90, 90, 90, 90]);
    expect(u).toMatchObject({ mean: 90, range: 0, stdDev: 0, halfRangePct: 0, rangePct: 0, sigmaPct: 0, threeSigmaPct: 0 });
  });

  it('when the mean is 0, then the percentages are null rather than infinite', () => {
    const u = uniformity([-1, 1]);
    expect(u.halfRangePct).toBeNull();
    expect(u.sigmaPct).toBeNull();
  });

  it('when there are no values or one is not a number, then it refuses', () => {
    expect(() => uniformity([])).toThrow(RangeError);
    expect(() => uniformity([1, Number.NaN])).toThrow(RangeError);
  });
});

describe('capability', () => {
  it('when USL 20, LSL 8, μ 16, σ 2, then Cp 1.0, Cpu 0.667, Cpl 1.333, Cpk 0.667', () => {
    // NIST/SEMATECH e-Handbook §6.1.6 "What is process capability?" example (from memory; recomputed)
    const c = capability({ mean: 16, stdDev: 2, lsl: 8, usl: 20 });
    expectWithin(c.cp, 1.0, 0.0005);
    expectWithin(c.cpu, 0.667, 0.0005);
    expectWithin(c.cpl, 1.333, 0.0005);
    expectWithin(c.cpk, 0.667, 0.0005);
  });

  it('when the nine points are held to 1000 ± 30 nm, then Cp 1.4991 and Cpk 1.4324', () => {
    // NIST/SEMATECH e-Handbook §6.1.6 formulas applied to the nine-point film example (computed)
    const u = uniformity(NINE_POINTS);
    const c = capability({ mean: u.mean, stdDev: u.stdDev, lsl: 970, usl: 1030 });
    expectWithin(c.cp, 1.4991, 0.00005);
    expectWithin(c.cpk, 1.4324, 0.00005);
  });

  it('when only an upper limit is given, then Cp and Cpl are null and Cpk is Cpu', () => {
    // one-sided limit: NIST/SEMATECH e-Handbook §6.1.6 (Cpk is the side that exists)
    const c = capability({ mean: 16, stdDev: 2, usl: 20 });
    expect(c.cp).toBeNull();
    expect(c.cpl).toBeNull();
    expectWithin(c.cpu, 0.667, 0.0005);
    expect(c.cpk).toBe(c.cpu);
  });

  it('when only a lower limit is given, then Cpk is Cpl', () => {
    const c = capability({ mean: 16, stdDev: 2, lsl: 8 });
    expect(c.cp).toBeNull();
    expect(c.cpu).toBeNull();
    expectWithin(c.cpk, 1.333, 0.0005);
  });

  it('when all values are equal (σ 0) or there is one value (σ unknown), then every index is null', () => {
    expect(capability({ mean: 90, stdDev: 0, lsl: 88, usl: 92 })).toEqual({ cp: null, cpu: null, cpl: null, cpk: null });
    expect(capability({ mean: 90, stdDev: null, lsl: 88, usl: 92 })).toEqual({ cp: null, cpu: null, cpl: null, cpk: null });
  });

  it('when the lower limit is above the upper, then it refuses', () => {
    expect(() => capability({ mean: 1, stdDev: 1, lsl: 5, usl: 2 })).toThrow(RangeError);
  });
});

describe('individuals control chart', () => {
  // NIST/SEMATECH e-Handbook §6.3.2.2 "Control charts for individual observations"
  // (data from memory; recomputed): centre x̄, limits x̄ ± 3·MR̄/1.128, MR limit 3.267·MR̄.
  const DATA = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1];

  it('when the handbook series is charted, then x̄ 50.81, MR̄ 1.8778, UCL 55.80, LCL 45.82, MR limit 6.13, none beyond', () => {
    const chart = individualsChart(DATA);
    expectWithin(chart.center, 50.81, 0.005);
    expectWithin(chart.mrBar, 1.8778, 0.00005);
    expectWithin(chart.ucl, 55.8, 0.005);
    expectWithin(chart.lcl, 45.82, 0.005);
    expectWithin(chart.mrUcl, 6.13, 0.005);
    expect(chart.beyond).toEqual([]);
  });

  it('when one point lies beyond the limits, then its index is in beyond (Western Electric rule 1)', () => {
    const chart = individualsChart([...DATA, 70]);
    expect(chart.beyond).toEqual([10]);
  });

  it('when there is one point, then there is a centre but no limits', () => {
    expect(individualsChart([5])).toEqual({ center: 5, mrBar: null, ucl: null, lcl: null, mrUcl: null, beyond: [] });
  });

  it('when every point is equal, then the limits collapse on the centre and no point is beyond', () => {
    const chart = individualsChart([3, 3, 3]);
    expect(chart).toMatchObject({ center: 3, mrBar: 0, ucl: 3, lcl: 3, beyond: [] });
  });
});

describe('pass/fail per limit and pasted columns', () => {
  it('when resist thickness half-range is held to ±1 %, then the nine points fail it and pass the mean window', () => {
    // Limits here are illustrative: ±100 Å on ~1 µm resist is common practice (≈ ±1 %).
    const verdicts = judgeLimits(uniformity(NINE_POINTS), [
      { figure: 'halfRangePct', min: null, max: 1 },
      { figure: 'mean', min: 970, max: 1030 },
    ]);
    expect(verdicts.map((v) => v.pass)).toEqual([false, true]);
  });

  it('when a figure cannot be computed (one value, σ limit), then the limit fails', () => {
    expect(judgeLimits(uniformity([1000]), [{ figure: 'sigmaPct', min: null, max: 2 }])[0].pass).toBe(false);
  });

  it('when a metrology column is pasted with a header, tabs and decimal commas, then the numbers are read and bad lines named', () => {
    const parsed = parseMeasurementColumn('site\tthickness\n1\t1012,5\n2\t1005\n\nx?\n3\t998');
    expect(parsed.values).toEqual([1012.5, 1005, 998]);
    expect(parsed.badLines).toEqual([5]);
  });
});

describe('next due date', () => {
  it('when done 2025-01-15T08:00Z every 90 days, then due 2025-04-15T08:00Z with a 1.25× limit of 2025-05-07T20:00Z', () => {
    // Preventive maintenance due-date example (computed; interval from the completion is
    // common practice, the 1.25× grace after US NRC STS SR 3.0.2)
    const due = nextDue({ everyDays: 90, lastDoneAt: '2025-01-15T08:00:00Z' });
    expect(due.dueAt).toBe('2025-04-15T08:00:00.000Z');
    expect(due.graceUntil).toBe('2025-05-07T20:00:00.000Z');
    expect(due).toMatchObject({ dueAtCounter: null, unitsLeft: null, usedPct: null, graceUntilCounter: null });
  });

  it('when the PM is done late on 2025-04-20, then the next is due 2025-07-19 (from the completion)', () => {
    // due-date example (computed): the next interval runs from the actual completion
    const due = nextDue({ everyDays: 90, lastDoneAt: '2025-04-20T08:00:00Z' });
    expect(due.dueAt?.slice(0, 10)).toBe('2025-07-19');
  });

  it('when every 5,000 wafers from 12,340 and the counter reads 16,900, then 91.2 % used, 440 left, due at 17,340', () => {
    // usage due-date example (computed): usage plans count from the reading at completion
    const due = nextDue({ everyUnits: 5000, lastDoneAt: '2025-01-15T08:00:00Z', lastDoneCounter: 12340, counterNow: 16900 });
    expect(due.dueAtCounter).toBe(17340);
    expect(due.unitsLeft).toBe(440);
    expectWithin(due.usedPct, 91.2, 1e-9);
    expect(due.graceUntilCounter).toBe(18590);
    expect(due.dueAt).toBeNull();
  });

  it('when a plan has both triggers, then both due points are given and the lead opens at whichever comes first', () => {
    const due = nextDue({ everyDays: 90, everyUnits: 5000, lastDoneAt: '2025-01-15T08:00:00Z', lastDoneCounter: 12340, counterNow: 16900 });
    // calendar far away, usage within a 500-wafer lead: opens by usage
    expect(isWithinLead(due, { leadDays: 7, leadUnits: 500 }, new Date('2025-02-01T00:00:00Z'), 16900)).toBe(true);
    // usage still 440 away with a 100-wafer lead, calendar 7-day lead reached on 2025-04-08T08:00Z
    expect(isWithinLead(due, { leadDays: 7, leadUnits: 100 }, new Date('2025-04-08T07:59:59Z'), 16900)).toBe(false);
    expect(isWithinLead(due, { leadDays: 7, leadUnits: 100 }, new Date('2025-04-08T08:00:00Z'), 16900)).toBe(true);
  });

  it('when the grace factor is set or invalid, then it is used or refused', () => {
    expect(nextDue({ everyDays: 10, lastDoneAt: '2025-01-01T00:00:00Z', graceFactor: 1.5 }).graceUntil).toBe('2025-01-16T00:00:00.000Z');
    expect(() => nextDue({ everyDays: 10, lastDoneAt: '2025-01-01T00:00:00Z', graceFactor: 0.5 })).toThrow(RangeError);
    expect(() => nextDue({ lastDoneAt: '2025-01-01T00:00:00Z' })).toThrow(RangeError);
    expect(() => nextDue({ everyDays: -1, lastDoneAt: '2025-01-01T00:00:00Z' })).toThrow(RangeError);
  });
});
