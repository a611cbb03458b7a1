import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { io as connect, type Socket } from 'socket.io-client';
import ICAL from 'ical.js';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';
import { TestClient } from '../support/client';
import { makeTool } from './facility-fixtures';
import { runSchedulerPass } from '../../server/modules/maintenance/scheduler';
import { recordCounterReading } from '../../server/modules/maintenance/counters';
import { WorkOrder } from '../../server/modules/maintenance/maintenance.model';
import { Notice } from '../../server/modules/notices/notice.model';
import { ToolFollow } from '../../server/modules/facility/facility.model';

// Preventive maintenance end to end against the real database: the scheduler (also two
// servers at once), work orders, downtime windows on the board and in the iCal feed,
// return-to-service proof, and the parts list.

let a: TestServer;
let b: TestServer;
let tech: TestClient;
let techUser: Awaited<ReturnType<typeof createUser>>;
let manager: TestClient;

beforeAll(async () => {
  a = await startTestServer();
  b = await startTestServer();
  ({ client: tech, user: techUser } = await signedInClient(a.url, 'technician'));
  ({ client: manager } = await signedInClient(a.url, 'manager'));
});
afterAll(async () => {
  await a.close();
  await b.close();
});

const DAY = 86400_000;
const STEPS = [
  { text: 'Clean the spin bowl', asksValue: false },
  { text: 'Spin motor current', asksValue: true, unit: 'A', min: 1.8, max: 2.4 },
];

async function newPlan(toolId: number, extra: Record<string, unknown> = {}) {
  const r = await tech.post('/api/maintenance/plans', {
    toolId,
    title: 'Quarterly bowl clean',
    checklist: STEPS,
    estimatedMinutes: 120,
    everyDays: 90,
    leadDays: 7,
    ...extra,
  });
  expect(r.status, r.text).toBe(201);
  return r.body;
}

async function ordersOf(planId: number) {
  return WorkOrder.findAll({ where: { planId }, order: [['id', 'ASC']] });
}

