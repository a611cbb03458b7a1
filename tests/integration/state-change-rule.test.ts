import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import { createTool, drainOutbox, fileReport } from './tickets-fixtures';
import { intervalsOf } from './facility-fixtures';

// A state change is one rule wherever it is asked for: the tool page (POST /tools/:id/state)
// and a ticket's "set tool state" refuse the same bad input with the same field messages,
// and neither writes to the state log when they do.

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  await drainOutbox(server);
  await server.close();
});

const hourAgo = () => new Date(Date.now() - 3600_000).toISOString();

const BAD: { what: string; body: Record<string, unknown>; fields: string[] }[] = [
  { what: 'Down without a note', body: { state: 'unscheduled_downtime', reason: 'repair' }, fields: ['note'] },
  { what: 'Down with a blank note', body: { state: 'unscheduled_downtime', reason: 'repair', note: '   ' }, fields: ['note'] },
  {
    what: 'an expected return time in the past',
    body: { state: 'scheduled_downtime', note: 'Chamber clean', expectedReturnAt: hourAgo() },
    fields: ['expectedReturnAt'],
  },
  { what: 'a return time while running', body: { state: 'standby', expectedReturnAt: hourAgo() }, fields: ['expectedReturnAt'] },
  { what: 'a reason of another state', body: { state: 'standby', reason: 'repair' }, fields: ['reason'] },
  {
    what: 'a restriction while down',
    body: { state: 'engineering', note: 'Recipe trials', restriction: 'No wafers' },
    fields: ['restriction'],
  },
];

describe('one state-change rule', () => {
  it('when the tool page and a ticket send the same bad state change, then both answer 400 with the same field messages and log nothing', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const { client: tech } = await signedInClient(server.url, 'technician');
    const ticket = await fileReport(member, tool.id);
    const logBefore = (await intervalsOf(tool.id)).length;

    for (const bad of BAD) {
      const fromTool = await tech.post(`/api/tools/${tool.id}/state`, bad.body);
      const fromTicket = await tech.post(`/api/tickets/${ticket.id}/actions`, {
        action: 'set_state',
        version: ticket.version,
        ...bad.body,
      });
      expect(fromTool.status, bad.what).toBe(400);
      expect(fromTicket.status, bad.what).toBe(400);
      expect(Object.keys(fromTool.body.error.fields).sort(), bad.what).toEqual(bad.fields);
      expect(fromTicket.body.error.fields, bad.what).toEqual(fromTool.body.error.fields);
    }
    expect((await intervalsOf(tool.id)).length).toBe(logBefore);
  });

  it('when the same good state change comes from the tool page and from a ticket, then both log it the same way', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const { client: tech } = await signedInClient(server.url, 'technician');
    const ticket = await fileReport(member, tool.id);
    const back = new Date(Date.now() + 4 * 3600_000).toISOString();
    const body = { state: 'unscheduled_downtime', reason: 'repair', note: '  Pump trips on start  ', expectedReturnAt: back };

    expect((await tech.post(`/api/tools/${tool.id}/state`, body)).status).toBe(201);
    const fromTool = (await intervalsOf(tool.id)).at(-1)!;
    expect((await tech.post(`/api/tickets/${ticket.id}/actions`, { action: 'set_state', version: ticket.version, ...body })).status).toBe(
      200,
    );
    const fromTicket = (await intervalsOf(tool.id)).at(-1)!;

    const shape = (s: typeof fromTool) => ({
      state: s.state,
      reason: s.reason,
      note: s.note,
      expectedReturnAt: s.expectedReturnAt?.toISOString(),
      source: s.source,
      confirmed: s.confirmed,
    });
    expect(shape(fromTicket)).toEqual(shape(fromTool));
    expect(shape(fromTool)).toEqual({
      state: 'unscheduled_downtime',
      reason: 'repair',
      note: 'Pump trips on start',
      expectedReturnAt: back,
      source: 'staff',
      confirmed: true,
    });
    expect(fromTicket.ticketId).toBe(ticket.id);
  });
});
