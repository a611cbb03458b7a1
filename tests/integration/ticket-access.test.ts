import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { io, type Socket } from 'socket.io-client';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient, unique } from '../support/factories';
import type { TestClient } from '../support/client';
import { Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';
import { createTool, fileReport, drainOutbox } from './tickets-fixtures';

// Object- and field-level access (ASVS 5.0 §8.2): members report and talk, staff triage;
// internal notes never reach a member, neither in API answers nor over the socket.

let server: TestServer;
const sockets: Socket[] = [];

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  for (const s of sockets) s.disconnect();
  await drainOutbox(server);
  await server.close();
});

interface Heard {
  event: string;
  args: unknown[];
}

async function listen(client: TestClient) {
  const heard: Heard[] = [];
  const socket = io(server.url, {
    path: '/socket.io',
    transports: ['websocket'],
    extraHeaders: { cookie: client.cookie! },
    forceNew: true,
    reconnection: false,
  });
  sockets.push(socket);
  socket.onAny((event: string, ...args: unknown[]) => heard.push({ event, args }));
  await new Promise<void>((resolve, reject) => {
    socket.once('connect', () => resolve());
    socket.once('connect_error', reject);
  });
  return { socket, heard };
}

const waitUntil = async (check: () => boolean, ms = 3000) => {
  const end = Date.now() + ms;
  while (!check()) {
    if (Date.now() > end) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, 20));
  }
};

describe('internal notes', () => {
  it('when staff write an internal note, then a member sees neither the note in the API nor any event for it on the socket, while staff do', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const { client: tech } = await signedInClient(server.url, 'technician');
    const t = await fileReport(member, tool.id);
    const secret = unique('supplier quote 4711 for the member do not share');

    const memberEar = await listen(member);
    const staffEar = await listen(tech);

    const note = await tech.post(`/api/tickets/${t.id}/comments`, { body: secret, internal: true });
    expect(note.status).toBe(201);
    await waitUntil(() => staffEar.heard.some((h) => h.event === 'ticket.updated'));

    // A public reply afterwards proves the member's socket was live all along.
    const reply = await tech.post(`/api/tickets/${t.id}/comments`, { body: 'We are on it.' });
    expect(reply.status).toBe(201);
    await waitUntil(() => memberEar.heard.some((h) => h.event === 'ticket.updated'));
    await new Promise((r) => setTimeout(r, 150));

    expect(memberEar.heard.filter((h) => h.event === 'ticket.updated')).toHaveLength(1);
    expect(staffEar.heard.filter((h) => h.event === 'ticket.updated')).toHaveLength(2);
    expect(JSON.stringify(memberEar.heard)).not.toContain(secret);
    expect(JSON.stringify(staffEar.heard)).not.toContain(secret); // sockets carry ids only

    const asMember = await member.get(`/api/tickets/${t.id}`);
    expect(asMember.status).toBe(200);
    expect(asMember.text).not.toContain(secret);
    expect(asMember.body.events.some((e: any) => e.internal)).toBe(false);
    expect(asMember.body.events.some((e: any) => e.kind === 'reply')).toBe(true);

    const asStaff = await tech.get(`/api/tickets/${t.id}`);
    expect(asStaff.body.events.find((e: any) => e.kind === 'note')).toMatchObject({ internal: true, body: secret });
  });

  it('when a member asks for an internal note, then 403 and nothing is written', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id);
    const r = await member.post(`/api/tickets/${t.id}/comments`, { body: 'psst', internal: true });
    expect(r.status).toBe(403);
    expect(await TicketEvent.count({ where: { ticketId: t.id, kind: 'note' } })).toBe(0);
  });
});

describe('what members may change', () => {
  it('when a member calls a staff action on their own ticket, then 403 and the ticket is unchanged', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member, user } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id);
    const version = (await member.get(`/api/tickets/${t.id}`)).body.version;
    for (const body of [
      { action: 'acknowledge' },
      { action: 'fix', fixKind: 'assist', workDone: 'I fixed it myself' },
      { action: 'close' },
      { action: 'set_priority', priority: 'P1', reason: 'I need it now' },
      { action: 'assign', assigneeId: user.id },
      { action: 'set_state', state: 'standby' },
      { action: 'merge', targetId: t.id },
    ]) {
      const r = await member.post(`/api/tickets/${t.id}/actions`, { ...body, version });
      expect(r.status, body.action).toBe(403);
    }
    expect(await Ticket.findByPk(t.id)).toMatchObject({ status: 'reported', priority: 'P4', assigneeId: null, version });
  });

  it('when a member slips status, priority or assignee into a report, a reply or an added report, then 400 names the field', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member, user } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id);
    const report = await member.post('/api/tickets', {
      toolId: tool.id,
      category: 'other',
      description: 'Sneaky',
      impact: 'still_usable',
      priority: 'P1',
      assigneeId: user.id,
    });
    expect(report.status).toBe(400);
    expect(Object.keys(report.body.error.fields)).toEqual(expect.arrayContaining(['priority', 'assigneeId']));
    const reply = await member.post(`/api/tickets/${t.id}/comments`, { body: 'hello', status: 'closed' });
    expect(reply.status).toBe(400);
    expect(reply.body.error.fields.status).toBeDefined();
    const added = await member.post(`/api/tickets/${t.id}/reports`, { description: 'Me too', priority: 'P1' });
    expect(added.status).toBe(400);
    const multipart = new FormData();
    multipart.append('report', JSON.stringify({ description: 'Me too', status: 'fixed' }));
    expect((await member.post(`/api/tickets/${t.id}/reports`, multipart)).status).toBe(400);
    expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(1);
    expect(await Ticket.findByPk(t.id)).toMatchObject({ status: 'reported', priority: 'P4' });
  });

  it('when nobody is signed in, then tickets, reports and photos answer 401', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id);
    for (const path of [`/api/tickets/${t.id}`, '/api/tickets', '/api/photos/1', '/api/photos/1/thumb']) {
      expect((await fetch(server.url + path)).status, path).toBe(401);
    }
  });

  it('when a member tries to edit the service targets or list assignees, then 403', async () => {
    const { client: member } = await signedInClient(server.url, 'member');
    expect((await member.put('/api/service-targets/P1', { acknowledgeMinutes: 1, restoreMinutes: 2 })).status).toBe(403);
    expect((await member.get('/api/assignees')).status).toBe(403);
  });
});
