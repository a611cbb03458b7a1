import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { Area, StateInterval, Tool, ToolModule } from '../../server/modules/facility/facility.model';
import { changeState, openInitialState } from '../../server/modules/facility/state.service';
import { ServiceTarget, Ticket, UNWORKED_TICKET_FIELDS } from '../../server/modules/tickets/ticket.model';
import type { E10State, StateReason } from '../../shared/equipment-state';
import { PRIORITIES, SERVICE_TARGET_DEFAULTS, type Priority } from '../../shared/priority';
import type { AnalyticsReport, ToolReliability } from '../../shared/schemas/analytics';
import { startTestServer, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { signedInClient, unique } from '../support/factories';

// A state log with known hours, built directly in the test database for an area of its own,
// and the figures the analytics API must give for it, computed by hand below.
//
// Period: [2024-01-20 00:00, 2024-03-10 00:00) UTC = 12 d + 29 d (2024 is a leap year) + 9 d
// = 50 days = 1200 h. January and March are read from the raw log, February from the monthly
// rollup, so both paths and the seams between them are checked.

const H = 3_600_000;
const at = (iso: string) => new Date(`${iso}Z`);
const FROM = at('2024-01-20T00:00:00');
const TO = at('2024-03-10T00:00:00');
const query = (extra: string) => `from=${FROM.toISOString()}&to=${TO.toISOString()}&${extra}`;

type Step = [E10State, StateReason, hours: number | null, ticket?: number | null];

/** Writes a tool-level log straight into the table: consecutive intervals, the last one open. */
async function writeLog(toolId: number, start: Date, steps: Step[]) {
  let t = start.getTime();
  for (const [state, reason, hours, ticketId] of steps) {
    const end = hours === null ? null : t + hours * H;
    await StateInterval.create({
      toolId,
      moduleId: null,
      state,
      reason,
      note: null,
      startedAt: new Date(t),
      endedAt: end === null ? null : new Date(end),
      expectedReturnAt: null,
      ticketId: ticketId ?? null,
      setById: null,
      source: 'staff',
      confirmed: true,
    });
    if (end !== null) t = end;
  }
}

async function makeTicket(
  toolId: number,
  fields: Partial<{
    category: string;
    failureMode: string | null;
    priority: Priority;
    status: 'fixed' | 'closed' | 'merged' | 'reported';
    fixKind: 'failure' | 'assist' | null;
    createdAt: Date;
    acknowledgedAt: Date | null;
    fixedAt: Date | null;
    resolvedAt: Date | null;
  }>,
) {
  const ticket = await Ticket.create({
    toolId,
    moduleId: null,
    category: fields.category ?? 'other',
    title: unique('Analytics test ticket'),
    description: null,
    alarmText: null,
    impact: 'tool_stopped',
    hazards: [],
    wafersOwner: null,
    wafersRecoverable: null,
    status: fields.status ?? 'closed',
    priority: fields.priority ?? 'P3',
    reporterId: null,
    assigneeId: null,
    ...UNWORKED_TICKET_FIELDS,
    fixKind: fields.fixKind ?? null,
    failureMode: fields.failureMode ?? null,
    acknowledgedAt: fields.acknowledgedAt ?? null,
    fixedAt: fields.fixedAt ?? null,
    resolvedAt: fields.resolvedAt ?? null,
  });
  // createdAt is set by Sequelize on insert; the response figures need a chosen one.
  if (fields.createdAt)
    await ticket.sequelize.query('UPDATE tickets SET created_at = :c WHERE id = :id', {
      replacements: { c: fields.createdAt, id: ticket.id },
    });
  return ticket;
}

let server: TestServer;
let manager: TestClient;
let areaId: number;
let toolA: Tool;
let toolB: Tool;
let toolC: Tool;
let t1: Ticket;
let targets: Record<Priority, { acknowledgeMinutes: number; restoreMinutes: number }>;

beforeAll(async () => {
  server = await startTestServer();
  ({ client: manager } = await signedInClient(server.url, 'manager'));
  const area = await Area.create({ name: unique('Analytics bay'), code: unique('AN').toUpperCase(), description: null, retiredAt: null });
  areaId = area.id;
  const tool = (name: string) =>
    Tool.create({
      areaId,
      name: unique(name),
      code: unique('AN').toUpperCase(),
      description: null,
      primaryEngineerId: null,
      backupEngineerId: null,
      retiredAt: null,
    });
  toolA = await tool('Analytics etcher');
  toolB = await tool('Analytics furnace');
  toolC = await tool('Analytics coater');

  t1 = await makeTicket(toolA.id, {
    category: 'vacuum',
    failureMode: 'Turbo pump fault',
    priority: 'P2',
    fixKind: 'failure',
    createdAt: at('2024-01-25T00:05:00'),
    acknowledgedAt: at('2024-01-25T00:35:00'),
    fixedAt: at('2024-01-26T14:00:00'),
    resolvedAt: at('2024-01-26T14:00:00'),
  });
  // Same mode written differently: the Pareto groups modes regardless of case and spaces.
  const t2 = await makeTicket(toolA.id, {
    category: 'vacuum',
    failureMode: ' turbo PUMP fault ',
    priority: 'P1',
    fixKind: 'failure',
    createdAt: at('2024-02-20T02:00:00'),
    acknowledgedAt: at('2024-02-20T02:10:00'),
    fixedAt: at('2024-02-20T08:00:00'),
    resolvedAt: at('2024-02-20T08:00:00'),
  });
  const t3 = await makeTicket(toolB.id, {
    category: 'wafer_handling',
    failureMode: null,
    priority: 'P3',
    fixKind: 'failure',
    createdAt: at('2024-02-15T00:00:00'),
    acknowledgedAt: at('2024-02-15T05:00:00'),
    fixedAt: at('2024-02-15T12:00:00'),
    resolvedAt: at('2024-02-15T12:00:00'),
  });
  // An assist in the period, one after it, and a merged duplicate (left out of response times).
  await makeTicket(toolB.id, {
    category: 'wafer_handling',
    priority: 'P4',
    fixKind: 'assist',
    createdAt: at('2024-03-01T11:00:00'),
    acknowledgedAt: at('2024-03-01T11:30:00'),
    fixedAt: at('2024-03-01T12:00:00'),
    resolvedAt: at('2024-03-01T12:00:00'),
  });
  await makeTicket(toolA.id, {
    priority: 'P4',
    fixKind: 'assist',
    createdAt: at('2024-03-15T11:00:00'),
    acknowledgedAt: at('2024-03-15T11:30:00'),
    fixedAt: at('2024-03-15T12:00:00'),
    resolvedAt: at('2024-03-15T12:00:00'),
  });
  await makeTicket(toolA.id, { priority: 'P1', status: 'merged', createdAt: at('2024-01-25T00:06:00') });

  // Tool A, hours inside the period in brackets:
  await writeLog(toolA.id, at('2024-01-01T00:00:00'), [
    ['standby', 'none', 24 * 24], //                      Jan 1 → Jan 25, straddles the start [120 h]
    ['unscheduled_downtime', 'repair', 10, t1.id], //      failure 1 starts Jan 25 00:00 [10]
    ['unscheduled_downtime', 'waiting_parts', 24, t1.id], // same failure, supplier delay [24]
    ['unscheduled_downtime', 'repair', 4, t1.id], //       same failure [4] → Jan 26 14:00
    ['productive', 'none', 120], //                       → Jan 31 14:00 [120]
    ['scheduled_downtime', 'preventive_maintenance', 12], // → Feb 1 02:00, 10 h Jan + 2 h Feb [12]
    ['standby', 'none', 19 * 24], //                      → Feb 20 02:00 [456]
    ['unscheduled_downtime', 'repair', 6, t2.id], //       failure 2 [6] → Feb 20 08:00
    ['engineering', 'process_development', 48], //        → Feb 22 08:00 [48]
    ['non_scheduled', 'not_staffed', 7 * 24], //          → Feb 29 08:00 [168]
    ['standby', 'none', 16 + 96], //                      → Mar 5 00:00, 16 h Feb + 96 h Mar [112]
    ['unscheduled_downtime', 'facilities_related', 3], //  failure 3, no ticket [3]
    ['unscheduled_downtime', 'maintenance_delay_user', 2], // same failure [2] → Mar 5 05:00
    ['standby', 'none', null], //                         open; counted to the end, Mar 10 [115]
  ]);
  // A module log is for the board's Limited state only: its downtime must not count.
  const mod = await ToolModule.create({ toolId: toolA.id, name: 'Chamber B', code: 'B', sortOrder: 0, retiredAt: null });
  await StateInterval.create({
    toolId: toolA.id,
    moduleId: mod.id,
    state: 'unscheduled_downtime',
    reason: 'repair',
    note: null,
    startedAt: at('2024-02-10T00:00:00'),
    endedAt: at('2024-02-12T00:00:00'),
    expectedReturnAt: null,
    ticketId: null,
    setById: null,
    source: 'staff',
    confirmed: true,
  });

  // Tool B goes through the state service, as the app writes the log (close, then open).
  await server.deps.sequelize.transaction((transaction) => openInitialState(toolB.id, null, at('2024-01-01T00:00:00'), null, transaction));
  await changeState(server.deps, {
    toolId: toolB.id,
    state: 'unscheduled_downtime',
    reason: 'repair',
    ticketId: t3.id,
    actorId: null,
    at: at('2024-02-15T00:00:00'),
  });
  await changeState(server.deps, { toolId: toolB.id, state: 'standby', actorId: null, at: at('2024-02-15T12:00:00') });

  // Tool C: written out of order (later intervals first), as a bulk import might.
  await writeLog(toolC.id, at('2024-02-10T06:00:00'), [
    ['unscheduled_downtime', 'repair', 4],
    ['standby', 'none', null],
  ]);
  await writeLog(toolC.id, at('2024-01-01T00:00:00'), [
    ['standby', 'none', 40 * 24 + 2], //   Jan 1 → Feb 10 02:00
    ['unscheduled_downtime', 'repair', 4], // Feb 10 02:00 → 06:00, then the stretch above
  ]);

  const rows = await ServiceTarget.findAll();
  targets = { ...SERVICE_TARGET_DEFAULTS };
  for (const row of rows) targets[row.priority] = { acknowledgeMinutes: row.acknowledgeMinutes, restoreMinutes: row.restoreMinutes };
});

afterAll(async () => {
  await server?.close();
});

const close = (actual: number | null | undefined, expected: number, tolerance = 1e-6) => {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected), `${actual} vs ${expected}`).toBeLessThanOrEqual(tolerance);
};

