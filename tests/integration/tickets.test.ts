import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';
import { TestClient } from '../support/client';
import { Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';
import { Notice } from '../../server/modules/notices/notice.model';
import { User } from '../../server/modules/users/user.model';
import { StateInterval } from '../../server/modules/facility/facility.model';
import type { DomainEvent } from '../../server/lib/events';
import { HAZARD_CAUTIONS } from '../../shared/report-options';
import { createTool, fileReport, jpegBytes, openState, drainOutbox } from './tickets-fixtures';

let server: TestServer;
const events: DomainEvent[] = [];

beforeAll(async () => {
  server = await startTestServer();
  server.deps.events.subscribe((e) => events.push(e));
});
const onCallUsers: number[] = [];
afterAll(async () => {
  // The test database outlives this run: leave no one on call to receive later runs' mail.
  await User.update({ onCall: false }, { where: { id: onCallUsers } });
  await drainOutbox(server);
  await server.close();
});

async function staffClient(role: 'technician' | 'manager' = 'technician', extra: { onCall?: boolean } = {}) {
  const user = await createUser(role, { name: `Tech ${Math.random().toString(36).slice(2, 7)}`, ...extra });
  const client = new TestClient(server.url);
  const r = await client.signIn(user.email, TEST_PASSWORD);
  if (r.status !== 200) throw new Error('sign-in failed');
  return { client, user };
}

async function sendMail() {
  await server.worker.runOnce();
}

async function act(client: TestClient, id: number, body: Record<string, unknown>) {
  const current = await client.get(`/api/tickets/${id}`);
  return client.post(`/api/tickets/${id}/actions`, { version: current.body.version, ...body });
}

describe('filing a report', () => {
  it('when a member reports "tool stopped", then the ticket opens at P2 for the primary engineer, the tool is Down as reported by a user, and both engineers are told', async () => {
    const primary = await createUser('technician');
    const backup = await createUser('technician');
    const { tool } = await createTool(server.deps.sequelize, { primaryEngineerId: primary.id, backupEngineerId: backup.id });
    const { client, user } = await signedInClient(server.url, 'member');
    const seen = events.length;

    const r = await client.post('/api/tickets', {
      toolId: tool.id,
      category: 'wafer_handling',
      description: 'Wafer stuck on the transfer arm\nThe arm stopped half-way into the load lock.',
      alarmText: 'E-17 ROBOT TIMEOUT',
      impact: 'tool_stopped',
      hazards: [],
      wafersCount: 2,
      wafersOwner: 'Thin-film group',
      wafersRecoverable: 'unknown',
    });
    expect(r.status).toBe(201);
    // Stopped tool with wafers at risk on a normal-criticality tool: impact high × urgency medium → P2 (PRIORITY_MATRIX).
    expect(r.body.priority).toBe('P2');

    const ticket = await Ticket.findByPk(r.body.id);
    expect(ticket!.title).toBe('Wafer stuck on the transfer arm');
    expect(ticket!.assigneeId).toBe(primary.id);
    expect(ticket!.reporterId).toBe(user.id);
    expect(ticket!.status).toBe('reported');

    const state = await openState(tool.id);
    expect(state).toMatchObject({
      state: 'unscheduled_downtime',
      source: 'user_report',
      confirmed: false,
      ticketId: ticket!.id,
      setById: user.id,
    });

    const kinds = (await TicketEvent.findAll({ where: { ticketId: ticket!.id }, order: [['id', 'ASC']] })).map((e) => e.kind);
    expect(kinds).toEqual(['reported', 'assignment', 'tool_state']);

    const newEvents = events.slice(seen);
    expect(newEvents.find((e) => e.type === 'ticket.created')).toMatchObject({
      audience: 'all',
      payload: { id: ticket!.id, toolId: tool.id },
    });
    expect(newEvents.find((e) => e.type === 'tool.state_changed')).toMatchObject({
      payload: { toolId: tool.id, state: 'unscheduled_downtime' },
    });
    expect(newEvents.find((e) => e.type === 'notice.created')).toMatchObject({
      audience: { users: expect.arrayContaining([primary.id, backup.id]) },
    });

    expect(await Notice.count({ where: { userId: [primary.id, backup.id], link: `/tickets/${ticket!.id}` } })).toBe(2);
    await sendMail();
    const mail = await server.catcher.waitFor((m) => m.to.includes(primary.email) && m.subject.includes(`#${ticket!.id}`));
    expect(mail.text).toContain('E-17 ROBOT TIMEOUT');
    expect(mail.text).toContain(`${server.config.publicUrl}/tickets/${ticket!.id}`);
    await server.catcher.waitFor((m) => m.to.includes(backup.email) && m.subject.includes(`#${ticket!.id}`));

    const detail = await client.get(`/api/tickets/${ticket!.id}`);
    expect(detail.status).toBe(200);
    expect(detail.body.toolStates.find((s: any) => s.moduleId === null)).toMatchObject({
      state: 'unscheduled_downtime',
      source: 'user_report',
      confirmed: false,
    });
    expect(detail.body.allowedActions).not.toContain('acknowledge');
  });

  it('when a report names a hazard, then it is P1 and everyone on call gets an e-mail with the cautions at once', async () => {
    const onCall = await createUser('technician', { onCall: true });
    onCallUsers.push(onCall.id);
    const { tool } = await createTool(server.deps.sequelize, { criticality: 'low' });
    const { client } = await signedInClient(server.url, 'member');
    const t = await fileReport(client, tool.id, {
      category: 'leak_smell',
      description: 'Sharp smell near the wet bench exhaust',
      hazards: ['smell', 'leak'],
      impact: 'still_usable',
    });
    expect(t.priority).toBe('P1');
    await sendMail();
    const mail = await server.catcher.waitFor((m) => m.to.includes(onCall.email) && m.subject.includes(`#${t.id}`));
    expect(mail.subject).toMatch(/Safety report/);
    expect(mail.text).toContain(HAZARD_CAUTIONS[0]);
    expect(mail.text).toContain(HAZARD_CAUTIONS[HAZARD_CAUTIONS.length - 1]);
  });

  it('when a module is reported stopped, then only that module goes down', async () => {
    const { tool, modules } = await createTool(server.deps.sequelize, { modules: ['PM1', 'PM2'] });
    const { client } = await signedInClient(server.url, 'member');
    await fileReport(client, tool.id, { moduleId: modules[1].id, impact: 'tool_stopped' });
    expect((await openState(tool.id))!.state).toBe('standby');
    expect((await openState(tool.id, modules[1].id))!.state).toBe('unscheduled_downtime');
    expect((await openState(tool.id, modules[0].id))!.state).toBe('standby');
  });

  it('when a module of another tool is named, then the report is refused with 400 and nothing is written', async () => {
    const a = await createTool(server.deps.sequelize, { modules: ['PM1'] });
    const b = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const r = await client.post('/api/tickets', {
      toolId: b.tool.id,
      moduleId: a.modules[0].id,
      category: 'other',
      description: 'Wrong module',
      impact: 'still_usable',
    });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.moduleId).toBeDefined();
    expect(await Ticket.count({ where: { toolId: b.tool.id } })).toBe(0);
  });
});

