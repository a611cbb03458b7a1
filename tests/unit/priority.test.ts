import { describe, expect, it } from 'vitest';
import {
  PRIORITIES,
  PRIORITY_LABELS,
  PRIORITY_MATRIX,
  SERVICE_TARGET_DEFAULTS,
  computePriority,
  targetStatus,
  type Criticality,
  type Level,
  type Priority,
  type PriorityInput,
} from '@shared/priority';
import { HAZARDS, type Impact } from '@shared/report-options';

// Priority from impact × urgency is common service-desk practice; the grid itself and the
// service targets are Faultline's own design (no published check values). The expectations
// are written out here by hand as the specification.

function input(overrides: Partial<PriorityInput>): PriorityInput {
  return { impact: 'still_usable', hazards: [], wafersAtRisk: 0, criticality: 'normal', ...overrides };
}

describe('priority matrix', () => {
  const EXPECTED: Array<[impact: Level, urgency: Level, priority: Priority]> = [
    ['high', 'high', 'P1'],
    ['high', 'medium', 'P2'],
    ['high', 'low', 'P2'],
    ['medium', 'high', 'P1'],
    ['medium', 'medium', 'P2'],
    ['medium', 'low', 'P3'],
    ['low', 'high', 'P1'],
    ['low', 'medium', 'P3'],
    ['low', 'low', 'P4'],
  ];

  it.each(EXPECTED)('when impact is %s and urgency %s, then the matrix gives %s', (impact, urgency, priority) => {
    expect(PRIORITY_MATRIX[impact][urgency]).toBe(priority);
  });

  it('when priorities are listed, then they run P1 to P4 with a label each', () => {
    expect([...PRIORITIES]).toEqual(['P1', 'P2', 'P3', 'P4']);
    for (const p of PRIORITIES) expect(PRIORITY_LABELS[p].startsWith(`${p} · `)).toBe(true);
  });
});

describe('computePriority without hazards (impact × criticality × wafers)', () => {
  // [reported impact, criticality, wafers left, expected impact level, urgency, priority]
  const EXPECTED: Array<[Impact, Criticality, number, Level, Level, Priority]> = [
    ['tool_stopped', 'normal', 0, 'high', 'low', 'P2'],
    ['tool_stopped', 'normal', 3, 'high', 'medium', 'P2'],
    ['tool_stopped', 'high', 0, 'high', 'low', 'P2'],
    ['tool_stopped', 'low', 0, 'medium', 'low', 'P3'],
    ['tool_stopped', 'low', 1, 'medium', 'medium', 'P2'],
    ['tool_limited', 'normal', 0, 'medium', 'low', 'P3'],
    ['tool_limited', 'normal', 2, 'medium', 'medium', 'P2'],
    ['tool_limited', 'high', 0, 'high', 'low', 'P2'],
    ['tool_limited', 'low', 0, 'low', 'low', 'P4'],
    ['tool_limited', 'low', 2, 'low', 'medium', 'P3'],
    ['still_usable', 'normal', 0, 'low', 'low', 'P4'],
    ['still_usable', 'normal', 1, 'low', 'medium', 'P3'],
    ['still_usable', 'high', 0, 'medium', 'low', 'P3'],
    ['still_usable', 'high', 4, 'medium', 'medium', 'P2'],
    ['still_usable', 'low', 0, 'low', 'low', 'P4'],
  ];

  it.each(EXPECTED)(
    'when a %s report on a %s-criticality tool leaves %i wafers, then impact %s, urgency %s, %s',
    (impact, criticality, wafers, impactLevel, urgencyLevel, priority) => {
      const result = computePriority(input({ impact, criticality, wafersAtRisk: wafers }));
      expect(result).toMatchObject({ impactLevel, urgencyLevel, priority });
    },
  );
});

