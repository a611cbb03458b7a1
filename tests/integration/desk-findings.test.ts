import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';
import { TestClient } from '../support/client';
import { Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';
import { User } from '../../server/modules/users/user.model';
import { Area } from '../../server/modules/facility/facility.model';
import { Notice } from '../../server/modules/notices/notice.model';
import { OutboxMail } from '../../server/lib/outbox.model';
import { GENERIC_CAUTIONS, HAZARD_FIRST_STEPS, LIMITS_CAUTION } from '../../shared/hazard-cautions';
import { createTool, drainOutbox, fileReport, jpegBytes, multipartReport, openState, reportBody } from './tickets-fixtures';

// What people at the tools and at the desk ran into, checked at the API: each answer must
// be given by a person, not assumed by the app.

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  await drainOutbox(server);
  await server.close();
});

async function staffClient(role: 'technician' | 'manager' | 'admin' = 'technician') {
  const user = await createUser(role);
  const client = new TestClient(server.url);
  if ((await client.signIn(user.email, TEST_PASSWORD)).status !== 200) throw new Error('sign-in failed');
  return { client, user };
}

async function act(client: TestClient, id: number, body: Record<string, unknown>) {
  const current = await client.get(`/api/tickets/${id}`);
  return client.post(`/api/tickets/${id}/actions`, { version: current.body.version, ...body });
}

describe('marking a ticket fixed', () => {
  it('when wafers were reported and the fix does not say what became of them, then it is refused with field messages and nothing changes', async () => {
    const { client: tech } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id, { impact: 'tool_stopped', wafersCount: 3 });
    const eventsBefore = await TicketEvent.count({ where: { ticketId: t.id } });

    const r = await act(tech, t.id, { action: 'fix', fixKind: 'failure', workDone: 'Replaced the lift pin' });
    expect(r.status).toBe(400);
    expect(Object.keys(r.body.error.fields).sort()).toEqual(['wafersRecovered', 'wafersReturned']);
    expect(await Ticket.findByPk(t.id)).toMatchObject({ status: 'reported', fixedAt: null });
    expect(await TicketEvent.count({ where: { ticketId: t.id } })).toBe(eventsBefore);

    // Zero is an answer.
    const ok = await act(tech, t.id, {
      action: 'fix',
      fixKind: 'failure',
      workDone: 'Replaced the lift pin',
      wafersRecovered: 0,
      wafersReturned: 0,
    });
    expect(ok.status).toBe(200);
    expect(await Ticket.findByPk(t.id)).toMatchObject({ status: 'fixed', wafersRecovered: 0, wafersReturned: 0 });
  });

  it('when a fix is sent without saying "return to service", then the tool stays Down', async () => {
    const { client: tech } = await staffClient();
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id, { impact: 'tool_stopped' });
    expect((await act(tech, t.id, { action: 'fix', fixKind: 'assist', workDone: 'Reset the controller' })).status).toBe(200);
    expect((await openState(tool.id))!.state).toBe('unscheduled_downtime');
  });
});