describe('scheduler', () => {
  it('when a plan comes due and two servers run the scheduler at the same moment, then exactly one work order is made', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    // Done 85 days ago, every 90 days, 7 days lead: inside the lead now.
    const plan = await newPlan(tool.id, { lastDoneAt: new Date(Date.now() - 85 * DAY).toISOString() });
    await Promise.all([runSchedulerPass(a.deps), runSchedulerPass(b.deps), runSchedulerPass(a.deps), runSchedulerPass(b.deps)]);
    await Promise.all([runSchedulerPass(a.deps), runSchedulerPass(b.deps)]);
    const orders = await ordersOf(plan.id);
    expect(orders).toHaveLength(1);
    expect(orders[0].status).toBe('planned');
    expect(orders[0].dueAt?.toISOString()).toBe(plan.due.dueAt);
  });

  it('when a plan is not yet within its lead time, then no work order is made', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const plan = await newPlan(tool.id, { lastDoneAt: new Date(Date.now() - 10 * DAY).toISOString() });
    await runSchedulerPass(a.deps);
    expect(await ordersOf(plan.id)).toHaveLength(0);
  });

  it("when the counter readings cross a usage plan's lead threshold, then it comes due (and not before)", async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    await recordCounterReading(a.deps, tool.id, 'wafers', 12340, new Date(Date.now() - 30 * DAY));
    const plan = await newPlan(tool.id, { everyDays: null, everyUnits: 5000, counterName: 'wafers', leadUnits: 500, leadDays: 0 });
    expect(plan.due.dueAtCounter).toBe(17340);
    await recordCounterReading(a.deps, tool.id, 'wafers', 16800, new Date(Date.now() - DAY));
    await runSchedulerPass(a.deps);
    expect(await ordersOf(plan.id)).toHaveLength(0);
    const r = await tech.post(`/api/tools/${tool.id}/counter-readings`, { counter: 'wafers', value: 16900 });
    expect(r.status).toBe(201);
    await runSchedulerPass(a.deps);
    const orders = await ordersOf(plan.id);
    expect(orders).toHaveLength(1);
    expect(orders[0].dueCounter).toBe(17340);
    const list = await tech.get(`/api/maintenance/plans?toolId=${tool.id}`);
    expect(list.body.items[0].due).toMatchObject({ unitsLeft: 440, usedPct: 91.2 });
  });

  it("when a tool's counter is reset, then a usage plan counts the use on both sides of the reset (not from the new low value)", async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    await recordCounterReading(a.deps, tool.id, 'wafers', 12340, new Date(Date.now() - 30 * DAY));
    const plan = await newPlan(tool.id, { everyDays: null, everyUnits: 5000, counterName: 'wafers', leadUnits: 500, leadDays: 0 });
    expect(plan.due.dueAtCounter).toBe(17340);
    // 3,660 wafers, then the counter restarts from zero: 500 since the reset, 4,160 in all.
    await recordCounterReading(a.deps, tool.id, 'wafers', 16000, new Date(Date.now() - 3 * DAY));
    await recordCounterReading(a.deps, tool.id, 'wafers', 500, new Date(Date.now() - 2 * DAY));
    await runSchedulerPass(a.deps);
    expect(await ordersOf(plan.id)).toHaveLength(0);
    let list = await tech.get(`/api/maintenance/plans?toolId=${tool.id}`);
    expect(list.body.items[0].due).toMatchObject({ unitsLeft: 840, usedPct: 83.2 });
    // 400 more after the reset: 4,560 used, within the 500-wafer lead.
    expect((await tech.post(`/api/tools/${tool.id}/counter-readings`, { counter: 'wafers', value: 900 })).status).toBe(201);
    await runSchedulerPass(a.deps);
    const orders = await ordersOf(plan.id);
    expect(orders).toHaveLength(1);
    expect(orders[0].dueCounter).toBe(17340);
    list = await tech.get(`/api/maintenance/plans?toolId=${tool.id}`);
    expect(list.body.items[0].due).toMatchObject({ unitsLeft: 440, usedPct: 91.2 });
  });

  it('when a work order is completed, then the next due date counts from the completion and the next pass makes no duplicate', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const plan = await newPlan(tool.id, { lastDoneAt: new Date(Date.now() - 100 * DAY).toISOString() });
    await runSchedulerPass(a.deps);
    const [wo] = await ordersOf(plan.id);
    let r = await tech.post(`/api/work-orders/${wo.id}/start`, { version: wo.version });
    expect(r.status, r.text).toBe(200);
    r = await tech.patch(`/api/work-orders/${wo.id}`, {
      version: r.body.version,
      results: [
        { step: 0, done: true },
        { step: 1, done: true, value: 2.1 },
      ],
      handsOnMinutes: 95,
    });
    expect(r.status, r.text).toBe(200);
    r = await tech.post(`/api/work-orders/${wo.id}/complete`, { version: r.body.version });
    expect(r.status, r.text).toBe(200);
    const doneAt = new Date(r.body.doneAt).getTime();
    // Done 10 days late: outside due, inside 1.25 × 90 days from the last completion.
    expect(r.body.withinGrace).toBe(true);
    const after = await tech.get(`/api/maintenance/plans/${plan.id}`);
    expect(new Date(after.body.plan.due.dueAt).getTime()).toBe(doneAt + 90 * DAY);
    await runSchedulerPass(a.deps);
    expect(await ordersOf(plan.id)).toHaveLength(1);
  });

  it("when a reading is out of the step's limits, then it is marked at once; skipping needs a reason and moves the plan on", async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const plan = await newPlan(tool.id, { lastDoneAt: new Date(Date.now() - 89 * DAY).toISOString() });
    await runSchedulerPass(a.deps);
    const [wo] = await ordersOf(plan.id);
    let r = await tech.post(`/api/work-orders/${wo.id}/skip`, { version: wo.version, reason: '' });
    expect(r.status).toBe(400);
    r = await tech.post(`/api/work-orders/${wo.id}/skip`, { version: wo.version, reason: 'Tool booked for a customer run all week' });
    expect(r.status, r.text).toBe(200);
    expect(r.body.status).toBe('skipped');
    const after = await tech.get(`/api/maintenance/plans/${plan.id}`);
    expect(new Date(after.body.plan.due.dueAt).getTime()).toBe(new Date(plan.due.dueAt).getTime() + 90 * DAY);

    const p2 = await newPlan(tool.id, { lastDoneAt: new Date(Date.now() - 89 * DAY).toISOString(), title: 'Motor check' });
    await runSchedulerPass(a.deps);
    const [wo2] = await ordersOf(p2.id);
    r = await tech.post(`/api/work-orders/${wo2.id}/start`, { version: wo2.version });
    r = await tech.patch(`/api/work-orders/${wo2.id}`, { version: r.body.version, results: [{ step: 1, done: true, value: 2.9 }] });
    expect(r.body.results[0]).toMatchObject({ step: 1, value: 2.9, outOfLimit: true });
    r = await tech.post(`/api/work-orders/${wo2.id}/complete`, { version: r.body.version });
    expect(r.status).toBe(409);
    expect(r.body.error.message).toMatch(/step 1/);
  });

  it('when a plan is edited, then each change is recorded from → to', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const plan = await newPlan(tool.id);
    const r = await tech.patch(`/api/maintenance/plans/${plan.id}`, { version: plan.version, everyDays: 60, graceFactor: 1.5 });
    expect(r.status, r.text).toBe(200);
    const detail = await tech.get(`/api/maintenance/plans/${plan.id}`);
    expect(detail.body.changes[0].changes).toEqual({ everyDays: { from: 90, to: 60 }, graceFactor: { from: 1.25, to: 1.5 } });
    expect(detail.body.changes[0].actorId).toBe(techUser.id);
  });
});