describe('analytics: time accounting from the state log', () => {
  it('when a manager asks for one tool, then hours, failures, MTBF and MTTR match the hand computation', async () => {
    const res = await manager.get(`/api/analytics?${query(`scope=tool&toolId=${toolA.id}`)}`);
    expect(res.status).toBe(200);
    const report = res.body as AnalyticsReport;
    const f = report.totals;

    expect(report.period.hours).toBe(1200);
    // Standby 120 + 456 + 112 + 115 = 803; productive 120; engineering 48.
    close(f.hours.standby, 803);
    close(f.hours.productive, 120);
    close(f.hours.engineering, 48);
    // Scheduled downtime 12 (10 h in January, 2 h in February). The module's 48 h are left out.
    close(f.hours.scheduledDowntime, 12);
    // Unscheduled downtime 10 + 24 + 4 + 6 + 3 + 2 = 49.
    close(f.hours.unscheduledDowntime, 49);
    close(f.hours.nonScheduled, 168);
    close(f.totalHours, 1200);

    // Three stretches of unscheduled downtime (Jan 25, Feb 20, Mar 5) are three failures,
    // whatever their sub-reasons; plus one stretch of scheduled downtime = 4 downtime events.
    expect(f.failures).toBe(3);
    expect(f.downtimeEvents).toBe(4);
    expect(f.assists).toBe(0);

    // Uptime 803 + 120 + 48 = 971 h; operations time 1200 − 168 = 1032 h.
    close(f.uptimeHours, 971);
    close(f.operationsHours, 1032);
    close(f.availabilityPct, (971 / 1032) * 100); // 94.089 %
    // MTBF over uptime = 971 / 3 = 323.667 h.
    expect(f.mtbf.basis).toBe('uptime');
    close(f.mtbf.point, 971 / 3);
    // 90 % two-sided, time-censored: lower 2T/χ²(0.95; 8) = 1942/15.507, upper 2T/χ²(0.05; 6)
    // = 1942/1.635 (chi-square quantiles: 1.635 from the NIST/SEMATECH e-Handbook §1.3.6.7.4
    // table; 15.507 from a standard chi-square table, quoted from memory).
    close(f.mtbf.lower, 1942 / 15.507, 0.01);
    close(f.mtbf.upper, 1942 / 1.635, 0.5);
    // E10 MTTR: repair 10 + 4 + 6 = 20 h (waiting for parts, the user and facilities excluded) / 3.
    close(f.downtime.repair, 20);
    close(f.mttrHours, 20 / 3);
    close(f.downtime.maintenanceDelaySupplier, 24);
    close(f.downtime.maintenanceDelayUser, 2);
    close(f.downtime.facilitiesRelated, 3);
    // Mean down time per failure includes the waiting: 49 / 3.
    close(f.meanDownHoursPerFailure, 49 / 3);
    // MTOL: (12 + 49) / 4 events.
    close(f.mtolHours, 61 / 4);
  });

  it('when the period spans months, then each month holds its own hours and failures', async () => {
    const res = await manager.get(`/api/analytics?${query(`scope=tool&toolId=${toolA.id}`)}`);
    const months = (res.body as AnalyticsReport).months;
    expect(months.map((m) => m.month.slice(0, 7))).toEqual(['2024-01', '2024-02', '2024-03']);
    const [jan, feb, mar] = months;
    // January from the 20th: standby 120, unscheduled 38, productive 120, scheduled 10 = 288 h.
    expect(jan.partial).toBe(true);
    close(jan.hours.standby, 120);
    close(jan.hours.unscheduledDowntime, 38);
    close(jan.hours.productive, 120);
    close(jan.hours.scheduledDowntime, 10);
    expect(jan.failures).toBe(1);
    // February (whole, from the rollup): scheduled 2, standby 456 + 16, unscheduled 6,
    // engineering 48, non-scheduled 168 = 696 h.
    expect(feb.partial).toBe(false);
    close(feb.hours.scheduledDowntime, 2);
    close(feb.hours.standby, 472);
    close(feb.hours.unscheduledDowntime, 6);
    close(feb.hours.engineering, 48);
    close(feb.hours.nonScheduled, 168);
    expect(feb.failures).toBe(1);
    // Availability of February: uptime 520 / operations 528.
    close(feb.availabilityPct, (520 / 528) * 100);
    // March to the 10th: standby 96 + 115, unscheduled 5 = 216 h.
    close(mar.hours.standby, 211);
    close(mar.hours.unscheduledDowntime, 5);
    expect(mar.failures).toBe(1);
  });

  it('when a manager asks for the area, then tools, area and Pareto add up', async () => {
    const res = await manager.get(`/api/analytics?${query(`scope=area&areaId=${areaId}`)}`);
    expect(res.status).toBe(200);
    const report = res.body as AnalyticsReport;
    expect(report.scope).toMatchObject({ kind: 'area', id: areaId });
    expect(report.tools.map((t) => t.id).sort()).toEqual([toolA.id, toolB.id, toolC.id].sort());

    const b = report.tools.find((t) => t.id === toolB.id)!.figures;
    // Tool B: standby Jan 20 → Feb 15 (624 h), repair 12 h, standby to Mar 10 (564 h); one assist.
    close(b.hours.standby, 1188);
    close(b.hours.unscheduledDowntime, 12);
    expect(b.failures).toBe(1);
    expect(b.assists).toBe(1);

    const c = report.tools.find((t) => t.id === toolC.id)!.figures;
    // Tool C was written out of order; its two 4 h repairs touch, so they are one failure.
    close(c.hours.unscheduledDowntime, 8);
    expect(c.failures).toBe(1);

    // Area: failures 3 + 1 + 1 = 5, unscheduled 49 + 12 + 8 = 69 h.
    expect(report.totals.failures).toBe(5);
    close(report.totals.hours.unscheduledDowntime, 69);
    expect(report.areas).toHaveLength(1);
    expect(report.areas[0].figures.failures).toBe(5);

    // Pareto by failure mode: "Turbo pump fault" 38 + 6 = 44 h over 2 tickets (spelling
    // differences folded), not recorded (tool B's ticket) 12 h, no ticket 5 + 8 = 13 h.
    const modes = report.pareto.byFailureMode;
    close(report.pareto.unscheduledHours, 69);
    expect(modes[0]).toMatchObject({ kind: 'recorded', tickets: 2 });
    expect(modes[0].key?.trim().toLowerCase()).toBe('turbo pump fault');
    close(modes[0].hours, 44);
    close(modes[0].share, 44 / 69);
    const noTicket = modes.find((m) => m.kind === 'no_ticket')!;
    close(noTicket.hours, 13);
    const notRecorded = modes.find((m) => m.kind === 'not_recorded')!;
    close(notRecorded.hours, 12);
    close(modes[modes.length - 1].cumulativeShare, 1);
    const categories = Object.fromEntries(report.pareto.byCategory.map((c) => [c.key ?? c.kind, c.hours]));
    close(categories.vacuum, 44);
    close(categories.wafer_handling, 12);
    close(categories.no_ticket, 13);
  });

  it('when tickets were reported in the period, then response times and targets met follow them', async () => {
    const res = await manager.get(`/api/analytics?${query(`scope=area&areaId=${areaId}`)}`);
    const { byPriority, overall } = (res.body as AnalyticsReport).response;
    const row = (p: Priority) => byPriority.find((r) => r.priority === p)!;
    // P1: acknowledged after 10 min, restored after 6 h = 360 min (the merged duplicate is left out).
    expect(row('P1')).toMatchObject({ tickets: 1, acknowledged: 1, restored: 1 });
    close(row('P1').ackMeanMinutes, 10);
    close(row('P1').restoreMeanMinutes, 360);
    expect(row('P1').ackMetShare).toBe(10 <= targets.P1.acknowledgeMinutes ? 1 : 0);
    expect(row('P1').restoreMetShare).toBe(360 <= targets.P1.restoreMinutes ? 1 : 0);
    // P2: 30 min to acknowledge; Jan 25 00:05 → Jan 26 14:00 = 37 h 55 min = 2275 min to restore.
    close(row('P2').ackMeanMinutes, 30);
    close(row('P2').restoreMeanMinutes, 2275);
    // P3: 300 and 720 min; P4 (the assist): 30 and 60 min.
    close(row('P3').ackMeanMinutes, 300);
    close(row('P4').restoreMeanMinutes, 60);
    expect(row('P4').ackTargetMinutes).toBe(targets.P4.acknowledgeMinutes);
    // All four: mean time to acknowledge (10 + 30 + 300 + 30) / 4 = 92.5 min.
    expect(overall.tickets).toBe(4);
    close(overall.ackMeanMinutes, 92.5);
    const met = [
      10 <= targets.P1.acknowledgeMinutes,
      30 <= targets.P2.acknowledgeMinutes,
      300 <= targets.P3.acknowledgeMinutes,
      30 <= targets.P4.acknowledgeMinutes,
    ].filter(Boolean).length;
    close(overall.ackMetShare, met / 4);
    // 90th percentile of 10, 30, 30, 300 (linear interpolation): 30 + 0.7 × 270 = 219 min.
    close(overall.ackP90Minutes, 219);
    expect(PRIORITIES.every((p) => row(p).restoreTargetMinutes === targets[p].restoreMinutes)).toBe(true);
  });

  it('when a closed interval is corrected or removed, then the figures follow at once', async () => {
    // Tool A's engineering interval (Feb 20 08:00 → Feb 22 08:00) becomes repair: it joins the
    // failure before it, so failures stay 3, unscheduled downtime grows by 48 h.
    const eng = await StateInterval.findOne({ where: { toolId: toolA.id, moduleId: null, state: 'engineering' } });
    await eng!.update({ state: 'unscheduled_downtime', reason: 'repair' });
    let report = (await manager.get(`/api/analytics?${query(`scope=tool&toolId=${toolA.id}`)}`)).body as AnalyticsReport;
    close(report.totals.hours.unscheduledDowntime, 97);
    close(report.totals.hours.engineering, 0);
    expect(report.totals.failures).toBe(3);

    // Removing the repair that started that failure leaves the (former engineering) repair to start it.
    const repair = await StateInterval.findOne({ where: { toolId: toolA.id, moduleId: null, startedAt: at('2024-02-20T02:00:00') } });
    const saved = repair!.get({ plain: true });
    await repair!.destroy();
    report = (await manager.get(`/api/analytics?${query(`scope=tool&toolId=${toolA.id}`)}`)).body as AnalyticsReport;
    close(report.totals.hours.unscheduledDowntime, 91);
    expect(report.totals.failures).toBe(3);

    // Put both back as they were.
    await StateInterval.create({ ...saved, id: undefined });
    await eng!.update({ state: 'engineering', reason: 'process_development' });
    report = (await manager.get(`/api/analytics?${query(`scope=tool&toolId=${toolA.id}`)}`)).body as AnalyticsReport;
    close(report.totals.hours.unscheduledDowntime, 49);
    expect(report.totals.failures).toBe(3);

    // The rollup equals the log summed from scratch for this tool.
    const [fromRollup] = await server.deps.sequelize.query<{ us: number }>(
      `SELECT SUM(micros) AS us FROM state_hours_monthly WHERE tool_id = :id`,
      { type: QueryTypes.SELECT, replacements: { id: toolA.id } },
    );
    const [fromLog] = await server.deps.sequelize.query<{ us: number }>(
      `SELECT SUM(TIMESTAMPDIFF(MICROSECOND, started_at, ended_at)) AS us FROM state_intervals WHERE tool_id = :id AND module_id IS NULL AND ended_at IS NOT NULL`,
      { type: QueryTypes.SELECT, replacements: { id: toolA.id } },
    );
    expect(Number(fromRollup.us)).toBe(Number(fromLog.us));
  });

  it('when the tools CSV and the months CSV are downloaded, then they are attachments with the same totals', async () => {
    const tools = await manager.get(`/api/analytics/tools.csv?${query(`scope=area&areaId=${areaId}`)}`);
    expect(tools.status).toBe(200);
    expect(tools.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(tools.headers.get('content-disposition')).toMatch(
      /^attachment; filename="faultline-tools-area-\d+-2024-01-20-2024-03-10\.csv"$/,
    );
    const toolLines = tools.text
      .replace(/^\uFEFF/, '')
      .trim()
      .split('\r\n');
    const header = toolLines[0].split(',');
    expect(toolLines).toHaveLength(4);
    const udt = header.indexOf('Unscheduled downtime h');
    const failures = header.indexOf('Failures');
    const cells = toolLines.slice(1).map((line) => line.split(','));
    close(
      cells.reduce((s, c) => s + Number(c[udt]), 0),
      69,
      0.01,
    );
    expect(cells.reduce((s, c) => s + Number(c[failures]), 0)).toBe(5);

    const months = await manager.get(`/api/analytics/months.csv?${query(`scope=area&areaId=${areaId}`)}`);
    expect(months.status).toBe(200);
    const monthLines = months.text
      .replace(/^\uFEFF/, '')
      .trim()
      .split('\r\n');
    expect(monthLines.map((l) => l.split(',')[0])).toEqual(['Month (UTC)', '2024-01', '2024-02', '2024-03']);
    const mHeader = monthLines[0].split(',');
    const total = monthLines.slice(1).reduce((s, l) => s + Number(l.split(',')[mHeader.indexOf('Unscheduled downtime h')]), 0);
    close(total, 69, 0.01);
  });

  it('when a tool name holds a comma, quotes or a formula, then the CSV quotes it safely', async () => {
    await toolC.update({ name: '=HYPERLINK("x"), coater' });
    const res = await manager.get(`/api/analytics/tools.csv?${query(`scope=tool&toolId=${toolC.id}`)}`);
    expect(res.text).toContain(`"'=HYPERLINK(""x""), coater"`);
  });
});

describe('analytics: who may see it', () => {
  it('when a member or technician asks for the analytics, then they get 403; managers and admins get them', async () => {
    for (const role of ['member', 'technician'] as const) {
      const { client } = await signedInClient(server.url, role);
      expect((await client.get(`/api/analytics?${query('scope=facility')}`)).status).toBe(403);
      expect((await client.get(`/api/analytics/tools.csv?${query('scope=facility')}`)).status).toBe(403);
      expect((await client.get(`/api/analytics/months.csv?${query('scope=facility')}`)).status).toBe(403);
      expect((await client.get('/api/analytics/scopes')).status).toBe(403);
    }
    const { client: admin } = await signedInClient(server.url, 'admin');
    expect((await admin.get(`/api/analytics?${query(`scope=area&areaId=${areaId}`)}`)).status).toBe(200);
    expect((await manager.get('/api/analytics/scopes')).status).toBe(200);
    expect((await new TestClient(server.url).get(`/api/analytics?${query('scope=facility')}`)).status).toBe(401);
  });

  it('when any signed-in user opens a tool page, then they get its 30- and 365-day figures', async () => {
    const { client } = await signedInClient(server.url, 'member');
    // Tool B went back to standby on Feb 15 2024, so the last 30 and 365 days are all uptime.
    const res = await client.get(`/api/analytics/tools/${toolB.id}/reliability`);
    expect(res.status).toBe(200);
    const body = res.body as ToolReliability;
    expect(body.windows.map((w) => w.days)).toEqual([30, 365]);
    expect(body.windows[0]).toMatchObject({ availabilityPct: 100, failures: 0, mtbfHours: null, mttrHours: null });
    close(body.windows[0].uptimeHours, 30 * 24, 0.01);
    expect((await client.get('/api/analytics/tools/999999999/reliability')).status).toBe(404);
  });
});

describe('analytics: bad input', () => {
  it('when the period or scope is wrong, then the answer is 400 or 404 with field messages', async () => {
    const bad = async (q: string) => manager.get(`/api/analytics?${q}`);
    expect((await bad(`from=${TO.toISOString()}&to=${FROM.toISOString()}`)).body.error.fields['query.to']).toBeDefined();
    expect((await bad(`from=2015-01-01T00:00:00Z&to=2024-01-01T00:00:00Z`)).status).toBe(400);
    expect((await bad(`${query('scope=area')}`)).body.error.fields['query.areaId']).toBeDefined();
    expect((await bad(`${query('scope=facility&toolId=1')}`)).status).toBe(400);
    expect((await bad(`${query('scope=facility&colour=red')}`)).status).toBe(400);
    expect((await bad(`from=yesterday&to=today`)).status).toBe(400);
    expect((await bad(query('scope=area&areaId=999999999'))).status).toBe(404);
  });
});
