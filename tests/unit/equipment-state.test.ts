import { describe, expect, it } from 'vitest';
import {
  BOARD_LOOK,
  BOARD_STATUSES,
  E10_STATES,
  REASONS_BY_STATE,
  boardStatusOf,
  isDownState,
  isReasonAllowed,
  rollUp,
  type E10State,
} from '@shared/equipment-state';
import { summarizeStatus, type OpenModuleState, type OpenState } from '../../server/modules/facility/status-summary';

// The six states are SEMI E10's (SEMI E10-0304E, section 4: productive, standby, engineering,
// scheduled downtime, unscheduled downtime, non-scheduled time). How they read on the board
// (Running, Limited, Down, ...) and the roll-up from modules are Faultline's own rules, written
// out here by hand as the specification.

describe('board status of an E10 state', () => {
  it.each<[E10State, string]>([
    ['productive', 'running'],
    ['standby', 'running'],
    ['engineering', 'engineering'],
    ['scheduled_downtime', 'maintenance'],
    ['unscheduled_downtime', 'down'],
    ['non_scheduled', 'offline'],
  ])('when the state is %s, then the board says %s', (state, status) => {
    expect(boardStatusOf(state)).toBe(status);
  });

  it('when a module is in downtime or non-scheduled, then it counts as down for the roll-up; running and engineering do not', () => {
    expect(E10_STATES.filter(isDownState)).toEqual(['scheduled_downtime', 'unscheduled_downtime', 'non_scheduled']);
  });

  it('when each board status is drawn, then no two share a colour or a shape (state never rests on colour alone)', () => {
    const shapes = BOARD_STATUSES.map((s) => BOARD_LOOK[s].shape);
    const tones = BOARD_STATUSES.map((s) => BOARD_LOOK[s].tone);
    expect(new Set(shapes).size).toBe(BOARD_STATUSES.length);
    expect(new Set(tones).size).toBe(BOARD_STATUSES.length);
  });
});

describe('roll-up from modules', () => {
  it('when a running tool has no modules, then it reads Running', () => {
    expect(rollUp('productive', [])).toBe('running');
  });

  it('when every module runs, then the tool reads Running', () => {
    expect(rollUp('standby', ['productive', 'standby', 'engineering'])).toBe('running');
  });

  it('when some modules are down, then a running tool reads Limited', () => {
    expect(rollUp('productive', ['productive', 'unscheduled_downtime', 'standby'])).toBe('limited');
    expect(rollUp('standby', ['scheduled_downtime', 'productive'])).toBe('limited');
    expect(rollUp('standby', ['non_scheduled', 'productive'])).toBe('limited');
  });

  it('when all modules are down, then a running tool reads Down', () => {
    expect(rollUp('productive', ['unscheduled_downtime', 'unscheduled_downtime'])).toBe('down');
    expect(rollUp('standby', ['scheduled_downtime', 'unscheduled_downtime', 'non_scheduled'])).toBe('down');
  });

  it('when the tool itself is not running, then its own state wins over its modules', () => {
    expect(rollUp('scheduled_downtime', ['productive', 'productive'])).toBe('maintenance');
    expect(rollUp('unscheduled_downtime', ['productive'])).toBe('down');
    expect(rollUp('engineering', ['unscheduled_downtime'])).toBe('engineering');
    expect(rollUp('non_scheduled', [])).toBe('offline');
  });

  it('when a restriction is in force on a running tool, then it reads Limited even with all modules up', () => {
    expect(rollUp('productive', ['productive'], true)).toBe('limited');
    expect(rollUp('productive', [], true)).toBe('limited');
  });
});

describe('reasons by state', () => {
  it('when a reason belongs to a state, then it is allowed there and the first one is the default', () => {
    expect(isReasonAllowed('unscheduled_downtime', 'waiting_parts')).toBe(true);
    expect(isReasonAllowed('scheduled_downtime', 'preventive_maintenance')).toBe(true);
    expect(REASONS_BY_STATE.unscheduled_downtime[0]).toBe('repair');
  });

  it('when a reason belongs elsewhere, then it is refused', () => {
    expect(isReasonAllowed('productive', 'repair')).toBe(false);
    expect(isReasonAllowed('standby', 'waiting_parts')).toBe(false);
  });
});

describe('what the board says about a tool (status, since, why, back when)', () => {
  const t = (iso: string) => new Date(`2025-03-10T${iso}:00.000Z`);
  const tool = (over: Partial<OpenState> = {}): OpenState => ({
    state: 'standby',
    note: null,
    restriction: null,
    startedAt: t('06:00'),
    expectedReturnAt: null,
    ...over,
  });
  const mod = (code: string, over: Partial<OpenModuleState> = {}): OpenModuleState => ({
    code,
    name: `Chamber ${code}`,
    state: 'productive',
    note: null,
    startedAt: t('06:00'),
    expectedReturnAt: null,
    ...over,
  });

  it('when the tool itself is down, then its own start, note and return time are shown', () => {
    const s = summarizeStatus(
      tool({ state: 'unscheduled_downtime', note: 'Turbo pump tripped', startedAt: t('08:00'), expectedReturnAt: t('18:00') }),
      [mod('A')],
    );
    expect(s).toEqual({ status: 'down', since: t('08:00'), note: 'Turbo pump tripped', expectedReturnAt: t('18:00') });
  });

  it('when one of two modules is down, then Limited since that module went down, with its name and note', () => {
    const s = summarizeStatus(tool(), [
      mod('A'),
      mod('B', { state: 'unscheduled_downtime', note: 'RF match fault', startedAt: t('09:30'), expectedReturnAt: t('15:00') }),
    ]);
    expect(s.status).toBe('limited');
    expect(s.since).toEqual(t('09:30'));
    expect(s.note).toBe('Chamber B down: RF match fault');
    expect(s.expectedReturnAt).toEqual(t('15:00'));
  });

  it('when all modules are down, then Down since the last of them went down; back when the last returns', () => {
    const s = summarizeStatus(tool(), [
      mod('A', { state: 'unscheduled_downtime', startedAt: t('07:00'), expectedReturnAt: t('12:00') }),
      mod('B', { state: 'scheduled_downtime', startedAt: t('09:00'), expectedReturnAt: t('16:00') }),
    ]);
    expect(s.status).toBe('down');
    expect(s.since).toEqual(t('09:00'));
    expect(s.expectedReturnAt).toEqual(t('16:00'));
    expect(s.note).toBe('Chamber A down; Chamber B in maintenance');
  });

  it('when any down module has no return time, then no return time is promised', () => {
    const s = summarizeStatus(tool(), [
      mod('A', { state: 'unscheduled_downtime', expectedReturnAt: t('12:00') }),
      mod('B', { state: 'unscheduled_downtime' }),
      mod('C'),
    ]);
    expect(s.expectedReturnAt).toBeNull();
  });

  it('when a running tool carries a restriction, then Limited with the restriction as the reason', () => {
    const s = summarizeStatus(tool({ restriction: '100 mm wafers only', startedAt: t('10:00') }), []);
    expect(s).toEqual({ status: 'limited', since: t('10:00'), note: 'Restricted: 100 mm wafers only', expectedReturnAt: null });
  });

  it('when a module came back after the tool last changed, then Running counts from that return', () => {
    const s = summarizeStatus(tool({ startedAt: t('06:00') }), [mod('A', { startedAt: t('11:15') })]);
    expect(s.status).toBe('running');
    expect(s.since).toEqual(t('11:15'));
  });
});