async function scheduledOrder(toolId: number) {
  const plan = await newPlan(toolId, { lastDoneAt: new Date(Date.now() - 88 * DAY).toISOString() });
  await runSchedulerPass(a.deps);
  const [wo] = await ordersOf(plan.id);
  return wo;
}

describe('downtime windows', () => {
  it('when a window is booked, then every open board hears of it within a second, shows it, and followers are told once', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const follower = await createUser('member');
    await ToolFollow.create({ userId: follower.id, toolId: tool.id, unfollowToken: 'f'.repeat(43 - String(tool.id).length) + tool.id });
    const wo = await scheduledOrder(tool.id);
    const viewer = new TestClient(a.url);
    await viewer.signIn((await createUser('member')).email, TEST_PASSWORD);
    const sockets: Socket[] = [a, b].map((s) =>
      connect(s.url, { path: '/socket.io', transports: ['websocket'], extraHeaders: { cookie: viewer.cookie! }, forceNew: true }),
    );
    try {
      await Promise.all(
        sockets.map((s) => new Promise<void>((resolve, reject) => (s.once('connect', () => resolve()), s.once('connect_error', reject)))),
      );
      // Board on server a only: the other server's socket hears nothing without a shared adapter.
      const heard = new Promise<number>((resolve, reject) => {
        const t = setTimeout(() => reject(new Error('no event within a second')), 1000);
        sockets[0].on(
          'maintenance.window_changed',
          (p: { toolId: number }) => p.toolId === tool.id && (clearTimeout(t), resolve(p.toolId)),
        );
      });
      const startsAt = new Date(Date.now() + 2 * DAY);
      const endsAt = new Date(startsAt.getTime() + 4 * 3600_000);
      const r = await tech.put(`/api/work-orders/${wo.id}/window`, {
        version: wo.version,
        startsAt: startsAt.toISOString(),
        endsAt: endsAt.toISOString(),
      });
      expect(r.status, r.text).toBe(200);
      expect(r.body.status).toBe('scheduled');
      await heard;
      const board = await viewer.get('/api/board');
      const entry = board.body.areas.flatMap((x: { tools: unknown[] }) => x.tools).find((t: { id: number }) => t.id === tool.id);
      expect(entry.plannedMaintenance).toEqual({ startsAt: startsAt.toISOString(), endsAt: endsAt.toISOString() });

      // Moving it is not a second announcement.
      const moved = await tech.put(`/api/work-orders/${wo.id}/window`, {
        version: r.body.version,
        startsAt: new Date(startsAt.getTime() + 3600_000).toISOString(),
        endsAt: new Date(endsAt.getTime() + 3600_000).toISOString(),
      });
      expect(moved.status).toBe(200);
      const notices = await Notice.findAll({ where: { userId: follower.id, kind: 'maintenance_planned' } });
      expect(notices).toHaveLength(1);
      expect(notices[0].title).toMatch(/maintenance planned/);

      // Starting it puts the tool in scheduled downtime, live on the board; followers hear that too.
      const started = await tech.post(`/api/work-orders/${wo.id}/start`, { version: moved.body.version });
      expect(started.status, started.text).toBe(200);
      const board2 = await viewer.get('/api/board');
      const entry2 = board2.body.areas.flatMap((x: { tools: unknown[] }) => x.tools).find((t: { id: number }) => t.id === tool.id);
      expect(entry2).toMatchObject({ state: 'scheduled_downtime', reason: 'preventive_maintenance', status: 'maintenance' });
      expect(await Notice.count({ where: { userId: follower.id, kind: 'tool_state' } })).toBe(1);
    } finally {
      sockets.forEach((s) => s.disconnect());
    }
  });
});