describe('facility settings', () => {
  const valid = {
    facilityName: 'Test facility (fictional)',
    timeZone: 'America/Chicago',
    emergencyNumber: '4444',
    localProcedure: 'Assembly point: the north car park.',
    memberTicketVisibility: 'all',
  };

  it('when an admin saves valid settings, then everyone signed in reads them; bad input is a 400 with field messages and writes nothing', async () => {
    const { client: admin } = await staffClient('admin');
    const before = (await admin.get('/api/facility-settings')).body;
    try {
      const saved = await admin.put('/api/admin/facility-settings', valid);
      expect(saved.status).toBe(200);
      expect(saved.body).toEqual(valid);
      const { client: member } = await signedInClient(server.url, 'member');
      expect((await member.get('/api/facility-settings')).body).toEqual(valid);

      const bad = await admin.put('/api/admin/facility-settings', {
        ...valid,
        facilityName: '  ',
        timeZone: 'Mars/Olympus',
        emergencyNumber: 'call someone',
        memberTicketVisibility: 'nobody',
        extra: 1,
      });
      expect(bad.status).toBe(400);
      expect(Object.keys(bad.body.error.fields).sort()).toEqual([
        'emergencyNumber',
        'extra',
        'facilityName',
        'memberTicketVisibility',
        'timeZone',
      ]);
      expect((await member.get('/api/facility-settings')).body).toEqual(valid);

      expect((await member.put('/api/admin/facility-settings', valid)).status).toBe(403);
    } finally {
      await admin.put('/api/admin/facility-settings', before);
    }
  });

  it('when a hazard is reported, then the on-call mail carries the cautions for that hazard and the facility emergency number, with the limits line last', async () => {
    const { client: admin } = await staffClient('admin');
    const before = (await admin.get('/api/facility-settings')).body;
    const onCall = await createUser('technician', { onCall: true });
    try {
      await admin.put('/api/admin/facility-settings', valid);
      const { tool } = await createTool(server.deps.sequelize);
      const { client: member } = await signedInClient(server.url, 'member');
      const t = await fileReport(member, tool.id, { hazards: ['injury'] });
      await server.worker.runOnce();
      const mail = await server.catcher.waitFor((m) => m.to.includes(onCall.email) && m.subject.includes(`#${t.id}`));
      expect(mail.text).toContain('Emergency number: 4444');
      expect(mail.text).toContain('Assembly point: the north car park.');
      expect(mail.text).toContain(HAZARD_FIRST_STEPS.injury[0]);
      expect(mail.text).not.toContain(HAZARD_FIRST_STEPS.smell[0]);
      expect(mail.text).not.toMatch(/usual cautions/i);
      // The limits line comes after every caution line.
      const at = (line: string) => mail.text.indexOf(line);
      expect(at(LIMITS_CAUTION)).toBeGreaterThan(
        Math.max(at(GENERIC_CAUTIONS[GENERIC_CAUTIONS.length - 1]), at(HAZARD_FIRST_STEPS.injury[2])),
      );
    } finally {
      await User.update({ onCall: false }, { where: { id: onCall.id } });
      await admin.put('/api/admin/facility-settings', before);
    }
  });
});

describe('who may read tickets', () => {
  it('when the facility lets members see only their own reports, then another member gets 404 for the ticket, its photos, replies and actions, and lists show only their own; staff still see all', async () => {
    const { client: admin } = await staffClient('admin');
    const before = (await admin.get('/api/facility-settings')).body;
    const { tool } = await createTool(server.deps.sequelize);
    const { client: owner } = await signedInClient(server.url, 'member');
    const { client: other } = await signedInClient(server.url, 'member');
    const form = multipartReport(reportBody(tool.id, { description: 'Owner report with a photo' }), [
      { bytes: await jpegBytes(), name: 'a.jpg' },
    ]);
    const created = await owner.post('/api/tickets', form);
    expect(created.status).toBe(201);
    const id = created.body.id as number;
    const photoId = (await owner.get(`/api/tickets/${id}`)).body.events.find((e: any) => e.photos.length).photos[0].id as number;
    const own = await fileReport(other, tool.id, { description: 'Other member report' });

    // The default is an open facility: everyone reads everything.
    expect((await other.get(`/api/tickets/${id}`)).status).toBe(200);
    try {
      expect((await admin.put('/api/admin/facility-settings', { ...before, memberTicketVisibility: 'own' })).status).toBe(200);
      expect((await other.get(`/api/tickets/${id}`)).status).toBe(404);
      expect((await other.get(`/api/photos/${photoId}`)).status).toBe(404);
      expect((await other.get(`/api/photos/${photoId}/thumb`)).status).toBe(404);
      expect((await other.post(`/api/tickets/${id}/comments`, { body: 'hello', internal: false })).status).toBe(404);
      expect((await other.post(`/api/tickets/${id}/reports`, { description: 'me too' })).status).toBe(404);
      expect((await other.post(`/api/tickets/${id}/actions`, { version: 0, action: 'close' })).status).toBe(404);
      const list = await other.get(`/api/tickets?toolId=${tool.id}&status=all`);
      expect(list.body.items.map((t: any) => t.id)).toEqual([own.id]);

      expect((await owner.get(`/api/tickets/${id}`)).status).toBe(200);
      expect((await owner.get(`/api/photos/${photoId}`)).status).toBe(200);
      const { client: tech } = await staffClient();
      expect((await tech.get(`/api/tickets/${id}`)).status).toBe(200);
      expect((await tech.get(`/api/tickets?toolId=${tool.id}&status=all`)).body.items).toHaveLength(2);
      // The board stays public: it still counts both open tickets.
      const board = await other.get('/api/board');
      expect(JSON.stringify(board.body)).toContain(tool.code);
    } finally {
      await admin.put('/api/admin/facility-settings', before);
    }
  });
});

