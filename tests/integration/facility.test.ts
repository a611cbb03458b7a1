import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient, unique } from '../support/factories';
import { Area, StateInterval, Tool, ToolModule } from '../../server/modules/facility/facility.model';
import type { DomainEvent } from '../../server/lib/events';
import { intervalsOf, logProblems, makeArea, makeTool, uniqueCode } from './facility-fixtures';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const inAnHour = () => new Date(Date.now() + 3_600_000).toISOString();

describe('areas (admin)', () => {
  it('when an admin creates, renames and retires an empty area, then each answer and the table agree', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const code = uniqueCode('bay');
    const created = await client.post('/api/admin/areas', { name: unique('Litho bay'), code: code.toLowerCase(), sortOrder: 3 });
    expect(created.status).toBe(201);
    expect(created.body.code).toBe(code); // codes are stored in capitals
    const renamed = await client.patch(`/api/admin/areas/${created.body.id}`, { name: 'Renamed bay ' + code });
    expect(renamed.status).toBe(200);
    expect((await Area.findByPk(created.body.id))!.name).toBe('Renamed bay ' + code);

    const retired = await client.patch(`/api/admin/areas/${created.body.id}`, { retired: true });
    expect(retired.status).toBe(200);
    expect(retired.body.retiredAt).toEqual(expect.any(String));
    const members = await signedInClient(server.url, 'member');
    const visible = await members.client.get('/api/areas');
    expect(visible.body.items.map((a: { id: number }) => a.id)).not.toContain(created.body.id);
  });

  it('when an area still has active tools, then retiring it is refused with 409', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const { areaId } = await makeTool(server.deps.sequelize);
    const r = await client.patch(`/api/admin/areas/${areaId}`, { retired: true });
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('area_in_use');
    expect((await Area.findByPk(areaId))!.retiredAt).toBeNull();
  });

  it('when two areas would share a code, then 409 already_exists', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const area = await makeArea();
    const r = await client.post('/api/admin/areas', { name: unique('Other'), code: area.code });
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('already_exists');
  });

  it('when a technician or member calls an admin route, then 403 and nothing is created', async () => {
    for (const role of ['member', 'technician'] as const) {
      const { client } = await signedInClient(server.url, role);
      const name = unique('Sneaky');
      const r = await client.post('/api/admin/areas', { name, code: uniqueCode('S') });
      expect(r.status).toBe(403);
      expect(await Area.count({ where: { name } })).toBe(0);
    }
  });
});