describe('iCalendar feed', () => {
  it('when a window is booked, moved and cancelled, then the feed parses with ical.js with the right times, one stable UID, STATUS:CANCELLED, folded lines; revoked → 404', async () => {
    const { tool } = await makeTool(a.deps.sequelize, {
      name: `Beschichtungsanlage für Lacke — Ø 150 mm, großer Wafer «Süd» ☃ ${Date.now()}`,
    });
    const wo = await scheduledOrder(tool.id);
    const feedRes = await tech.post('/api/calendar-feeds', { scope: 'tool', scopeId: tool.id });
    expect(feedRes.status, feedRes.text).toBe(201);
    const feedPath = new URL(feedRes.body.url).pathname;

    const startsAt = new Date(Date.UTC(2031, 2, 4, 7, 0, 0));
    const endsAt = new Date(Date.UTC(2031, 2, 4, 11, 0, 0));
    let r = await tech.put(`/api/work-orders/${wo.id}/window`, {
      version: wo.version,
      startsAt: startsAt.toISOString(),
      endsAt: endsAt.toISOString(),
    });
    expect(r.status, r.text).toBe(200);

    const fetchFeed = async () => {
      const res = await fetch(a.url + feedPath);
      expect(res.status).toBe(200);
      expect(res.headers.get('content-type')).toMatch(/text\/calendar/);
      const text = await res.text();
      const events = new ICAL.Component(ICAL.parse(text)).getAllSubcomponents('vevent');
      return { text, events };
    };
    const first = await fetchFeed();
    expect(first.events).toHaveLength(1);
    const ev = new ICAL.Event(first.events[0]);
    expect(ev.startDate.toJSDate().toISOString()).toBe(startsAt.toISOString());
    expect(ev.endDate.toJSDate().toISOString()).toBe(endsAt.toISOString());
    expect(ev.summary).toContain(tool.name);
    const uid = ev.uid;
    expect(uid).toMatch(/^wo-\d+-[0-9a-f]+@faultline$/);

    // RFC 5545 §3.1: lines of at most 75 octets, CRLF, continuation lines start with a space,
    // and never split inside a UTF-8 sequence (each physical line is valid UTF-8 on its own).
    const raw = Buffer.from(first.text, 'utf8');
    const physical = first.text.split('\r\n');
    expect(first.text.replace(/\r\n/g, '')).not.toContain('\n');
    expect(physical.some((l) => l.startsWith(' '))).toBe(true);
    for (const line of physical) {
      expect(Buffer.byteLength(line, 'utf8'), line).toBeLessThanOrEqual(75);
      expect(Buffer.from(Buffer.from(line, 'utf8').toString('utf8'), 'utf8').equals(Buffer.from(line, 'utf8'))).toBe(true);
    }
    expect(raw.includes(Buffer.from('\uFFFD', 'utf8'))).toBe(false);

    // Moving changes the event (same UID, higher SEQUENCE), it does not add one.
    r = await tech.put(`/api/work-orders/${wo.id}/window`, {
      version: r.body.version,
      startsAt: new Date(startsAt.getTime() + DAY).toISOString(),
      endsAt: new Date(endsAt.getTime() + DAY).toISOString(),
    });
    const second = await fetchFeed();
    expect(second.events).toHaveLength(1);
    const moved = new ICAL.Event(second.events[0]);
    expect(moved.uid).toBe(uid);
    expect(moved.startDate.toJSDate().toISOString()).toBe(new Date(startsAt.getTime() + DAY).toISOString());
    expect(moved.sequence).toBeGreaterThan(ev.sequence);

    r = await tech.post(`/api/work-orders/${wo.id}/window/cancel`, { version: r.body.version });
    expect(r.status, r.text).toBe(200);
    const third = await fetchFeed();
    expect(third.events).toHaveLength(1);
    expect(third.events[0].getFirstPropertyValue('status')).toBe('CANCELLED');
    expect(third.events[0].getFirstPropertyValue('uid')).toBe(uid);

    const del = await tech.delete(`/api/calendar-feeds/${feedRes.body.id}`);
    expect(del.status).toBe(204);
    expect((await fetch(a.url + feedPath)).status).toBe(404);
    expect((await fetch(`${a.url}/api/calendar/${'a'.repeat(43)}.ics`)).status).toBe(404);
  });

  it('when someone else tries to revoke my feed, then it is not found for them', async () => {
    const feed = await tech.post('/api/calendar-feeds', { scope: 'facility' });
    const { client: other } = await signedInClient(a.url, 'member');
    expect((await other.delete(`/api/calendar-feeds/${feed.body.id}`)).status).toBe(404);
  });
});