describe('one draft in two tabs', () => {
  it('when a draft key already sent comes back with other words, then it is refused with 409 and no ticket is made; the same words again are a resend', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const clientKey = `two-tabs-${Date.now()}`;
    const first = await client.post('/api/tickets', reportBody(tool.id, { description: 'Words from the first tab', clientKey }));
    expect(first.status).toBe(201);
    const again = await client.post('/api/tickets', reportBody(tool.id, { description: 'Words from the first tab', clientKey }));
    expect(again.body.id).toBe(first.body.id);

    const other = await client.post(
      '/api/tickets',
      reportBody(tool.id, { description: 'Different words typed in the second tab', clientKey }),
    );
    expect(other.status).toBe(409);
    expect(other.body.error.code).toBe('draft_sent_elsewhere');
    expect(other.body.error.message).toContain(`#${first.body.id}`);
    expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(1);
  });
});

describe('search', () => {
  it('when a code is typed in lower case without its hyphen or with a space, or a bay name is typed, then the board and the report form find the tool', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const area = await Area.findByPk(tool.areaId);
    const { client } = await signedInClient(server.url, 'member');
    const loose = tool.code.toLowerCase().replace('-', ' ');
    const squashed = tool.code.replace('-', '');
    const bay = area!.name.toLowerCase().replace('-', ' ');
    for (const q of [loose, squashed, bay]) {
      const picks = await client.get(`/api/report-tools?q=${encodeURIComponent(q)}`);
      expect(picks.status).toBe(200);
      expect(picks.body.items.map((t: any) => t.code)).toContain(tool.code);
      const board = await client.get(`/api/board?q=${encodeURIComponent(q)}`);
      expect(board.body.areas.flatMap((a: any) => a.tools.map((t: any) => t.code))).toContain(tool.code);
    }
    const none = await client.get(`/api/report-tools?q=${encodeURIComponent(tool.code + 'zz')}`);
    expect(none.body.items).toEqual([]);
  });
});

describe('"tool limited" reports', () => {
  it('when a member reports "tool limited", then the board reads Limited as reported by a user, and returning to service after the fix clears it', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id, { impact: 'tool_limited', description: 'The 150 mm chuck cannot be used' });
    const open = await openState(tool.id);
    expect(open).toMatchObject({ ticketId: t.id, source: 'user_report', confirmed: false });
    expect(open!.restriction).toContain('The 150 mm chuck cannot be used');
    const board = await member.get(`/api/board?q=${tool.code}`);
    const entry = board.body.areas.flatMap((a: any) => a.tools).find((x: any) => x.code === tool.code);
    expect(entry.status).toBe('limited');

    const { client: tech } = await staffClient();
    expect((await act(tech, t.id, { action: 'start_repair' })).status).toBe(200);
    expect((await openState(tool.id))!.restriction).not.toBeNull();
    expect(
      (await act(tech, t.id, { action: 'fix', fixKind: 'failure', workDone: 'Replaced the chuck seal', returnToService: true })).status,
    ).toBe(200);
    const after = await openState(tool.id);
    expect(after!.restriction).toBeNull();
    expect(after!.state).toBe('standby');
  });
});

describe('stale words on the board', () => {
  it('when a technician waits with a note and then resumes the repair, then the board no longer shows the waiting note', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id, { impact: 'tool_stopped' });
    const { client: tech } = await staffClient();
    expect((await act(tech, t.id, { action: 'acknowledge' })).status).toBe(200);
    expect((await act(tech, t.id, { action: 'wait', waitReason: 'parts', note: 'Waiting for a new pressure gauge' })).status).toBe(200);
    const boardEntry = async () =>
      (await member.get(`/api/board?q=${tool.code}`)).body.areas.flatMap((a: any) => a.tools).find((x: any) => x.code === tool.code);
    expect((await boardEntry()).note).toBe('Waiting for a new pressure gauge');
    expect((await act(tech, t.id, { action: 'resume' })).status).toBe(200);
    const entry = await boardEntry();
    expect(entry.status).toBe('down');
    expect(entry.note ?? '').not.toContain('pressure gauge');
  });
});

