import type { BoardToolChange } from '../../shared/events';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { io as connect, type Socket } from 'socket.io-client';
import { startTestServer, type TestServer } from '../support/server';
import { DAY_MS, HOUR_MS } from '../support/time';
import { createUser, signedInClient } from '../support/factories';
import { changeState } from '../../server/modules/facility/state.service';
import { availabilityForPeriod, stateTimeInPeriod } from '../../server/modules/facility/availability.service';
import { Ticket, UNWORKED_TICKET_FIELDS } from '../../server/modules/tickets/ticket.model';
import type { BoardData, BoardTool } from '../../shared/schemas/facility';
import { makeArea, makeTool } from './facility-fixtures';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

function findTool(board: BoardData, id: number): BoardTool | undefined {
  return board.areas.flatMap((a) => a.tools).find((t) => t.id === id);
}

async function addTicket(toolId: number, status: Ticket['status']) {
  return Ticket.create({
    toolId,
    moduleId: null,
    category: 'other',
    title: `Ticket ${status}`,
    description: null,
    alarmText: null,
    impact: 'still_usable',
    hazards: [],
    wafersOwner: null,
    wafersRecoverable: null,
    status,
    priority: 'P3',
    reporterId: null,
    assigneeId: null,
    ...UNWORKED_TICKET_FIELDS,
  });
}

describe('the status board', () => {
  it('when tools are in various states, then the board groups them by area with rolled-up status, reason, since, return time and open tickets', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const area = await makeArea();
    const down = await makeTool(server.deps.sequelize, { areaId: area.id, name: 'Board test down' });
    const limited = await makeTool(server.deps.sequelize, { areaId: area.id, name: 'Board test limited', modules: ['A', 'B'] });
    const back = new Date(Date.now() + 5 * HOUR_MS);
    const d = await changeState(server.deps, {
      toolId: down.tool.id,
      state: 'unscheduled_downtime',
      reason: 'repair',
      note: 'Heater zone 3 open',
      expectedReturnAt: back,
      actorId: null,
    });
    const m = await changeState(server.deps, {
      toolId: limited.tool.id,
      moduleId: limited.modules[1].id,
      state: 'scheduled_downtime',
      note: 'Shield swap',
      actorId: null,
    });
    for (const status of ['reported', 'acknowledged', 'in_repair', 'waiting', 'fixed', 'closed', 'no_fault_found'] as const)
      await addTicket(down.tool.id, status);

    const r = await client.get('/api/board');
    expect(r.status).toBe(200);
    const board = r.body as BoardData;
    const section = board.areas.find((a) => a.id === area.id)!;
    expect(section.name).toBe(area.name);
    expect(section.tools.map((t) => t.name)).toEqual(['Board test down', 'Board test limited']);

    expect(findTool(board, down.tool.id)).toMatchObject({
      status: 'down',
      state: 'unscheduled_downtime',
      reason: 'repair',
      note: 'Heater zone 3 open',
      since: d.current.startedAt.toISOString(),
      expectedReturnAt: back.toISOString(),
      openTickets: 4, // reported, acknowledged, in repair, waiting
    });
    expect(findTool(board, limited.tool.id)).toMatchObject({
      status: 'limited',
      note: 'Chamber B in maintenance: Shield swap',
      since: m.current.startedAt.toISOString(),
      openTickets: 0,
    });
    expect(findTool(board, limited.tool.id)!.modules.map((x) => [x.code, x.status])).toEqual([
      ['A', 'running'],
      ['B', 'maintenance'],
    ]);
    expect(board.total).toBe(Object.values(board.counts).reduce((a, b) => a + b, 0));
  });

  it('when every module of a running tool is down, then the board shows the tool Down', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const { tool, modules } = await makeTool(server.deps.sequelize, { modules: ['A', 'B'] });
    for (const mod of modules)
      await changeState(server.deps, {
        toolId: tool.id,
        moduleId: mod.id,
        state: 'unscheduled_downtime',
        note: 'Power loss',
        actorId: null,
      });
    const board = (await client.get('/api/board')).body as BoardData;
    expect(findTool(board, tool.id)!.status).toBe('down');
  });

  it('when searching by code or name and filtering by area and status, then only the matching tools come back and the counts still cover the whole board', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const area = await makeArea();
    const a = await makeTool(server.deps.sequelize, { areaId: area.id, name: 'Filter test furnace' });
    const b = await makeTool(server.deps.sequelize, { areaId: area.id, name: 'Filter test sputter' });
    await changeState(server.deps, { toolId: b.tool.id, state: 'unscheduled_downtime', note: 'Target', actorId: null });

    const all = (await client.get('/api/board')).body as BoardData;
    const byCode = (await client.get(`/api/board?q=${a.tool.code.toLowerCase()}`)).body as BoardData;
    expect(byCode.areas.flatMap((x) => x.tools).map((t) => t.id)).toEqual([a.tool.id]);
    expect(byCode.counts).toEqual(all.counts);

    const byName = (await client.get(`/api/board?q=${encodeURIComponent('filter test sp')}&areaId=${area.id}`)).body as BoardData;
    expect(byName.areas.flatMap((x) => x.tools).map((t) => t.id)).toEqual([b.tool.id]);

    const downHere = (await client.get(`/api/board?areaId=${area.id}&status=down`)).body as BoardData;
    expect(downHere.areas.flatMap((x) => x.tools).map((t) => t.id)).toEqual([b.tool.id]);
    expect((await client.get('/api/board?status=broken')).status).toBe(400);
  });

  it('when nobody is signed in and no display key is sent, then the board answers 401', async () => {
    const r = await fetch(`${server.url}/api/board`);
    expect(r.status).toBe(401);
  });

  it('when a state changes, then a signed-in socket receives the tool’s new board entry', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const { tool } = await makeTool(server.deps.sequelize);
    const socket: Socket = connect(server.url, {
      path: '/socket.io',
      transports: ['websocket'],
      extraHeaders: { cookie: client.cookie! },
      forceNew: true,
    });
    try {
      await new Promise<void>((resolve, reject) => {
        socket.once('connect', () => resolve());
        socket.once('connect_error', reject);
      });
      const heard = new Promise<BoardToolChange>((resolve) =>
        socket.on('board.tool_changed', (p: BoardToolChange) => p.tool.id === tool.id && resolve(p)),
      );
      await changeState(server.deps, { toolId: tool.id, state: 'engineering', note: 'Recipe work', actorId: null });
      // How fast it arrives is measured by `npm run bench -- state-events`, not here.
      const payload = await heard;
      expect(payload.tool).toMatchObject({ id: tool.id, state: 'engineering', status: 'engineering', note: 'Recipe work' });
    } finally {
      socket.disconnect();
    }
  });
});