describe('the repair workflow', () => {
  it('when a technician acknowledges, confirms, waits for parts, resumes and marks it fixed with return to service, then the tool runs again, every step is in the timeline and the reporter is told', async () => {
    const { client: tech, user: techUser } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member, user: reporter } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id, { impact: 'tool_stopped' });

    expect((await act(tech, t.id, { action: 'acknowledge' })).status).toBe(200);
    let ticket = await Ticket.findByPk(t.id);
    expect(ticket!.status).toBe('acknowledged');
    expect(ticket!.acknowledgedAt).not.toBeNull();
    expect(ticket!.assigneeId).toBe(techUser.id); // nobody was assigned: whoever acknowledges takes it

    expect((await act(tech, t.id, { action: 'confirm_down' })).status).toBe(200);
    const confirmed = await openState(tool.id);
    expect(confirmed).toMatchObject({ state: 'unscheduled_downtime', confirmed: true, ticketId: t.id });

    expect((await act(tech, t.id, { action: 'wait', waitReason: 'parts', note: 'Arm encoder ordered' })).status).toBe(200);
    // The Down's reason follows the wait, so analytics can tell a parts delay from repair time.
    expect((await openState(tool.id))!.reason).toBe('waiting_parts');
    expect((await act(tech, t.id, { action: 'resume' })).status).toBe(200);
    expect((await openState(tool.id))!.reason).toBe('repair');

    const fix = await act(tech, t.id, {
      action: 'fix',
      fixKind: 'failure',
      failureMode: 'Robot encoder',
      cause: 'Worn encoder cable',
      workDone: 'Replaced the encoder cable and re-taught the arm',
      partsUsed: 'Encoder cable',
      handsOnMinutes: 95,
      wafersRecovered: 2,
      wafersReturned: 2,
      returnToService: true,
    });
    expect(fix.status).toBe(200);
    ticket = await Ticket.findByPk(t.id);
    expect(ticket).toMatchObject({
      status: 'fixed',
      fixKind: 'failure',
      failureMode: 'Robot encoder',
      handsOnMinutes: 95,
      wafersRecovered: 2,
    });
    expect(ticket!.fixedAt).not.toBeNull();
    expect(ticket!.resolvedAt).not.toBeNull();
    expect((await openState(tool.id))!.state).toBe('standby');

    const detail = await member.get(`/api/tickets/${t.id}`);
    const statusSteps = detail.body.events.filter((e: any) => e.kind === 'status').map((e: any) => `${e.data.from}>${e.data.to}`);
    expect(statusSteps).toEqual(['reported>acknowledged', 'acknowledged>waiting', 'waiting>in_repair', 'in_repair>fixed']);
    expect(detail.body.events.filter((e: any) => e.kind === 'tool_state').length).toBe(4); // down, waiting parts, repair, standby
    expect(detail.body.events.some((e: any) => e.kind === 'down_confirmed')).toBe(true);

    await sendMail();
    const mail = await server.catcher.waitFor(
      (m) => m.to.includes(reporter.email) && m.subject.includes(`#${t.id}`) && m.subject.includes('Fixed'),
    );
    expect(mail.text).toContain('back in service');
    // The person who acted is not mailed about their own action.
    expect(server.catcher.messages.some((m) => m.to.includes(techUser.email) && m.subject.includes(`[#${t.id}] Fixed`))).toBe(false);

    expect((await act(tech, t.id, { action: 'close' })).status).toBe(200);
    expect((await Ticket.findByPk(t.id))!.status).toBe('closed');
  });

  it('when a technician reverts a user-reported Down, then the tool goes back to the state it had before', async () => {
    const { client: tech } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id, { impact: 'tool_stopped' });
    const r = await act(tech, t.id, { action: 'revert_down', note: 'Runs fine; the user had the wrong recipe' });
    expect(r.status).toBe(200);
    const now = await openState(tool.id);
    expect(now).toMatchObject({ state: 'standby', source: 'staff', ticketId: t.id });
    const intervals = await StateInterval.findAll({
      where: { toolId: tool.id, moduleId: null },
      order: [
        ['startedAt', 'ASC'],
        ['id', 'ASC'],
      ],
    });
    expect(intervals.map((i) => i.state)).toEqual(['standby', 'unscheduled_downtime', 'standby']);
    expect((await act(tech, t.id, { action: 'revert_down' })).status).toBe(409);
  });

  it('when a second member adds a report with a hazard, then the ticket keeps both authors, rises to P1 and the on-call list is told', async () => {
    const onCall = await createUser('technician', { onCall: true });
    onCallUsers.push(onCall.id);
    const { tool } = await createTool(server.deps.sequelize);
    const { client: first } = await signedInClient(server.url, 'member');
    const { client: second, user: secondUser } = await signedInClient(server.url, 'member');
    const t = await fileReport(first, tool.id, { impact: 'tool_limited' });
    expect(t.priority).toBe('P3');

    const r = await second.post(`/api/tickets/${t.id}/reports`, {
      description: 'Seen it too, and now there is a burning smell',
      hazards: ['fire_smoke'],
      impact: 'tool_stopped',
    });
    expect(r.status).toBe(201);
    const ticket = await Ticket.findByPk(t.id);
    expect(ticket).toMatchObject({ priority: 'P1', impact: 'tool_stopped', hazards: ['fire_smoke'] });
    expect((await openState(tool.id))!.state).toBe('unscheduled_downtime');

    const detail = await first.get(`/api/tickets/${t.id}`);
    const added = detail.body.events.find((e: any) => e.kind === 'added_report');
    expect(added.actor).toEqual({ id: secondUser.id, name: secondUser.name });
    expect(added.body).toContain('burning smell');
    await sendMail();
    await server.catcher.waitFor((m) => m.to.includes(onCall.email) && m.subject.includes(`#${t.id}`) && /Safety/.test(m.subject));
  });

  it('when a technician merges a duplicate, then the target shows the merged report with its author and photos, and later news reaches both reporters', async () => {
    const { client: tech } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize);
    const { client: a } = await signedInClient(server.url, 'member');
    const { client: b, user: bUser } = await signedInClient(server.url, 'member');
    const first = await fileReport(a, tool.id, { description: 'Spin chuck vacuum error' });
    const form = new FormData();
    form.append(
      'report',
      JSON.stringify({
        toolId: tool.id,
        category: 'vacuum',
        description: 'Chuck vacuum low again',
        impact: 'tool_stopped',
        hazards: [],
        wafersCount: 1,
      }),
    );
    form.append('photos', new Blob([new Uint8Array(await jpegBytes())], { type: 'image/jpeg' }), 'chuck.jpg');
    const second = await b.post('/api/tickets', form);
    expect(second.status).toBe(201);
    expect((await openState(tool.id))!.ticketId).toBe(second.body.id);

    const merged = await act(tech, second.body.id, { action: 'merge', targetId: first.id });
    expect(merged.status).toBe(200);
    expect(await Ticket.findByPk(second.body.id)).toMatchObject({ status: 'merged', mergedIntoId: first.id });
    // The Down the duplicate caused now belongs to the ticket that stays.
    expect((await openState(tool.id))!.ticketId).toBe(first.id);
    const target = await Ticket.findByPk(first.id);
    expect(target).toMatchObject({ impact: 'tool_stopped', priority: 'P2', wafersCount: 1 });

    const detail = await a.get(`/api/tickets/${first.id}`);
    expect(detail.body.mergedFrom).toEqual([{ id: second.body.id, title: 'Chuck vacuum low again' }]);
    const fromMerged = detail.body.events.filter((e: any) => e.fromTicketId === second.body.id);
    expect(fromMerged.find((e: any) => e.kind === 'reported')).toMatchObject({
      actor: { id: bUser.id },
      photos: [expect.objectContaining({ url: expect.stringMatching(/^\/api\/photos\/\d+$/) })],
    });

    expect((await b.post(`/api/tickets/${second.body.id}/reports`, { description: 'more' })).status).toBe(409);
    expect(
      (
        await act(tech, first.id, {
          action: 'fix',
          fixKind: 'assist',
          workDone: 'Cleaned the chuck O-ring',
          wafersRecovered: 1,
          wafersReturned: 1,
        })
      ).status,
    ).toBe(200);
    await sendMail();
    await server.catcher.waitFor((m) => m.to.includes(bUser.email) && m.subject.includes(`[#${first.id}] Fixed`));
  });

  it('when the reporter reopens within 7 days, then it goes back to Acknowledged; another member, or the reporter after the window, is refused', async () => {
    const { client: tech } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize);
    const { client: reporter } = await signedInClient(server.url, 'member');
    const { client: other } = await signedInClient(server.url, 'member');
    const t = await fileReport(reporter, tool.id);
    expect((await act(tech, t.id, { action: 'fix', fixKind: 'assist', workDone: 'Reset the controller' })).status).toBe(200);

    expect((await act(other, t.id, { action: 'reopen' })).status).toBe(403);
    const r = await act(reporter, t.id, { action: 'reopen', reason: 'Same alarm again after one run' });
    expect(r.status).toBe(200);
    expect(await Ticket.findByPk(t.id)).toMatchObject({ status: 'acknowledged', resolvedAt: null, fixedAt: null });

    expect((await act(tech, t.id, { action: 'fix', fixKind: 'assist', workDone: 'Reset again' })).status).toBe(200);
    await Ticket.update({ resolvedAt: new Date(Date.now() - 8 * 86_400_000) }, { where: { id: t.id } });
    const late = await act(reporter, t.id, { action: 'reopen' });
    expect(late.status).toBe(403);
    expect(late.body.error.message).toMatch(/7 days/);
  });

  it('when a technician overrides the priority with a reason, then it sticks even when new facts arrive', async () => {
    const { client: tech } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id);
    expect(t.priority).toBe('P4');
    expect((await act(tech, t.id, { action: 'set_priority', priority: 'P2' })).status).toBe(400); // a reason is required
    expect((await act(tech, t.id, { action: 'set_priority', priority: 'P2', reason: 'Only tool for the course next week' })).status).toBe(
      200,
    );
    await member.post(`/api/tickets/${t.id}/reports`, { description: 'Also slow to pump down', impact: 'tool_limited' });
    expect(await Ticket.findByPk(t.id)).toMatchObject({ priority: 'P2', priorityOverridden: true });
    const event = await TicketEvent.findOne({ where: { ticketId: t.id, kind: 'priority' } });
    expect(event).toMatchObject({ body: 'Only tool for the course next week', data: { from: 'P4', to: 'P2' } });
  });

  it('when a technician sets the tool state from the ticket with an expected return, then the state log links the ticket', async () => {
    const { client: tech } = await staffClient();
    const { tool, modules } = await createTool(server.deps.sequelize, { modules: ['LL'] });
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id);
    const back = new Date(Date.now() + 3 * 3_600_000).toISOString();
    const r = await act(tech, t.id, {
      action: 'set_state',
      moduleId: modules[0].id,
      state: 'unscheduled_downtime',
      reason: 'repair',
      note: 'Load lock door seal',
      expectedReturnAt: back,
    });
    expect(r.status).toBe(200);
    const s = await openState(tool.id, modules[0].id);
    expect(s).toMatchObject({ state: 'unscheduled_downtime', ticketId: t.id, source: 'staff', note: 'Load lock door seal' });
    expect(s!.expectedReturnAt!.toISOString()).toBe(back);
    expect((await act(tech, t.id, { action: 'set_state', state: 'standby', reason: 'repair' })).status).toBe(400);
  });

  it('when the workflow does not allow a step, then it is refused with 409 invalid_transition', async () => {
    const { client: tech } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id);
    const r = await act(tech, t.id, { action: 'close' });
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('invalid_transition');
  });
});

