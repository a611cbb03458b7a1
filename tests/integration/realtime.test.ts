import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient, unique } from '../support/factories';
import { connected, dropConnection, openTestSocket, recoveryOf, waitUntil, type TestSocket } from '../support/sockets';
import { makeTool } from './facility-fixtures';
import { createTool, fileReport, drainOutbox } from './tickets-fixtures';
import { changeState } from '../../server/modules/facility/state.service';
import { createDisplayLink } from '../../server/modules/facility/display-links.service';
import { User } from '../../server/modules/users/user.model';
import { SessionRow } from '../../server/modules/auth/session.model';
import type { BoardToolChange } from '../../shared/events';

// Sockets (security.md "Access control"): board changes travel with their board entry to
// everyone; ticket changes reach a member only while that ticket's page is open; staff-only
// changes never reach a member; a recovered socket is checked like a new one.

let server: TestServer;
const sockets: TestSocket[] = [];

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  for (const s of sockets) s.disconnect();
  await drainOutbox(server);
  await server.close();
});

function open(opts: Parameters<typeof openTestSocket>[1]) {
  const ear = openTestSocket(server.url, opts);
  sockets.push(ear.socket);
  return ear;
}

const changesOf = (packets: { event: string; args: unknown[] }[], toolId: number) =>
  packets
    .filter((p) => p.event === 'board.tool_changed')
    .map((p) => p.args[0] as BoardToolChange)
    .filter((c) => c.tool.id === toolId);

describe('board changes', () => {
  it('when a state changes, then signed-in and display sockets receive the tool’s new board entry and counts, equal to what the board answers', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const { user: admin } = await signedInClient(server.url, 'admin');
    const { key } = await createDisplayLink(server.deps, unique('Lobby'), admin.id);
    const { tool } = await makeTool(server.deps.sequelize);
    const member = open({ cookie: client.cookie! });
    const display = open({ displayKey: key });
    await Promise.all([connected(member.socket), connected(display.socket)]);

    await changeState(server.deps, { toolId: tool.id, state: 'engineering', note: 'Recipe work', actorId: admin.id });
    await waitUntil(
      () => changesOf(member.packets, tool.id).length > 0 && changesOf(display.packets, tool.id).length > 0,
      3000,
      'board.tool_changed',
    );

    const board = await client.get('/api/board');
    const entry = board.body.areas.flatMap((a: any) => a.tools).find((t: any) => t.id === tool.id);
    for (const ear of [member, display]) {
      const [change] = changesOf(ear.packets, tool.id);
      expect(change.tool).toEqual(entry);
      expect(change.tool.state).toBe('engineering');
      expect(change.counts).toEqual(board.body.counts);
      expect(change.total).toBe(board.body.total);
      expect(change.stateSetBy).toEqual({ id: admin.id, name: admin.name });
    }
  });

  it('when a member files a report, then everyone gets the tool’s new open-ticket count, and only staff get ticket.created', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const { client: tech } = await signedInClient(server.url, 'technician');
    const memberEar = open({ cookie: member.cookie! });
    const staffEar = open({ cookie: tech.cookie! });
    await Promise.all([connected(memberEar.socket), connected(staffEar.socket)]);

    const t = await fileReport(member, tool.id);
    await waitUntil(() => changesOf(memberEar.packets, tool.id).some((c) => c.tool.openTickets === 1), 3000, 'the new count');
    await waitUntil(
      () => staffEar.packets.some((p) => p.event === 'ticket.created' && (p.args[0] as { id: number }).id === t.id),
      3000,
      'ticket.created',
    );
    expect(memberEar.packets.some((p) => p.event === 'ticket.created')).toBe(false);
  });
});