async function toolWithTemplate() {
  const { tool } = await makeTool(a.deps.sequelize);
  const t = await tech.post(`/api/tools/${tool.id}/requal-templates`, {
    name: 'Resist thickness, 9 points',
    quantity: 'Film thickness',
    unit: 'nm',
    points: 9,
    target: 1000,
    lsl: 970,
    usl: 1030,
    // ±100 Å on ~1 µm resist ≈ ±1 % half-range: common practice for spun resist.
    limits: [
      { figure: 'halfRangePct', max: 1.5 },
      { figure: 'mean', min: 970, max: 1030 },
    ],
  });
  expect(t.status, t.text).toBe(201);
  return { tool, template: t.body };
}

const PASSING = [1012, 1005, 998, 1003, 995, 1001, 1008, 990, 1000];
const FAILING = [1062, 1005, 998, 1003, 995, 1001, 1008, 940, 1000];

async function downTicket(toolId: number) {
  const reporter = await signedInClient(a.url, 'member');
  const r = await reporter.client.post('/api/tickets', {
    toolId,
    category: 'other',
    description: 'Coater stopped mid-run',
    impact: 'tool_stopped',
    hazards: [],
  });
  expect(r.status, r.text).toBe(201);
  const t = await tech.get(`/api/tickets/${r.body.id}`);
  return { id: r.body.id as number, version: (t.body.version ?? t.body.ticket?.version) as number };
}

describe('return to service', () => {
  it("when the tool has a template, then a repair's return to service is refused (409) until a passing record, and allowed with one", async () => {
    const { tool, template } = await toolWithTemplate();
    const ticket = await downTicket(tool.id);
    const fix = (version: number, extra: Record<string, unknown> = {}) =>
      tech.post(`/api/tickets/${ticket.id}/actions`, {
        action: 'fix',
        version,
        fixKind: 'failure',
        workDone: 'Replaced the bowl seal',
        returnToService: true,
        ...extra,
      });
    let r = await fix(ticket.version);
    expect(r.status, r.text).toBe(409);
    expect(r.body.error.code).toBe('requalification_required');
    expect(r.body.error.message).toMatch(/passing requalification record \(Resist thickness, 9 points\)/);

    const failed = await tech.post(`/api/requal-templates/${template.id}/records`, { values: FAILING, ticketId: ticket.id });
    expect(failed.status, failed.text).toBe(201);
    expect(failed.body.passed).toBe(false);
    expect(failed.body.verdicts.find((v: { figure: string }) => v.figure === 'halfRangePct')).toMatchObject({
      pass: false,
      label: 'non-uniformity, half-range (± %)',
    });
    expect((await fix(ticket.version)).status).toBe(409);

    const passed = await tech.post(`/api/requal-templates/${template.id}/records`, {
      pasted: `thickness\n${PASSING.join('\n')}`,
      ticketId: ticket.id,
    });
    expect(passed.status, passed.text).toBe(201);
    expect(passed.body.passed).toBe(true);
    expect(passed.body.summary.cp).toBeCloseTo(1.4991, 4);
    r = await fix(ticket.version);
    expect(r.status, r.text).toBe(200);
    const [state] = await a.deps.sequelize.query<{ state: string }>(
      `SELECT state FROM state_intervals WHERE tool_id = :id AND module_key = 0 AND open_flag = 1`,
      { type: QueryTypes.SELECT, replacements: { id: tool.id } },
    );
    expect(state.state).toBe('standby');
    const events = await a.deps.sequelize.query<{ data: string }>(
      `SELECT data FROM ticket_events WHERE ticket_id = :id AND kind = 'return_proof'`,
      { type: QueryTypes.SELECT, replacements: { id: ticket.id } },
    );
    const data: unknown = events[0].data;
    expect(typeof data === 'string' ? JSON.parse(data) : data).toEqual({ kind: 'record', recordIds: [passed.body.id] });

    const chart = await tech.get(`/api/tools/${tool.id}/requalification`);
    const half = chart.body[0].charts.find((c: { figure: string }) => c.figure === 'halfRangePct');
    expect(half.points).toHaveLength(2);
    expect(half.label).toBe('non-uniformity, half-range (± %)');
  });

  it('when a manager overrides with a reason, then the tool returns and the reason is on the timeline; a technician cannot override', async () => {
    const { tool } = await toolWithTemplate();
    const ticket = await downTicket(tool.id);
    const body = {
      action: 'fix',
      version: ticket.version,
      fixKind: 'assist',
      workDone: 'Reset the controller',
      returnToService: true,
      returnOverrideReason: 'Metrology tool is down; coat only non-critical test lots until requal tomorrow',
    };
    expect((await tech.post(`/api/tickets/${ticket.id}/actions`, body)).status).toBe(403);
    const r = await manager.post(`/api/tickets/${ticket.id}/actions`, body);
    expect(r.status, r.text).toBe(200);
    const detail = await manager.get(`/api/tickets/${ticket.id}`);
    expect(JSON.stringify(detail.body)).toContain('Metrology tool is down');
  });

  it('when a PM work order on a tool with a template completes, then it needs a passing record or an override, and records which', async () => {
    const { tool, template } = await toolWithTemplate();
    const wo = await scheduledOrder(tool.id);
    let r = await tech.post(`/api/work-orders/${wo.id}/start`, { version: wo.version });
    r = await tech.patch(`/api/work-orders/${wo.id}`, {
      version: r.body.version,
      results: [
        { step: 0, done: true },
        { step: 1, done: true, value: 2.0 },
      ],
    });
    const version = r.body.version;
    r = await tech.post(`/api/work-orders/${wo.id}/complete`, { version });
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('requalification_required');
    await tech.post(`/api/requal-templates/${template.id}/records`, { values: PASSING, workOrderId: wo.id });
    r = await tech.post(`/api/work-orders/${wo.id}/complete`, { version });
    expect(r.status, r.text).toBe(200);
    expect(r.body.returnProof.kind).toBe('record');
  });

  it('when a tool has no template, then it returns to service as before', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const ticket = await downTicket(tool.id);
    const r = await tech.post(`/api/tickets/${ticket.id}/actions`, {
      action: 'fix',
      version: ticket.version,
      fixKind: 'failure',
      workDone: 'Replaced a fuse',
      returnToService: true,
    });
    expect(r.status, r.text).toBe(200);
  });
});