describe('the tool page', () => {
  it('when a tool has engineers, modules and history, then its page shows state, people, modules, following and the 30-day availability', async () => {
    const { client, user } = await signedInClient(server.url, 'member');
    const primary = await createUser('technician', { name: 'Primary Person' });
    const backup = await createUser('technician', { name: 'Backup Person' });
    const created = new Date(Date.now() - 20 * DAY_MS);
    const { tool } = await makeTool(server.deps.sequelize, {
      modules: ['PM1'],
      since: created,
      primaryEngineerId: primary.id,
      backupEngineerId: backup.id,
    });
    // 20 days: 3 days down in all (1 unscheduled, 0.5 scheduled, 1.5 non-scheduled).
    await changeState(server.deps, {
      toolId: tool.id,
      state: 'unscheduled_downtime',
      note: 'x',
      actorId: null,
      at: new Date(created.getTime() + 2 * DAY_MS),
    });
    await changeState(server.deps, { toolId: tool.id, state: 'productive', actorId: null, at: new Date(created.getTime() + 3 * DAY_MS) });
    await changeState(server.deps, {
      toolId: tool.id,
      state: 'scheduled_downtime',
      note: 'PM',
      actorId: null,
      at: new Date(created.getTime() + 7 * DAY_MS),
    });
    await changeState(server.deps, {
      toolId: tool.id,
      state: 'non_scheduled',
      note: 'Holiday',
      actorId: null,
      at: new Date(created.getTime() + 7.5 * DAY_MS),
    });
    await changeState(server.deps, { toolId: tool.id, state: 'standby', actorId: user.id, at: new Date(created.getTime() + 9 * DAY_MS) });

    const r = await client.get(`/api/tools/by-code/${tool.code}`);
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({
      id: tool.id,
      code: tool.code,
      status: 'running',
      primaryEngineer: { id: primary.id, name: 'Primary Person' },
      backupEngineer: { id: backup.id, name: 'Backup Person' },
      following: false,
      setBy: { id: user.id },
    });
    expect(r.body.modules).toHaveLength(1);
    expect(r.body.availability30d.availability).toBeCloseTo(17 / 20, 4);
    expect(r.body.availability30d.downMs).toBe(3 * DAY_MS);

    expect((await client.get('/api/tools/by-code/NO-SUCH-TOOL')).status).toBe(404);
    expect((await client.get('/api/tools/by-code/has%20space')).status).toBe(400);
  });

  it('when the history is paged, then newest first, with from → to, pages that do not overlap, and a total', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const { tool, modules } = await makeTool(server.deps.sequelize, { modules: ['A'], since: new Date(Date.now() - 10 * HOUR_MS) });
    const states = ['productive', 'standby', 'engineering', 'productive', 'standby'] as const;
    for (const [i, state] of states.entries()) {
      await changeState(server.deps, {
        toolId: tool.id,
        state,
        note: state === 'engineering' ? 'Qual' : null,
        actorId: null,
        at: new Date(Date.now() - (9 - i) * HOUR_MS),
      });
    }
    await changeState(server.deps, {
      toolId: tool.id,
      moduleId: modules[0].id,
      state: 'unscheduled_downtime',
      note: 'Arc',
      actorId: null,
      at: new Date(Date.now() - 30 * 60_000),
    });

    const first = await client.get(`/api/tools/${tool.id}/history?limit=3`);
    const second = await client.get(`/api/tools/${tool.id}/history?limit=3&offset=3`);
    const third = await client.get(`/api/tools/${tool.id}/history?limit=3&offset=6`);
    expect(first.body.total).toBe(8); // 6 tool intervals + 2 module intervals
    expect(first.body.items.map((i: { state: string }) => i.state)).toEqual(['unscheduled_downtime', 'standby', 'productive']);
    expect(first.body.items[0]).toMatchObject({ moduleName: 'Chamber A', previousState: 'standby' });
    expect(first.body.items[1]).toMatchObject({ moduleId: null, previousState: 'productive' });
    const ids = [...first.body.items, ...second.body.items, ...third.body.items].map((i: { id: number }) => i.id);
    expect(new Set(ids).size).toBe(8);

    const toolOnly = await client.get(`/api/tools/${tool.id}/history?moduleId=tool&limit=100`);
    expect(toolOnly.body.total).toBe(6);
    expect(toolOnly.body.items.at(-1)).toMatchObject({ previousState: null, state: 'standby' });
    expect((await client.get(`/api/tools/${tool.id}/history?limit=1000`)).status).toBe(400);
  });
});