describe('ticket rooms', () => {
  it('when a member has the ticket page open, then public replies reach them and internal notes do not; with it closed, nothing about the ticket does', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const { client: tech } = await signedInClient(server.url, 'technician');
    const t = await fileReport(member, tool.id);
    const secret = unique('supplier quote 4711 do not share');
    const watching = open({ cookie: member.cookie! });
    const elsewhere = open({ cookie: member.cookie! });
    const staffEar = open({ cookie: tech.cookie! });
    await Promise.all([connected(watching.socket), connected(elsewhere.socket), connected(staffEar.socket)]);
    const ack = await watching.socket.timeout(2000).emitWithAck('ticket.watch', t.id);
    expect(ack).toEqual({ ok: true });

    const ticketEvents = (ear: { packets: { event: string; args: unknown[] }[] }) =>
      ear.packets.filter((p) => p.event.startsWith('ticket.') && (p.args[0] as { id: number }).id === t.id);
    expect((await tech.post(`/api/tickets/${t.id}/comments`, { body: secret, internal: true })).status).toBe(201);
    await waitUntil(() => ticketEvents(staffEar).length === 1, 3000, 'the note announced to staff');
    expect((await tech.post(`/api/tickets/${t.id}/comments`, { body: 'We are on it.' })).status).toBe(201);
    await waitUntil(() => ticketEvents(watching).length === 1 && ticketEvents(staffEar).length === 2, 3000, 'the reply announced');

    // The closed page: the same member's other socket heard nothing of the ticket at all.
    watching.socket.emit('ticket.unwatch', t.id);
    await waitUntil(
      async () => (await watching.socket.timeout(2000).emitWithAck('ticket.watch', -1)).ok === false,
      3000,
      'the unwatch to be handled',
    );
    expect((await tech.post(`/api/tickets/${t.id}/comments`, { body: 'Parts ordered.' })).status).toBe(201);
    await waitUntil(() => ticketEvents(staffEar).length === 3, 3000, 'the second reply announced');
    // Events to one socket leave in order: a board change after the reply proves the reply would have arrived.
    await changeState(server.deps, { toolId: tool.id, state: 'engineering', note: 'Check', actorId: null });
    await waitUntil(
      () =>
        changesOf(watching.packets, tool.id).some((c) => c.tool.state === 'engineering') &&
        changesOf(elsewhere.packets, tool.id).length > 0,
      3000,
      'the board change',
    );

    expect(ticketEvents(watching)).toHaveLength(1);
    expect(ticketEvents(elsewhere)).toHaveLength(0);
    for (const ear of [watching, elsewhere]) expect(JSON.stringify(ear.packets)).not.toContain(secret);
    expect(JSON.stringify(staffEar.packets)).not.toContain(secret); // announcements carry ids only
  });

  it('when a display asks to watch a ticket, then it is refused', async () => {
    const { user: admin } = await signedInClient(server.url, 'admin');
    const { client: member } = await signedInClient(server.url, 'member');
    const { tool } = await createTool(server.deps.sequelize);
    const t = await fileReport(member, tool.id);
    const { key } = await createDisplayLink(server.deps, unique('Lobby'), admin.id);
    const display = open({ displayKey: key });
    await connected(display.socket);
    // A display socket has no handler for it: the acknowledgement never comes.
    await expect(display.socket.timeout(500).emitWithAck('ticket.watch', t.id)).rejects.toThrow();
  });
});

