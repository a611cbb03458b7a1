import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { DAY_MS, HOUR_MS } from '../support/time';
import { createUser } from '../support/factories';
import { StateInterval } from '../../server/modules/facility/facility.model';
import { Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';
import { seedTickets } from '../../server/db/seed/tickets';
import { createTool } from './tickets-fixtures';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const NOW = new Date('2025-06-01T12:00:00Z');
const at = (days: number) => new Date(NOW.getTime() - days * DAY_MS);

/** A tool with 120 days of invented history: two repaired failures, a Down now, a module down now. */
async function toolWithHistory(engineerId: number) {
  const { tool, modules } = await createTool(server.deps.sequelize, {
    name: 'ICP etcher (seed test)',
    primaryEngineerId: engineerId,
    modules: ['PM1'],
  });
  await StateInterval.destroy({ where: { toolId: tool.id } });
  const iv = (state: string, reason: string, from: Date, to: Date | null, moduleId: number | null = null) => ({
    toolId: tool.id,
    moduleId,
    state,
    reason,
    note: null,
    startedAt: from,
    endedAt: to,
    expectedReturnAt: null,
    ticketId: null,
    setById: null,
    source: 'staff',
    confirmed: true,
  });
  const rows = [
    iv('standby', 'none', at(120), at(100)),
    iv('unscheduled_downtime', 'repair', at(100), new Date(at(100).getTime() + 6 * HOUR_MS)),
    iv('unscheduled_downtime', 'waiting_parts', new Date(at(100).getTime() + 6 * HOUR_MS), at(98)),
    iv('unscheduled_downtime', 'repair', at(98), new Date(at(98).getTime() + 3 * HOUR_MS)),
    iv('productive', 'none', new Date(at(98).getTime() + 3 * HOUR_MS), at(40)),
    iv('unscheduled_downtime', 'repair', at(40), new Date(at(40).getTime() + 4 * HOUR_MS)),
    iv('standby', 'none', new Date(at(40).getTime() + 4 * HOUR_MS), new Date(NOW.getTime() - 2 * HOUR_MS)),
    iv('unscheduled_downtime', 'repair', new Date(NOW.getTime() - 2 * HOUR_MS), null),
    iv('standby', 'none', at(120), at(3), modules[0].id),
    iv('unscheduled_downtime', 'repair', at(3), null, modules[0].id),
  ];
  await StateInterval.bulkCreate(rows as never[]);
  return { tool, modules };
}

describe('demo tickets', () => {
  it('when the demo history is seeded, then every stretch of tool downtime has one failure ticket reported at its start and fixed at its end, with assists and open tickets that match the board', async () => {
    const engineer = await createUser('technician');
    const members = [await createUser('member'), await createUser('member')];
    const { tool, modules } = await toolWithHistory(engineer.id);

    const result = await server.deps.sequelize.transaction((t) =>
      seedTickets(t, { staff: [engineer], members }, NOW, { toolIds: [tool.id], seed: 42 }),
    );
    expect(result.tickets).toBeGreaterThanOrEqual(4);

    const tickets = await Ticket.findAll({ where: { toolId: tool.id }, order: [['id', 'ASC']] });
    const failures = tickets.filter((t) => t.fixKind === 'failure');
    expect(failures.map((t) => t.createdAt.toISOString())).toEqual([at(100).toISOString(), at(40).toISOString()]);
    expect(failures.map((t) => t.fixedAt!.toISOString())).toEqual([
      new Date(at(98).getTime() + 3 * HOUR_MS).toISOString(),
      new Date(at(40).getTime() + 4 * HOUR_MS).toISOString(),
    ]);
    for (const f of failures) {
      expect(f.status).toBe('closed');
      expect(f.failureMode).toBeTruthy();
      expect(f.acknowledgedAt!.getTime() - f.createdAt.getTime()).toBeLessThan(60 * 60_000);
      expect(f.assigneeId).toBe(engineer.id);
    }
    // Ticket numbers follow the order of reporting.
    expect(tickets.map((t) => t.createdAt.getTime())).toEqual([...tickets.map((t) => t.createdAt.getTime())].sort((a, b) => a - b));

    // The three intervals of the first failure (repair, waiting for parts, repair) belong to one ticket.
    const linked = await StateInterval.findAll({
      where: { toolId: tool.id, moduleId: null, state: 'unscheduled_downtime' },
      order: [['startedAt', 'ASC']],
    });
    expect(linked.map((i) => i.ticketId)).toEqual([failures[0].id, failures[0].id, failures[0].id, failures[1].id, expect.any(Number)]);
    const waitSteps = (
      await TicketEvent.findAll({
        where: { ticketId: failures[0].id, kind: 'status' },
        order: [
          ['createdAt', 'ASC'],
          ['id', 'ASC'],
        ],
      })
    ).map((e) => `${(e.data as any).from}>${(e.data as any).to}`);
    expect(waitSteps).toEqual([
      'reported>acknowledged',
      'acknowledged>in_repair',
      'in_repair>waiting',
      'waiting>in_repair',
      'in_repair>fixed',
      'fixed>closed',
    ]);

    const openDown = tickets.find((t) => t.id === linked[4].ticketId)!;
    expect(openDown).toMatchObject({ impact: 'tool_stopped', fixedAt: null });
    expect(['acknowledged', 'in_repair']).toContain(openDown.status);
    const moduleTicket = tickets.find((t) => t.moduleId === modules[0].id)!;
    expect(moduleTicket).toMatchObject({ impact: 'tool_limited', status: 'acknowledged' });
    expect((await StateInterval.findOne({ where: { toolId: tool.id, moduleId: modules[0].id, endedAt: null } }))!.ticketId).toBe(
      moduleTicket.id,
    );

    const assists = tickets.filter((t) => t.fixKind === 'assist');
    for (const a of assists) {
      expect(a.fixedAt!.getTime() - a.createdAt.getTime()).toBeLessThan(HOUR_MS);
      expect(await StateInterval.count({ where: { ticketId: a.id } })).toBe(0);
    }
  });

  it('when the same history is seeded twice with the same seed, then the tickets come out the same', async () => {
    const engineer = await createUser('technician');
    const members = [await createUser('member')];
    const one = await toolWithHistory(engineer.id);
    const two = await toolWithHistory(engineer.id);
    const shape = async (toolId: number) =>
      (await Ticket.findAll({ where: { toolId }, order: [['id', 'ASC']] })).map((t) => [
        t.title.replace(/\(seed test\)/, ''),
        t.status,
        t.createdAt.toISOString(),
        t.failureMode,
        t.priority,
      ]);
    await server.deps.sequelize.transaction((t) =>
      seedTickets(t, { staff: [engineer], members }, NOW, { toolIds: [one.tool.id], seed: 7 }),
    );
    await server.deps.sequelize.transaction((t) =>
      seedTickets(t, { staff: [engineer], members }, NOW, { toolIds: [two.tool.id], seed: 7 }),
    );
    expect(await shape(two.tool.id)).toEqual(await shape(one.tool.id));
  });
});