describe('parts', () => {
  it("when uses take the stock below the reorder level, then the tool's engineers get one notice, not one per use", async () => {
    const engineer = await createUser('technician');
    const { tool } = await makeTool(a.deps.sequelize, { primaryEngineerId: engineer.id });
    const part = await tech.post('/api/parts', {
      name: 'Bowl seal',
      partNumber: `BS-${Date.now()}`,
      toolIds: [tool.id],
      stock: 5,
      reorderLevel: 3,
    });
    expect(part.status, part.text).toBe(201);
    const ticket = await downTicket(tool.id);
    for (let i = 0; i < 4; i++) {
      const r = await tech.post(`/api/tickets/${ticket.id}/parts`, { partId: part.body.id, quantity: 1 });
      expect(r.status, r.text).toBe(201);
    }
    const free = await tech.post(`/api/tickets/${ticket.id}/parts`, { freeText: 'M3 screw from the drawer', quantity: 2 });
    expect(free.status).toBe(201);
    expect((await tech.post(`/api/tickets/${ticket.id}/parts`, { partId: part.body.id, quantity: 5 })).status).toBe(409);
    const list = await tech.get(`/api/parts?toolId=${tool.id}`);
    expect(list.body.items[0]).toMatchObject({ stock: 1, low: true });
    const notices = await Notice.findAll({ where: { userId: engineer.id, kind: 'part_low' } });
    expect(notices).toHaveLength(1);
    expect(notices[0].title).toContain(part.body.partNumber);
    // A restock re-arms the notice for the next shortage.
    await tech.patch(`/api/parts/${part.body.id}`, { stock: 10 });
    for (let i = 0; i < 8; i++) await tech.post(`/api/tickets/${ticket.id}/parts`, { partId: part.body.id, quantity: 1 });
    expect(await Notice.count({ where: { userId: engineer.id, kind: 'part_low' } })).toBe(2);
  });
});

