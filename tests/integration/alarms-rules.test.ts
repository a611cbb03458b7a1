import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { io as connect, type Socket } from 'socket.io-client';
import { startTestServer, drainOutbox, type TestServer } from '../support/server';
import { createUser, signedInClient } from '../support/factories';
import { alarmEvent, ingest, setClearPairs, toolWithKey } from './alarms-fixtures';
import { openState } from './tickets-fixtures';
import { runAlarmSweep } from '../../server/modules/alarms/sweep';
import type { TestClient } from '../support/client';
import type { BoardToolChange } from '../../shared/events';

let server: TestServer;
let tech: TestClient;
beforeAll(async () => {
  // The outbox is drained by hand, so each test counts exactly the mail it caused.
  server = await startTestServer({}, { outboxWorker: false });
  tech = (await signedInClient(server.url, 'technician')).client;
});
afterAll(() => server.close());

const secondsAgo = (s: number) => new Date(Date.now() - s * 1000);
const mailTo = (email: string, match?: RegExp) =>
  server.catcher.messages.filter((m) => m.to.includes(email) && (!match || match.test(m.subject)));

async function engineerTool(opts: { modules?: string[] } = {}) {
  const engineer = await createUser('technician');
  const made = await toolWithKey(server, { primaryEngineerId: engineer.id, ...opts });
  return { ...made, engineer };
}

