import { describe, expect, it } from 'vitest';
import { mtbfBounds, reverseArrangements, reverseArrangementsTrend } from '@shared/reliability';
import {
  addHours,
  countReversals,
  emptyTally,
  figuresOf,
  mtbfBoundsFast,
  trendOf,
  trendOfGaps,
} from '../../server/modules/analytics/figures';
import { planPeriod } from '../../server/modules/analytics/period-plan';
import { createRandom } from '../../server/db/seed/random';

// The analytics server caches the per-failure-count MTBF factors and the per-size reversal
// critical values; these checks hold the cached paths to the shared functions they stand for.

describe('analytics figures: cached paths agree with shared/reliability.ts', () => {
  it('when MTBF bounds are scaled from per-hour factors, then they equal mtbfBounds to 1e-9 relative', () => {
    for (const failures of [0, 1, 2, 6, 17, 120]) {
      for (const hours of [0.5, 72, 800, 1200, 8760, 331_000]) {
        const direct = mtbfBounds({ hours, failures, confidence: 0.9, sides: 2 });
        const fast = mtbfBoundsFast(hours, failures);
        for (const key of ['point', 'lower', 'upper'] as const) {
          if (direct[key] === null) expect(fast[key]).toBeNull();
          else expect(Math.abs((fast[key] as number) - (direct[key] as number)) / (direct[key] as number)).toBeLessThan(1e-9);
        }
      }
    }
    // NIST/SEMATECH e-Handbook §8.4.5.1 example: 800 h, 2 failures → 90 % interval (127.07, 2251.23) h.
    const nist = mtbfBoundsFast(800, 2);
    expect(nist.lower).toBeCloseTo(127.07, 1);
    expect(nist.upper).toBeCloseTo(2251.23, 1);
  });

  it('when the trend is decided with cached critical values, then it matches reverseArrangementsTrend on random and published gaps', () => {
    const rnd = createRandom(7);
    for (let k = 0; k < 400; k++) {
      const n = rnd.int(0, 70);
      const drift = rnd.next() * 2 - 1;
      const gaps = Array.from({ length: n }, (_, i) => Math.max(0, rnd.exp(100) * (1 + drift * (i / Math.max(1, n)))));
      expect(trendOfGaps(gaps).trend).toBe(reverseArrangementsTrend(gaps, 0.95));
      expect(countReversals(gaps)).toBe(reverseArrangements(gaps, 0.95).count);
    }
    // SEMI E10-0304E Appendix 2: failures at 30, 160, 220, 360 h → gaps 30, 130, 60, 140, 5 reversals.
    expect(trendOfGaps([30, 130, 60, 140]).count).toBe(5);
  });

  it('when failures start at known times, then the gaps are counted from the start of the period', () => {
    const from = Date.UTC(2024, 0, 1);
    const h = 3_600_000;
    // SEMI E10-0304E Appendix 2 growth example: 550 h, failures at 18 … 511 h → β̂ = 0.5731.
    const times = [18, 20, 35, 41, 67, 180, 252, 287, 390, 410, 511];
    const result = trendOf(
      times.map((t) => from + t * h),
      from,
      from + 550 * h,
    );
    expect(result.crowBeta).toBeCloseTo(0.5731, 4);
    // 40 reversals in the published example.
    expect(result.reversals).toBe(40);
  });
});

describe('analytics figures: E10 inputs from state hours', () => {
  it('when hours carry sub-reasons, then repair, delays and facilities land where E10 wants them', () => {
    // Our own invented scenario built on the E10 formulas (see the reference tests): 168 h.
    const tally = emptyTally();
    addHours(tally, 'productive', 'none', 80);
    addHours(tally, 'standby', 'none', 36);
    addHours(tally, 'engineering', 'process_development', 6);
    addHours(tally, 'scheduled_downtime', 'preventive_maintenance', 7);
    addHours(tally, 'scheduled_downtime', 'maintenance_delay_user', 1);
    addHours(tally, 'scheduled_downtime', 'maintenance_delay_supplier', 1);
    addHours(tally, 'scheduled_downtime', 'facilities_related', 2);
    addHours(tally, 'scheduled_downtime', 'consumables_change', 1);
    addHours(tally, 'unscheduled_downtime', 'repair', 6);
    addHours(tally, 'unscheduled_downtime', 'maintenance_delay_user', 3);
    addHours(tally, 'unscheduled_downtime', 'out_of_spec_input', 1);
    addHours(tally, 'non_scheduled', 'not_staffed', 24);
    tally.failures = 4;
    tally.downtimeEvents = 6;
    const f = figuresOf(tally);
    expect(f.downtime).toEqual({
      maintenanceDelayUser: 4,
      maintenanceDelaySupplier: 1,
      facilitiesRelated: 2,
      outOfSpecInput: 1,
      repair: 6,
    });
    expect(f.availabilityPct).toBeCloseTo(84.722, 3); // 122 / 144, as in the E10 scenario
    expect(f.mttrHours).toBeCloseTo(1.5, 10);
    expect(f.mtolHours).toBeCloseTo(22 / 6, 10);
    // MTBF over uptime (not productive time): 122 / 4.
    expect(f.mtbf.point).toBeCloseTo(30.5, 10);
  });

  it('when a period is split, then whole UTC months go to the rollup and the edges stay raw within one month each', () => {
    const now = new Date('2026-06-15T12:00:00Z');
    const plan = planPeriod(new Date('2025-06-15T12:00:00Z'), now, now);
    expect(plan.rollup).toEqual({ from: new Date('2025-07-01T00:00:00Z'), to: new Date('2026-06-01T00:00:00Z') });
    expect(plan.raw).toEqual([
      { from: new Date('2025-06-15T12:00:00Z'), to: new Date('2025-07-01T00:00:00Z') },
      { from: new Date('2026-06-01T00:00:00Z'), to: now },
    ]);
    expect(plan.months).toHaveLength(13);
    // Inside one month, nothing comes from the rollup; across one boundary, two raw pieces.
    expect(planPeriod(new Date('2026-03-03T00:00:00Z'), new Date('2026-03-09T00:00:00Z'), now)).toMatchObject({ rollup: null, raw: [{}] });
    expect(planPeriod(new Date('2026-03-03T00:00:00Z'), new Date('2026-04-09T00:00:00Z'), now).raw).toHaveLength(2);
    // The end is clipped to now; a period that starts later is empty.
    expect(planPeriod(new Date('2026-06-10T00:00:00Z'), new Date('2027-01-01T00:00:00Z'), now).to).toEqual(now);
    expect(planPeriod(new Date('2026-07-01T00:00:00Z'), new Date('2027-01-01T00:00:00Z'), now).months).toEqual([]);
  });
});
