// Checks of the alarm logic against published values. SEMI E5 (SECS-II) data item dictionary,
// ALCD; and common practice (alarm-management guidance: ISA-18.2 / IEC 62682 / EEMUA 191, from
// secondary sources, with check values computed from those rules).

import { describe, expect, it } from 'vitest';
import { ALARM_CATEGORY_LABELS, alarmLoad, decodeAlcd, isChattering, isStale } from '@shared/alarms';

describe('decodeAlcd (SEMI E5, data item dictionary: ALCD)', () => {
  it('when bit 8 and the category bits are read, then the published examples decode as given', () => {
    // SEMI E5 data item dictionary, ALCD: bit 8 set = alarm set; bits 7–1 = category.
    expect(decodeAlcd(0x81)).toEqual({ set: true, category: 1 }); // set, personal safety
    expect(decodeAlcd(0x06)).toEqual({ set: false, category: 6 }); // cleared, equipment status warning
    expect(decodeAlcd(0x84)).toEqual({ set: true, category: 4 }); // set, parameter control error
    expect(decodeAlcd(0x88)).toEqual({ set: true, category: 8 }); // set, data integrity
    expect(decodeAlcd(0x05)).toEqual({ set: false, category: 5 }); // cleared, irrecoverable error
  });

  it('when the categories are labelled, then they follow the SEMI E5 ALCD list', () => {
    expect(ALARM_CATEGORY_LABELS[1]).toBe('Personal safety');
    expect(ALARM_CATEGORY_LABELS[2]).toBe('Equipment safety');
    expect(ALARM_CATEGORY_LABELS[5]).toBe('Irrecoverable error');
    expect(ALARM_CATEGORY_LABELS[8]).toBe('Data integrity');
  });

  it('when the byte is out of range, then it is refused', () => {
    expect(() => decodeAlcd(256)).toThrow(RangeError);
    expect(() => decodeAlcd(-1)).toThrow(RangeError);
  });
});

describe('isChattering (common practice, alarm-management guidance: 3 sets within one minute)', () => {
  it('when an alarm sets at 0, 20 and 45 s, then it is chattering', () => {
    expect(isChattering([0, 20_000, 45_000])).toBe(true);
  });
  it('when an alarm sets at 0, 35 and 70 s, then it is not (at most two in any 60 s)', () => {
    expect(isChattering([0, 35_000, 70_000])).toBe(false);
  });
  it('when the count and window are set, then they are used', () => {
    expect(isChattering([0, 35_000, 70_000], { windowMs: 90_000 })).toBe(true);
    expect(isChattering([0, 20_000, 45_000], { count: 4 })).toBe(false);
  });
});

describe('alarmLoad (common practice, alarm-management guidance; computed check values)', () => {
  it('when 1,200 alarms fall in 30 days, then 40 a day, 1.667 an hour, 0.278 per 10 minutes', () => {
    const from = Date.UTC(2025, 2, 1);
    const to = from + 30 * 86_400_000;
    const step = (to - from) / 1200;
    const sets = Array.from({ length: 1200 }, (_, i) => from + i * step);
    const load = alarmLoad(sets, from, to);
    expect(load.count).toBe(1200);
    expect(load.perDay).toBeCloseTo(40, 6);
    expect(load.perHour).toBeCloseTo(1.667, 3);
    expect(load.per10Min).toBeCloseTo(0.278, 3);
    expect(load.periods).toBe(4320);
    expect(load.floodPeriods).toBe(0);
  });

  it('when 2 of 144 ten-minute periods hold more than 10 alarms, then 1.39 % in flood; exactly 10 is not a flood', () => {
    const from = Date.UTC(2025, 2, 1);
    const to = from + 24 * 3_600_000; // 144 periods
    const sets: number[] = [];
    for (let i = 0; i < 11; i++) sets.push(from + i * 1000); // period 0: 11 → flood
    for (let i = 0; i < 12; i++) sets.push(from + 50 * 600_000 + i * 1000); // period 50: 12 → flood
    for (let i = 0; i < 10; i++) sets.push(from + 100 * 600_000 + i * 1000); // period 100: exactly 10 → not
    const load = alarmLoad(sets, from, to);
    expect(load.periods).toBe(144);
    expect(load.floodPeriods).toBe(2);
    expect(load.floodPct).toBeCloseTo(1.39, 2);
  });
});

describe('isStale (common practice, alarm-management guidance: set for more than 24 hours)', () => {
  it('when set at 2025-03-01T06:00Z and still set at 2025-03-02T06:00:01Z, then stale; at 05:59Z, not', () => {
    const set = Date.parse('2025-03-01T06:00:00Z');
    expect(isStale(set, Date.parse('2025-03-02T06:00:01Z'))).toBe(true);
    expect(isStale(set, Date.parse('2025-03-02T05:59:00Z'))).toBe(false);
  });
});