describe('alarm rules', () => {
  it('when an alarm’s rule opens a ticket and puts the tool Down, then one ticket, the tool Down on the board, the engineers mailed once; 20 repeats fold in (count 21)', async () => {
    const { tool, key, engineer } = await engineerTool();
    expect((await tech.patch(`/api/tools/${tool.code}/alarm-settings`, { defaultRule: 'ticket_down' })).status).toBe(200);

    const { client: viewer } = await signedInClient(server.url, 'member');
    const socket: Socket = connect(server.url, {
      path: '/socket.io',
      transports: ['websocket'],
      extraHeaders: { cookie: viewer.cookie! },
      forceNew: true,
    });
    try {
      await new Promise<void>((resolve, reject) => {
        socket.once('connect', () => resolve());
        socket.once('connect_error', reject);
      });
      // Board changes travel with the tool's new board entry (shared/events.ts).
      const heard = new Promise<BoardToolChange>((resolve) =>
        socket.on('board.tool_changed', (p: BoardToolChange) => p.tool.id === tool.id && resolve(p)),
      );
      const first = await ingest(server, key, 'alarms', {
        events: [alarmEvent(2041, true, secondsAgo(3 * 3600), { text: 'CHAMBER PRESSURE HIGH' })],
      });
      expect(first.status).toBe(202);
      const change = await Promise.race([
        heard,
        new Promise<never>((_, reject) => setTimeout(() => reject(new Error('no board.tool_changed within 10 s')), 10_000)),
      ]);
      expect(change.tool).toMatchObject({ id: tool.id, state: 'unscheduled_downtime', status: 'down' });
      expect(change.tool.activeAlarm).toMatchObject({ alarmId: '2041', text: 'CHAMBER PRESSURE HIGH' });
    } finally {
      socket.disconnect();
    }

    const board = await viewer.get('/api/board');
    const entry = board.body.areas.flatMap((a: { tools: { id: number }[] }) => a.tools).find((t: { id: number }) => t.id === tool.id);
    expect(entry.status).toBe('down');
    expect(entry.activeAlarm).toMatchObject({ alarmId: '2041', text: 'CHAMBER PRESSURE HIGH' });
    expect((await openState(tool.id))!.source).toBe('alarm');

    // Clear the first set, then 20 more set/clear pairs while the ticket is open, 7 minutes
    // apart (so neither chattering nor a flood: this is about folding alone).
    await ingest(server, key, 'alarms', { events: [alarmEvent(2041, false, secondsAgo(3 * 3600 - 60))] });
    for (let batch = 0; batch < 4; batch++) {
      await ingest(server, key, 'alarms', {
        events: setClearPairs(2041, 5, secondsAgo(3 * 3600 - 420 - batch * 5 * 420), 420_000, 30_000),
      });
    }
    await drainOutbox(server);

    const tickets = await tech.get(`/api/tickets?toolId=${tool.id}`);
    expect(tickets.body.total).toBe(1);
    const ticketId = tickets.body.items[0].id;
    expect(mailTo(engineer.email)).toHaveLength(1);
    expect(mailTo(engineer.email)[0].text).toContain('CHAMBER PRESSURE HIGH');

    const alarm = await tech.get(`/api/tickets/${ticketId}/alarm`);
    expect(alarm.body.alarm).toMatchObject({ alarmId: '2041', count: 21, active: false, setsIn90Days: 21, earlierTickets: [] });

    const detail = await tech.get(`/api/tickets/${ticketId}`);
    const kinds = detail.body.events.map((e: { kind: string }) => e.kind);
    expect(kinds).toContain('alarm_reported');
    expect(kinds).toContain('alarm_cleared');
    expect(detail.body.alarmText).toContain('2041');
    const repeat = detail.body.events.filter((e: { kind: string }) => e.kind === 'alarm_repeat').at(-1);
    expect(repeat.data.count).toBe(21);
    // The alarm has cleared, but a person returns the tool to service.
    expect((await openState(tool.id))!.state).toBe('unscheduled_downtime');
  });

  it('when an alarm chatters, then it is flagged, its notices are held, and one summary goes out after it stays clear for 10 minutes', async () => {
    const { tool, key, engineer } = await engineerTool();
    await tech.patch(`/api/tools/${tool.code}/alarm-settings`, { defaultRule: 'notify' });
    const start = secondsAgo(120);
    // Three sets within 45 s, one request each (as a tool would send them).
    for (const offset of [0, 20_000, 45_000]) {
      const at = new Date(start.getTime() + offset);
      await ingest(server, key, 'alarms', {
        events: [
          alarmEvent('LEVEL-3', true, at, { text: 'Waste level switch' }),
          alarmEvent('LEVEL-3', false, new Date(at.getTime() + 3000)),
        ],
      });
    }
    await drainOutbox(server);
    expect(mailTo(engineer.email)).toHaveLength(1); // the first set; the rest held

    const page = await tech.get(`/api/tools/${tool.code}/alarms`);
    expect(page.body.chatteringAlarms).toEqual(['LEVEL-3']);
    expect(page.body.history.filter((o: { chattering: boolean }) => o.chattering).length).toBeGreaterThanOrEqual(3);

    const lastClear = start.getTime() + 48_000;
    // Other tests' alarms may be swept too (shared database); this alarm's mail is what counts.
    await runAlarmSweep(server.deps, new Date(lastClear + 5 * 60_000));
    await drainOutbox(server);
    expect(mailTo(engineer.email, /Chattering alarm LEVEL-3/)).toHaveLength(0);
    expect((await tech.get(`/api/tools/${tool.code}/alarms`)).body.chatteringAlarms).toEqual(['LEVEL-3']);
    await runAlarmSweep(server.deps, new Date(lastClear + 11 * 60_000));
    await runAlarmSweep(server.deps, new Date(lastClear + 12 * 60_000));
    await drainOutbox(server);
    expect(mailTo(engineer.email, /Chattering alarm LEVEL-3/)).toHaveLength(1);
    expect(mailTo(engineer.email)).toHaveLength(2);
    expect((await tech.get(`/api/tools/${tool.code}/alarms`)).body.chatteringAlarms).toEqual([]);
  });

  it('when 50 alarms flood in two minutes, then one flood notice', async () => {
    const { tool, key, engineer } = await engineerTool();
    await tech.patch(`/api/tools/${tool.code}/alarm-settings`, { defaultRule: 'notify' });
    const start = secondsAgo(150).getTime();
    for (let batch = 0; batch < 5; batch++) {
      const events = Array.from({ length: 10 }, (_, i) =>
        alarmEvent(`F-${batch * 10 + i}`, true, new Date(start + (batch * 10 + i) * 2400)),
      );
      expect((await ingest(server, key, 'alarms', { events })).status).toBe(202);
    }
    await drainOutbox(server);
    expect(mailTo(engineer.email, /Alarm flood/)).toHaveLength(1);
    // Before the flood was recognised (the first 10), each alarm was told; none after.
    expect(mailTo(engineer.email).length).toBeLessThanOrEqual(11);
    expect((await tech.get(`/api/tools/${tool.code}/alarms`)).body.flood).not.toBeNull();
  });

  it('when a personal-safety alarm sets, then a P1 ticket and an on-call mail with the cautions', async () => {
    const onCall = await createUser('technician', { onCall: true });
    const { tool, key } = await engineerTool();
    const r = await ingest(server, key, 'alarms', {
      events: [{ id: 'safety-1', alarmId: 9001, alcd: 0x81, text: 'Toxic gas detector alarm', at: secondsAgo(5).toISOString() }],
    });
    expect(r.status).toBe(202);
    await drainOutbox(server);
    const tickets = await tech.get(`/api/tickets?toolId=${tool.id}`);
    expect(tickets.body.total).toBe(1);
    expect(tickets.body.items[0].priority).toBe('P1');
    const mail = mailTo(onCall.email, /Safety alarm/);
    expect(mail).toHaveLength(1);
    expect(mail[0].text).toContain('Toxic gas detector alarm');
    expect(mail[0].text).toMatch(/does not replace the facility’s alarm systems/);
  });

  it('when an alarm that never clears is cleared by a technician, then it stops being active and the ticket hears it', async () => {
    const { tool, key } = await engineerTool();
    await tech.patch(`/api/tools/${tool.code}/alarm-settings`, { defaultRule: 'ticket' });
    await ingest(server, key, 'alarms', {
      events: [{ id: 'irr-1', alarmId: 77, alcd: 0x85, text: 'Robot lost a wafer', at: secondsAgo(30).toISOString() }],
    });
    const page = await tech.get(`/api/tools/${tool.code}/alarms`);
    expect(page.body.active).toHaveLength(1);
    const cleared = await tech.post(`/api/alarm-occurrences/${page.body.active[0].id}/clear`);
    expect(cleared.status).toBe(200);
    const after = await tech.get(`/api/tools/${tool.code}/alarms`);
    expect(after.body.active).toHaveLength(0);
    expect(after.body.history[0].clearedBy).toBe('person');
    const detail = await tech.get(`/api/tickets/${page.body.active[0].ticketId}`);
    expect(detail.body.events.map((e: { kind: string }) => e.kind)).toContain('alarm_cleared');
  });

  it('when definitions are imported as CSV, then they are stored; a bad line refuses the whole file', async () => {
    const { tool } = await engineerTool();
    const bad = await tech.post(`/api/tools/${tool.code}/alarm-definitions/import`, {
      csv: 'alarm id,text,category\n10,Door open,6\n11,,4\n12,"Pump, fore line",12',
    });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(['csv.line3', 'csv.line4']);
    expect((await tech.get(`/api/tools/${tool.code}/alarm-definitions`)).body.total).toBe(0);
    const ok = await tech.post(`/api/tools/${tool.code}/alarm-definitions/import`, {
      csv: 'alarm id,text,category\n10,Door open,6\n12,"Pump, fore line",4',
    });
    expect(ok.body).toEqual({ imported: 2 });
    const list = await tech.get(`/api/tools/${tool.code}/alarm-definitions`);
    expect(
      list.body.items.map((d: { alarmId: string; text: string; effectiveRule: string }) => [d.alarmId, d.text, d.effectiveRule]),
    ).toEqual([
      ['10', 'Door open', 'record'],
      ['12', 'Pump, fore line', 'notify'],
    ]);
  });
});