describe('tools and modules (admin)', () => {
  it('when an admin creates a tool with modules and engineers, then each starts with one open standby interval', async () => {
    const { client, user } = await signedInClient(server.url, 'admin');
    const area = await makeArea();
    const primary = await createUser('technician');
    const backup = await createUser('manager');
    const code = uniqueCode('etch');
    const events: DomainEvent[] = [];
    const stop = server.deps.events.subscribe((e) => events.push(e));
    const r = await client.post('/api/admin/tools', {
      name: 'ICP etcher ' + code,
      code,
      areaId: area.id,
      description: 'Chlorine and fluorine chemistries',
      criticality: 'high',
      primaryEngineerId: primary.id,
      backupEngineerId: backup.id,
      modules: [
        { name: 'Process chamber 1', code: 'PM1' },
        { name: 'Load lock', code: 'LL' },
      ],
    });
    stop();
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({
      code,
      areaId: area.id,
      criticality: 'high',
      primaryEngineerId: primary.id,
      backupEngineerId: backup.id,
      version: expect.any(Number),
    });
    expect(r.body.modules.map((m: { code: string }) => m.code)).toEqual(['PM1', 'LL']);

    const own = await intervalsOf(r.body.id);
    expect(own).toHaveLength(1);
    expect(own[0]).toMatchObject({ state: 'standby', endedAt: null, setById: user.id, source: 'system' });
    for (const m of r.body.modules) expect(await intervalsOf(r.body.id, m.id)).toHaveLength(1);
    expect(events.some((e) => e.type === 'facility.updated')).toBe(true);
  });

  it('when the engineer is a member, or the same person twice, then 400 with the field named', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const area = await makeArea();
    const member = await createUser('member');
    const tech = await createUser('technician');
    const notStaff = await client.post('/api/admin/tools', {
      name: 'X',
      code: uniqueCode('x'),
      areaId: area.id,
      primaryEngineerId: member.id,
    });
    expect(notStaff.status).toBe(400);
    expect(notStaff.body.error.fields.primaryEngineerId).toBeDefined();
    const same = await client.post('/api/admin/tools', {
      name: 'X',
      code: uniqueCode('x'),
      areaId: area.id,
      primaryEngineerId: tech.id,
      backupEngineerId: tech.id,
    });
    expect(same.status).toBe(400);
    expect(same.body.error.fields.backupEngineerId).toBeDefined();
  });

  it('when a code has spaces or an unknown field is sent, then 400', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const area = await makeArea();
    const bad = await client.post('/api/admin/tools', { name: 'X', code: 'HAS SPACE', areaId: area.id });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.code).toBeDefined();
    const extra = await client.post('/api/admin/tools', { name: 'X', code: uniqueCode('x'), areaId: area.id, colour: 'red' });
    expect(extra.status).toBe(400);
    expect(extra.body.error.fields.colour).toBeDefined();
  });

  it('when two admins edit the same tool from the same version, then the second gets 409 stale_version and the first edit stays', async () => {
    const a = await signedInClient(server.url, 'admin');
    const b = await signedInClient(server.url, 'admin');
    const { tool } = await makeTool(server.deps.sequelize);
    const first = await a.client.patch(`/api/admin/tools/${tool.id}`, { version: tool.version, name: 'First edit' });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(tool.version + 1);
    const second = await b.client.patch(`/api/admin/tools/${tool.id}`, { version: tool.version, name: 'Second edit' });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('stale_version');
    expect((await Tool.findByPk(tool.id))!.name).toBe('First edit');
  });

  it('when a tool is retired, then it goes Offline, leaves the board, keeps its history and refuses further state changes', async () => {
    const admin = await signedInClient(server.url, 'admin');
    const tech = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    await tech.client.post(`/api/tools/${tool.id}/state`, { state: 'unscheduled_downtime', note: 'Chiller leak' });
    const r = await admin.client.patch(`/api/admin/tools/${tool.id}`, { version: tool.version, retired: true });
    expect(r.status).toBe(200);
    expect(r.body.retiredAt).toEqual(expect.any(String));

    const log = await intervalsOf(tool.id);
    expect(log.map((i) => i.state)).toEqual(['standby', 'unscheduled_downtime', 'non_scheduled']);
    expect(logProblems(log)).toEqual([]);

    const board = await tech.client.get('/api/board');
    const ids = board.body.areas.flatMap((a: { tools: { id: number }[] }) => a.tools.map((t) => t.id));
    expect(ids).not.toContain(tool.id);
    // The tool page and its history still answer.
    const page = await tech.client.get(`/api/tools/by-code/${tool.code}`);
    expect(page.status).toBe(200);
    expect(page.body.retiredAt).toEqual(expect.any(String));
    expect((await tech.client.get(`/api/tools/${tool.id}/history`)).body.total).toBe(3);

    const refused = await tech.client.post(`/api/tools/${tool.id}/state`, { state: 'standby' });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('tool_retired');
  });

  it('when an admin adds and retires a module, then the module gets its own log and a retired module no longer counts on the board', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const { tool, modules } = await makeTool(server.deps.sequelize, { modules: ['A'] });
    const added = await client.post(`/api/admin/tools/${tool.id}/modules`, { name: 'Chamber B', code: 'b' });
    expect(added.status).toBe(201);
    expect(added.body.code).toBe('B');
    expect(await intervalsOf(tool.id, added.body.id)).toHaveLength(1);

    const tech = await signedInClient(server.url, 'technician');
    await tech.client.post(`/api/tools/${tool.id}/state`, { moduleId: modules[0].id, state: 'unscheduled_downtime', note: 'Arcing' });
    const limited = await tech.client.get(`/api/tools/by-code/${tool.code}`);
    expect(limited.body.status).toBe('limited');

    const retired = await client.patch(`/api/admin/modules/${modules[0].id}`, { retired: true });
    expect(retired.status).toBe(200);
    expect((await ToolModule.findByPk(modules[0].id))!.retiredAt).not.toBeNull();
    const after = await tech.client.get(`/api/tools/by-code/${tool.code}`);
    expect(after.body.status).toBe('running');
    expect(after.body.modules.map((m: { code: string }) => m.code)).toEqual(['B']);
  });
});