describe('corrective work orders', () => {
  it('when a work order is made from a ticket, then it is corrective, tied to the ticket, and completes without touching the state', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const ticket = await downTicket(tool.id);
    let r = await tech.post(`/api/tickets/${ticket.id}/work-order`, { checklist: [{ text: 'Replace the lift pin bellows' }] });
    expect(r.status, r.text).toBe(201);
    const detail = await tech.get(`/api/work-orders/${r.body.id}`);
    expect(detail.body.workOrder).toMatchObject({
      kind: 'corrective',
      ticketId: ticket.id,
      planId: null,
      status: 'planned',
      title: 'Repair: Coater stopped mid-run',
    });
    r = await tech.post(`/api/work-orders/${r.body.id}/start`, { version: detail.body.workOrder.version });
    r = await tech.patch(`/api/work-orders/${r.body.id}`, { version: r.body.version, results: [{ step: 0, done: true }] });
    r = await tech.post(`/api/work-orders/${r.body.id}/complete`, { version: r.body.version });
    expect(r.status, r.text).toBe(200);
    expect(r.body).toMatchObject({ status: 'done', withinGrace: null, returnProof: null });
    const [state] = await a.deps.sequelize.query<{ state: string }>(
      `SELECT state FROM state_intervals WHERE tool_id = :id AND module_key = 0 AND open_flag = 1`,
      { type: QueryTypes.SELECT, replacements: { id: tool.id } },
    );
    // The ticket still holds the Down; its own return to service brings the tool back.
    expect(state.state).toBe('unscheduled_downtime');
  });
});

describe('MCBF', () => {
  it('when a tool counts wafers, then MCBF is the wafers run in the period over its failures (18,000 wafers, 3 failures → 6,000)', async () => {
    // SEMI E10 MCBF check value from the references (computed): 18,000 wafers and 3 failures.
    const { tool } = await makeTool(a.deps.sequelize);
    const from = new Date(Date.now() - 30 * DAY);
    await recordCounterReading(a.deps, tool.id, 'wafers', 100_000, new Date(from.getTime() + DAY));
    await recordCounterReading(a.deps, tool.id, 'wafers', 118_000, new Date(Date.now() - DAY));
    for (let i = 0; i < 3; i++) {
      const t = await downTicket(tool.id);
      const r = await tech.post(`/api/tickets/${t.id}/actions`, {
        action: 'fix',
        version: t.version,
        fixKind: 'failure',
        workDone: 'Replaced the chuck',
        returnToService: true,
      });
      expect(r.status, r.text).toBe(200);
    }
    const r = await manager.get(
      `/api/maintenance/figures?from=${from.toISOString()}&to=${new Date(Date.now() + DAY).toISOString()}&toolId=${tool.id}`,
    );
    expect(r.body.mcbf).toEqual({ toolsWithCounter: 1, wafers: 18_000, failures: 3, wafersPerFailure: 6_000 });
  });
});

describe('MCBF across a counter reset', () => {
  it('when the wafer counter is reset in the period, then MCBF counts the wafers on both sides (12,000 + 6,000 wafers, 2 failures → 9,000)', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const from = new Date(Date.now() - 30 * DAY);
    await recordCounterReading(a.deps, tool.id, 'wafers', 100_000, new Date(from.getTime() + DAY));
    await recordCounterReading(a.deps, tool.id, 'wafers', 112_000, new Date(from.getTime() + 10 * DAY));
    await recordCounterReading(a.deps, tool.id, 'wafers', 2_000, new Date(from.getTime() + 11 * DAY));
    await recordCounterReading(a.deps, tool.id, 'wafers', 6_000, new Date(Date.now() - DAY));
    for (let i = 0; i < 2; i++) {
      const t = await downTicket(tool.id);
      const r = await tech.post(`/api/tickets/${t.id}/actions`, {
        action: 'fix',
        version: t.version,
        fixKind: 'failure',
        workDone: 'Replaced the chuck',
        returnToService: true,
      });
      expect(r.status, r.text).toBe(200);
    }
    const r = await manager.get(
      `/api/maintenance/figures?from=${from.toISOString()}&to=${new Date(Date.now() + DAY).toISOString()}&toolId=${tool.id}`,
    );
    expect(r.body.mcbf).toEqual({ toolsWithCounter: 1, wafers: 18_000, failures: 2, wafersPerFailure: 9_000 });
  });
});