describe('availability over a period (computed in SQL by clipping intervals)', () => {
  it('when intervals straddle the period edges, then only their parts inside count', async () => {
    const base = new Date(Date.now() - 40 * DAY_MS);
    const { tool } = await makeTool(server.deps.sequelize, { since: base });
    const at = (days: number) => new Date(base.getTime() + days * DAY_MS);
    // Days 0–2 standby, 2–3 unscheduled, 3–7 productive, 7–7.5 scheduled, 7.5–9 non-scheduled, 9– standby.
    await changeState(server.deps, { toolId: tool.id, state: 'unscheduled_downtime', note: 'x', actorId: null, at: at(2) });
    await changeState(server.deps, { toolId: tool.id, state: 'productive', actorId: null, at: at(3) });
    await changeState(server.deps, { toolId: tool.id, state: 'scheduled_downtime', note: 'PM', actorId: null, at: at(7) });
    await changeState(server.deps, { toolId: tool.id, state: 'non_scheduled', note: 'Closed', actorId: null, at: at(7.5) });
    await changeState(server.deps, { toolId: tool.id, state: 'standby', actorId: null, at: at(9) });

    // Period days 1–8: standby 1, unscheduled 1, productive 4, scheduled 0.5, non-scheduled 0.5.
    const times = await stateTimeInPeriod(server.deps.sequelize, { from: at(1), to: at(8), toolIds: [tool.id] });
    expect(times.get(tool.id)).toEqual({
      productive: 4 * DAY_MS,
      standby: 1 * DAY_MS,
      engineering: 0,
      scheduled_downtime: 0.5 * DAY_MS,
      unscheduled_downtime: 1 * DAY_MS,
      non_scheduled: 0.5 * DAY_MS,
    });

    const figure = (await availabilityForPeriod(server.deps.sequelize, { from: at(1), to: at(8), toolIds: [tool.id] })).get(tool.id)!;
    expect(figure.coveredMs).toBe(7 * DAY_MS);
    expect(figure.downMs).toBe(2 * DAY_MS);
    expect(figure.availability).toBeCloseTo(5 / 7, 10);

    // Before the tool existed there is nothing to measure.
    const before = (
      await availabilityForPeriod(server.deps.sequelize, { from: new Date(base.getTime() - 5 * DAY_MS), to: base, toolIds: [tool.id] })
    ).get(tool.id)!;
    expect(before).toMatchObject({ coveredMs: 0, availability: null });
  });
});