describe('computePriority with hazards', () => {
  it.each(HAZARDS)('when the hazard "%s" is reported on a still-usable low-criticality tool, then it is P1', (hazard) => {
    const result = computePriority(input({ impact: 'still_usable', criticality: 'low', hazards: [hazard] }));
    expect(result.priority).toBe('P1');
    expect(result.urgencyLevel).toBe('high');
    expect(result.impactLevel).toBe('low');
  });

  it('when a smell is reported, then the reasons say so in plain words', () => {
    const result = computePriority(input({ hazards: ['smell'] }));
    expect(result.reasons).toEqual(['Hazard reported: unusual smell']);
  });

  it('when the same hazard is sent twice, then it is listed once', () => {
    const result = computePriority(input({ hazards: ['leak', 'leak', 'electrical'] }));
    expect(result.reasons).toEqual(['Hazard reported: leak or spill', 'Hazard reported: electrical danger']);
  });
});

describe('computePriority: wafers and urgency', () => {
  it('when wafers are left in the tool but known to be safe, then urgency stays low and no wafer reason is given', () => {
    const result = computePriority(input({ impact: 'tool_limited', wafersAtRisk: 5, wafersKnownSafe: true }));
    expect(result).toMatchObject({ urgencyLevel: 'low', priority: 'P3' });
    expect(result.reasons.some((r) => r.includes('wafer'))).toBe(false);
  });

  it('when the wafer count is not a sensible number, then it is treated as no wafers', () => {
    expect(computePriority(input({ wafersAtRisk: Number.NaN })).urgencyLevel).toBe('low');
    expect(computePriority(input({ wafersAtRisk: -2 })).urgencyLevel).toBe('low');
  });
});

describe('computePriority: reasons', () => {
  it('when a limited high-criticality tool holds two wafers, then every cause is listed in order', () => {
    const result = computePriority(input({ impact: 'tool_limited', criticality: 'high', wafersAtRisk: 2 }));
    expect(result.reasons).toEqual(['Tool limited', 'High-criticality tool', '2 wafers left in the tool']);
    expect(result.priority).toBe('P2');
  });

  it('when one wafer is left, then the reason uses the singular', () => {
    expect(computePriority(input({ wafersAtRisk: 1 })).reasons).toEqual(['1 wafer left in the tool']);
  });

  it('when criticality cannot move the level any further, then it is not given as a reason', () => {
    expect(computePriority(input({ impact: 'tool_stopped', criticality: 'high' })).reasons).toEqual(['Tool stopped']);
    expect(computePriority(input({ impact: 'still_usable', criticality: 'low' })).reasons).toEqual([]);
  });

  it('when a low-criticality tool lowers the impact, then the reasons say it was lowered', () => {
    const result = computePriority(input({ impact: 'tool_stopped', criticality: 'low' }));
    expect(result.reasons).toEqual(['Tool stopped', 'Low-criticality tool (impact lowered one step)']);
  });
});

describe('service targets', () => {
  it('when no targets are configured, then the defaults get looser from P1 to P4', () => {
    expect(SERVICE_TARGET_DEFAULTS).toEqual({
      P1: { acknowledgeMinutes: 15, restoreMinutes: 240 },
      P2: { acknowledgeMinutes: 60, restoreMinutes: 1440 },
      P3: { acknowledgeMinutes: 240, restoreMinutes: 4320 },
      P4: { acknowledgeMinutes: 1440, restoreMinutes: 14400 },
    });
  });

  it.each([
    [0, 60, 'ok'],
    [44, 60, 'ok'],
    [44.9, 60, 'ok'],
    [45, 60, 'warning'],
    [59, 60, 'warning'],
    [60, 60, 'warning'],
    [60.5, 60, 'missed'],
    [500, 60, 'missed'],
    [-3, 15, 'ok'],
    [11.25, 15, 'warning'],
  ] as const)('when %d of %d minutes have passed, then the timer is %s', (elapsed, target, status) => {
    expect(targetStatus(elapsed, target)).toBe(status);
  });

  it('when a target is zero, negative or not a number, then it is rejected', () => {
    expect(() => targetStatus(10, 0)).toThrow(RangeError);
    expect(() => targetStatus(10, -5)).toThrow(RangeError);
    expect(() => targetStatus(10, Number.NaN)).toThrow(RangeError);
    expect(() => targetStatus(Number.NaN, 10)).toThrow(RangeError);
  });
});