describe('figures and bad input', () => {
  it('when the figures are asked for, then compliance counts done-within-grace over due, skipped against it', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const skipped = await scheduledOrder(tool.id);
    expect(
      (await tech.post(`/api/work-orders/${skipped.id}/skip`, { version: skipped.version, reason: 'Deferred by the area manager' })).status,
    ).toBe(200);
    const wo = await scheduledOrder(tool.id);
    let r = await tech.post(`/api/work-orders/${wo.id}/start`, { version: wo.version });
    r = await tech.patch(`/api/work-orders/${wo.id}`, {
      version: r.body.version,
      results: [
        { step: 0, done: true },
        { step: 1, done: true, value: 2.2 },
      ],
    });
    r = await tech.post(`/api/work-orders/${wo.id}/complete`, { version: r.body.version });
    expect(r.status, r.text).toBe(200);
    r = await manager.get(
      `/api/maintenance/figures?from=${new Date(Date.now() - 400 * DAY).toISOString()}&to=${new Date(Date.now() + 30 * DAY).toISOString()}&toolId=${tool.id}`,
    );
    expect(r.status, r.text).toBe(200);
    expect(r.body.compliance).toMatchObject({ due: 2, onTime: 1, facility: 0.5 });
    expect(r.body.compliance.perTool[0]).toMatchObject({ toolId: tool.id, skipped: 1, onTime: 1 });
    expect(r.body.downtimeHours.planned).toBeGreaterThan(0);
    expect(r.body.downtimeHours.unplanned).toBe(0);
    expect(r.body.pmDone).toBe(1);
    expect(r.body.meanTimeToPerformPmHours).toBeGreaterThan(0);
    expect(r.body.mcbf).toMatchObject({ toolsWithCounter: 0, wafersPerFailure: null });
  });

  it('when query strings or params are malformed on the new GET routes, then 400 with field messages', async () => {
    for (const path of [
      '/api/maintenance/figures?from=yesterday&to=2025-01-01',
      '/api/maintenance/plans?limit=0',
      '/api/work-orders?status=finished',
      '/api/parts?toolId=abc',
      '/api/tools/x/requalification',
      '/api/maintenance?surprise=1',
    ]) {
      const r = await tech.get(path);
      expect(r.status, path).toBe(400);
      expect(Object.keys(r.body.error.fields ?? {}).length, path).toBeGreaterThan(0);
    }
  });

  it('when a plan, template, record, window or part is malformed, then 400 names the field and nothing is written', async () => {
    const { tool } = await makeTool(a.deps.sequelize);
    const before = await WorkOrder.count();
    const cases: [string, string, unknown, string][] = [
      ['POST', '/api/maintenance/plans', { toolId: tool.id, title: 'x', checklist: STEPS, estimatedMinutes: 10 }, 'everyDays'],
      [
        'POST',
        '/api/maintenance/plans',
        { toolId: tool.id, title: 'x', checklist: STEPS, estimatedMinutes: 10, everyUnits: 100 },
        'counterName',
      ],
      [
        'POST',
        '/api/maintenance/plans',
        { toolId: tool.id, title: 'x', checklist: [{ text: 'a', asksValue: true, min: 3, max: 1 }], estimatedMinutes: 10, everyDays: 9 },
        'checklist.0.max',
      ],
      [
        'POST',
        `/api/tools/${tool.id}/requal-templates`,
        { name: 'n', quantity: 'q', unit: 'nm', points: 9, limits: [{ figure: 'sigmaPct' }] },
        'limits.0.max',
      ],
      [
        'POST',
        `/api/tools/${tool.id}/requal-templates`,
        { name: 'n', quantity: 'q', unit: 'nm', points: 9, limits: [{ figure: 'wobble', max: 1 }] },
        'limits.0.figure',
      ],
      ['POST', '/api/parts', { name: 'p', partNumber: 'P', stock: -1, reorderLevel: 0 }, 'stock'],
      ['POST', '/api/calendar-feeds', { scope: 'tool' }, 'scopeId'],
    ];
    for (const [method, path, body, field] of cases) {
      const r = await tech.request(method, path, body);
      expect(r.status, `${path} ${r.text}`).toBe(400);
      expect(r.body.error.fields, path).toHaveProperty([field]);
    }
    const wo = await scheduledOrder(tool.id);
    const r = await tech.put(`/api/work-orders/${wo.id}/window`, {
      version: wo.version,
      startsAt: '2031-01-02T10:00:00Z',
      endsAt: '2031-01-02T09:00:00Z',
    });
    expect(r.status).toBe(400);
    expect(r.body.error.fields).toHaveProperty('endsAt');
    expect(await WorkOrder.count()).toBe(before + 1);
  });
});