describe('notices without the flood', () => {
  it('when a reporter who follows the tool sees one repair through, then they get one notice per step and no follower notices, and another follower hears only Down and back', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: reporter, user: reporterUser } = await signedInClient(server.url, 'member');
    const { client: watcher, user: watcherUser } = await signedInClient(server.url, 'member');
    expect((await reporter.put(`/api/tools/${tool.id}/follow`)).status).toBe(200);
    expect((await watcher.put(`/api/tools/${tool.id}/follow`)).status).toBe(200);
    const t = await fileReport(reporter, tool.id, { impact: 'tool_stopped' });
    const { client: tech } = await staffClient();
    for (const step of [
      { action: 'acknowledge' },
      { action: 'wait', waitReason: 'parts', note: 'Gauge ordered' },
      { action: 'resume' },
      { action: 'fix', fixKind: 'failure', workDone: 'New gauge fitted', returnToService: true },
    ]) {
      expect((await act(tech, t.id, step)).status).toBe(200);
    }
    const mine = await Notice.findAll({ where: { userId: reporterUser.id }, order: [['id', 'ASC']] });
    expect(mine.map((n) => n.kind)).toEqual(['ticket.acknowledged', 'ticket.waiting', 'ticket.in_repair', 'ticket.fixed']);
    const theirs = await Notice.findAll({ where: { userId: watcherUser.id }, order: [['id', 'ASC']] });
    expect(theirs.map((n) => n.title)).toEqual([expect.stringMatching(/is now Down$/), expect.stringMatching(/is now Running$/)]);
    const watcherMail = await OutboxMail.findAll({ where: { toAddress: watcherUser.email } });
    expect(watcherMail).toHaveLength(2);
    expect(watcherMail.some((m) => /from Down to Down/.test(m.textBody))).toBe(false);
  });

  it('when several updates on one ticket come within the fold window, then the person gets one mail carrying all of them', async () => {
    const folding = await startTestServer({ MAIL_FOLD_MS: '120000' }, { outboxWorker: false });
    try {
      const { tool } = await createTool(folding.deps.sequelize);
      const { client: reporter, user: reporterUser } = await signedInClient(folding.url, 'member');
      const t = await fileReport(reporter, tool.id, { impact: 'tool_stopped' });
      const techUser = await createUser('technician');
      const tech = new TestClient(folding.url);
      await tech.signIn(techUser.email, TEST_PASSWORD);
      for (const step of [
        { action: 'acknowledge' },
        { action: 'start_repair' },
        { action: 'fix', fixKind: 'assist', workDone: 'Reset the controller', returnToService: true },
      ]) {
        const current = await tech.get(`/api/tickets/${t.id}`);
        expect((await tech.post(`/api/tickets/${t.id}/actions`, { version: current.body.version, ...step })).status).toBe(200);
      }
      const rows = await OutboxMail.findAll({ where: { toAddress: reporterUser.email } });
      expect(rows).toHaveLength(1);
      expect(rows[0].nextAttemptAt.getTime()).toBeGreaterThan(Date.now());
      // The window passes: the one mail goes out with every update in order.
      await rows[0].update({ nextAttemptAt: new Date() });
      await folding.worker.runOnce();
      const mail = await folding.catcher.waitFor((m) => m.to.includes(reporterUser.email));
      expect(mail.subject).toContain('(3 updates)');
      const at = (s: string) => mail.text.indexOf(s);
      expect(at('acknowledged your report')).toBeGreaterThan(-1);
      expect(at('acknowledged your report')).toBeLessThan(at('The repair has started'));
      expect(at('The repair has started')).toBeLessThan(at('The problem is fixed'));
    } finally {
      await drainOutbox(folding);
      await folding.close();
    }
  });
});

describe('waiting with an expected date', () => {
  it('when a technician sets waiting with an expected date, then the board shows it as the expected return', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id, { impact: 'tool_stopped' });
    const { client: tech } = await staffClient();
    const due = new Date(Date.now() + 3 * 24 * 3_600_000);
    expect((await act(tech, t.id, { action: 'acknowledge' })).status).toBe(200);
    expect(
      (await act(tech, t.id, { action: 'wait', waitReason: 'parts', note: 'Valve ordered', expectedReturnAt: due.toISOString() })).status,
    ).toBe(200);
    const entry = (await member.get(`/api/board?q=${tool.code}`)).body.areas
      .flatMap((a: any) => a.tools)
      .find((x: any) => x.code === tool.code);
    expect(new Date(entry.expectedReturnAt).getTime()).toBe(due.getTime());
  });
});