describe('the queue', () => {
  it('when staff filter and page the queue, then it is sorted by priority then age and every filter is applied in the query', async () => {
    const { client: tech, user: techUser } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize, { primaryEngineerId: techUser.id });
    const { tool: other } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const p4 = await fileReport(member, tool.id, { description: 'Cosmetic: cover panel loose' });
    const p1 = await fileReport(member, tool.id, { description: 'Smoke from the RF generator', hazards: ['fire_smoke'] });
    const p2 = await fileReport(member, tool.id, { description: 'Stopped with an interlock', impact: 'tool_stopped' });
    const elsewhere = await fileReport(member, other.id, { description: 'Other tool' });
    await act(tech, p2.id, { action: 'acknowledge' });
    await act(tech, p2.id, { action: 'wait', waitReason: 'vendor' });

    const list = await tech.get(`/api/tickets?toolId=${tool.id}`);
    expect(list.status).toBe(200);
    expect(list.body.items.map((t: any) => t.id)).toEqual([p1.id, p2.id, p4.id]);
    expect(list.body.items[0]).toMatchObject({ priority: 'P1', hazards: ['fire_smoke'], tool: { id: tool.id } });
    expect(list.body.items[0].targets.acknowledge).toMatchObject({ targetMinutes: expect.any(Number), status: 'ok', doneAt: null });

    const ids = async (q: string) => (await tech.get(`/api/tickets?${q}&limit=100`)).body.items.map((t: any) => t.id);
    expect(await ids(`toolId=${tool.id}&hazard=true`)).toEqual([p1.id]);
    expect(await ids(`toolId=${tool.id}&waiting=true`)).toEqual([p2.id]);
    expect(await ids(`myTools=true`)).toEqual(expect.arrayContaining([p1.id, p2.id, p4.id]));
    expect(await ids(`myTools=true`)).not.toContain(elsewhere.id);
    expect(await ids(`toolId=${tool.id}&mine=true`)).toEqual([p1.id, p2.id, p4.id]); // assigned to the primary engineer
    expect(await ids(`toolId=${other.id}&unassigned=true`)).toEqual([elsewhere.id]);
    expect(await ids(`areaId=${other.areaId}`)).toEqual([elsewhere.id]);
    expect(await ids(`toolId=${tool.id}&status=waiting`)).toEqual([p2.id]);

    const page = await tech.get(`/api/tickets?toolId=${tool.id}&limit=2&offset=2`);
    expect(page.body).toMatchObject({ total: 3, limit: 2, offset: 2 });
    expect(page.body.items.map((t: any) => t.id)).toEqual([p4.id]);
    expect((await tech.get('/api/tickets?limit=500')).status).toBe(400);
  });

  it('when a member opens "my reports", then it lists the tickets they filed or added to, newest first', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: me } = await signedInClient(server.url, 'member');
    const { client: someone } = await signedInClient(server.url, 'member');
    const mine = await fileReport(me, tool.id);
    const theirs = await fileReport(someone, tool.id);
    const untouched = await fileReport(someone, tool.id);
    await me.post(`/api/tickets/${theirs.id}/reports`, { description: 'Same here' });
    const r = await me.get('/api/tickets?reportedByMe=true&status=all&sort=newest');
    const ids = r.body.items.map((t: any) => t.id);
    expect(ids).toEqual([theirs.id, mine.id]);
    expect(ids).not.toContain(untouched.id);
  });
});

describe('concurrent edits', () => {
  it('when two technicians save on the same version, then the second gets 409 stale_version with the current ticket', async () => {
    const { client: one } = await staffClient();
    const { client: two, user: twoUser } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id);
    const read = (await one.get(`/api/tickets/${t.id}`)).body.version;

    const first = await one.post(`/api/tickets/${t.id}/actions`, { action: 'acknowledge', version: read });
    expect(first.status).toBe(200);
    const second = await two.post(`/api/tickets/${t.id}/actions`, { action: 'assign', assigneeId: twoUser.id, version: read });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('stale_version');
    expect(second.body.current).toMatchObject({ id: t.id, status: 'acknowledged', version: first.body.version });
    expect((await Ticket.findByPk(t.id))!.assigneeId).not.toBe(twoUser.id);

    // Re-applied on the version it was shown, the change goes through.
    const again = await two.post(`/api/tickets/${t.id}/actions`, {
      action: 'assign',
      assigneeId: twoUser.id,
      version: second.body.current.version,
    });
    expect(again.status).toBe(200);
  });
});