describe('connection-state recovery', () => {
  /** A staff socket that has received one event (so it has a recovery offset), then drops. */
  async function droppedStaffSocket(cookie: string) {
    const { tool } = await makeTool(server.deps.sequelize);
    const ear = open({ cookie });
    await connected(ear.socket);
    await changeState(server.deps, { toolId: tool.id, state: 'engineering', note: 'Warm-up', actorId: null });
    await waitUntil(() => changesOf(ear.packets, tool.id).length > 0, 3000, 'a first event');
    const recovery = recoveryOf(ear.socket);
    const gone = new Promise((resolve) => ear.socket.once('disconnect', resolve));
    dropConnection(ear.socket);
    await gone;
    return { recovery, tool };
  }

  async function internalNoteWhileAway(techClient: Awaited<ReturnType<typeof signedInClient>>['client']) {
    const { client: member } = await signedInClient(server.url, 'member');
    const { tool } = await createTool(server.deps.sequelize);
    const t = await fileReport(member, tool.id);
    const secret = unique('internal');
    expect((await techClient.post(`/api/tickets/${t.id}/comments`, { body: secret, internal: true })).status).toBe(201);
    return t.id;
  }

  it('when the same staff member recovers a dropped socket with their cookie, then the missed staff event arrives (recovery stays on)', async () => {
    const { client: tech } = await signedInClient(server.url, 'technician');
    const { recovery } = await droppedStaffSocket(tech.cookie!);
    const ticketId = await internalNoteWhileAway(tech);
    const back = open({ cookie: tech.cookie!, recovery });
    await connected(back.socket);
    expect(back.socket.recovered).toBe(true);
    await waitUntil(
      () => back.packets.some((p) => p.event === 'ticket.updated' && (p.args[0] as { id: number }).id === ticketId),
      3000,
      'the missed event',
    );
  });

  it('when an old recovery id is sent without a cookie, then the socket is refused and no missed event reaches it', async () => {
    const { client: tech } = await signedInClient(server.url, 'technician');
    const { recovery } = await droppedStaffSocket(tech.cookie!);
    await internalNoteWhileAway(tech);
    const thief = open({ recovery });
    await expect(connected(thief.socket)).rejects.toThrow('unauthorized');
    expect(thief.packets).toEqual([]);
  });

  it('when the user signed out, then the recovered socket with the old cookie is refused', async () => {
    const { client: tech } = await signedInClient(server.url, 'technician');
    const cookie = tech.cookie!;
    const { recovery } = await droppedStaffSocket(cookie);
    expect((await tech.delete('/api/session')).status).toBe(204);
    const back = open({ cookie, recovery });
    await expect(connected(back.socket)).rejects.toThrow('unauthorized');
    expect(back.packets).toEqual([]);
  });

  it('when an admin demotes a technician, then their recovered socket is refused and gets no staff event', async () => {
    const { client: admin } = await signedInClient(server.url, 'admin');
    const { client: tech, user } = await signedInClient(server.url, 'technician');
    const { recovery } = await droppedStaffSocket(tech.cookie!);
    expect((await admin.patch(`/api/users/${user.id}`, { role: 'member' })).status).toBe(200);
    await internalNoteWhileAway(admin);
    const back = open({ cookie: tech.cookie!, recovery });
    await expect(connected(back.socket)).rejects.toThrow('unauthorized');
    expect(back.packets).toEqual([]);
  });

  it('when the role changed while the session lives on, then the recovered socket is re-roomed: no staff events, board events still', async () => {
    const { client: tech, user } = await signedInClient(server.url, 'technician');
    const { recovery, tool } = await droppedStaffSocket(tech.cookie!);
    // Written straight to the table, as another process or a database fix would: the session stays.
    await User.update({ role: 'member' }, { where: { id: user.id } });
    const { client: other } = await signedInClient(server.url, 'technician');
    const ticketId = await internalNoteWhileAway(other);
    const back = open({ cookie: tech.cookie!, recovery });
    await connected(back.socket);
    expect(back.socket.recovered).toBe(true);
    const secondNote = await other.post(`/api/tickets/${ticketId}/comments`, { body: 'staff only', internal: true });
    expect(secondNote.status).toBe(201);
    await changeState(server.deps, { toolId: tool.id, state: 'standby', actorId: null });
    await waitUntil(() => changesOf(back.packets, tool.id).some((c) => c.tool.state === 'standby'), 3000, 'a board event');
    expect(back.packets.filter((p) => p.event.startsWith('ticket.'))).toEqual([]);
  });

  it('when the session sat idle past its idle timeout, then neither a new nor a recovered socket is let in with its cookie', async () => {
    const { client: tech, user } = await signedInClient(server.url, 'technician');
    const { recovery } = await droppedStaffSocket(tech.cookie!);
    // Backdated instead of waited for: the session was last used three hours ago.
    const row = (await SessionRow.findOne({ where: { userId: user.id } }))!;
    const data = JSON.parse(row.data!);
    await row.update({ data: JSON.stringify({ ...data, lastSeenAt: Date.now() - 3 * 3_600_000 }) });
    const fresh = open({ cookie: tech.cookie! });
    await expect(connected(fresh.socket)).rejects.toThrow('unauthorized');
    const back = open({ cookie: tech.cookie!, recovery });
    await expect(connected(back.socket)).rejects.toThrow('unauthorized');
    expect(back.packets).toEqual([]);
  });
});
