import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';
import { TestClient } from '../support/client';
import { Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';
import { createTool, drainOutbox, fileReport, openState } from './tickets-fixtures';

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
    const ok = await act(tech, t.id, { action: 'fix', fixKind: 'failure', workDone: 'Replaced the lift pin', wafersRecovered: 0, wafersReturned: 0 });
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