describe('changing state', () => {
  it('when a technician sets Down with a reason, a note and a return time, then who, when and from → to are recorded', async () => {
    const { client, user } = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    const back = inAnHour();
    const before = Date.now();
    const r = await client.post(`/api/tools/${tool.id}/state`, {
      state: 'unscheduled_downtime',
      reason: 'waiting_parts',
      note: 'Turbo pump controller failed',
      expectedReturnAt: back,
    });
    expect(r.status).toBe(201);
    expect(r.body.interval).toMatchObject({
      state: 'unscheduled_downtime',
      previousState: 'standby',
      reason: 'waiting_parts',
      note: 'Turbo pump controller failed',
      expectedReturnAt: back,
    });
    expect(r.body.tool).toMatchObject({ id: tool.id, status: 'down', note: 'Turbo pump controller failed' });

    const open = await StateInterval.findOne({ where: { toolId: tool.id, moduleId: null, endedAt: null } });
    expect(open).toMatchObject({ state: 'unscheduled_downtime', setById: user.id, source: 'staff', confirmed: true });
    expect(open!.startedAt.getTime()).toBeGreaterThanOrEqual(before - 5);

    const history = await client.get(`/api/tools/${tool.id}/history`);
    expect(history.body.items[0]).toMatchObject({
      state: 'unscheduled_downtime',
      previousState: 'standby',
      setBy: { id: user.id, name: user.name },
    });
  });

  it('when a member tries to change state, then 403 and the log is untouched', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const { tool } = await makeTool(server.deps.sequelize);
    const r = await client.post(`/api/tools/${tool.id}/state`, { state: 'unscheduled_downtime', note: 'I think it is broken' });
    expect(r.status).toBe(403);
    expect(await intervalsOf(tool.id)).toHaveLength(1);
  });

  it('when the state is not one of the six, then 400 on the state field', async () => {
    const { client } = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    const r = await client.post(`/api/tools/${tool.id}/state`, { state: 'broken', note: 'x' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.state).toBeDefined();
    expect(await intervalsOf(tool.id)).toHaveLength(1);
  });

  it('when the expected return time is in the past, then 400 on that field', async () => {
    const { client } = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    const r = await client.post(`/api/tools/${tool.id}/state`, {
      state: 'scheduled_downtime',
      note: 'PM',
      expectedReturnAt: new Date(Date.now() - 3_600_000).toISOString(),
    });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.expectedReturnAt).toEqual(['The expected return time is in the past.']);
    expect(await intervalsOf(tool.id)).toHaveLength(1);
  });

  it('when the reason does not fit the state, or a down state has no note, then 400', async () => {
    const { client } = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    const wrongReason = await client.post(`/api/tools/${tool.id}/state`, { state: 'productive', reason: 'repair' });
    expect(wrongReason.status).toBe(400);
    expect(wrongReason.body.error.fields.reason).toBeDefined();
    const noNote = await client.post(`/api/tools/${tool.id}/state`, { state: 'unscheduled_downtime' });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.fields.note).toBeDefined();
  });

  it('when a module of another tool is named, then 400; an unknown tool is 404', async () => {
    const { client } = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    const other = await makeTool(server.deps.sequelize, { modules: ['X'] });
    const r = await client.post(`/api/tools/${tool.id}/state`, { moduleId: other.modules[0].id, state: 'standby' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.moduleId).toBeDefined();
    expect((await client.post('/api/tools/999999999/state', { state: 'standby' })).status).toBe(404);
  });

  it('when a running tool is given a restriction, then it reads Limited with the restriction as its reason', async () => {
    const { client } = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    const r = await client.post(`/api/tools/${tool.id}/state`, { state: 'productive', restriction: '100 mm wafers only' });
    expect(r.status).toBe(201);
    expect(r.body.tool).toMatchObject({ status: 'limited', restriction: '100 mm wafers only', note: 'Restricted: 100 mm wafers only' });
    const refused = await client.post(`/api/tools/${tool.id}/state`, { state: 'unscheduled_downtime', note: 'x', restriction: 'y' });
    expect(refused.status).toBe(400);
  });
});
