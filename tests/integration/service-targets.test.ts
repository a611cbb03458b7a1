import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import { ServiceTarget, Ticket } from '../../server/modules/tickets/ticket.model';
import { createMigrator } from '../../server/db';
import { PRIORITIES, SERVICE_TARGET_DEFAULTS } from '../../shared/priority';
import { createTool, fileReport, drainOutbox } from './tickets-fixtures';

let server: TestServer;
let saved: ServiceTarget[] = [];

beforeAll(async () => {
  server = await startTestServer();
  saved = await ServiceTarget.findAll();
});
afterAll(async () => {
  // The test database outlives this run: put the targets back as they were.
  for (const row of saved)
    await ServiceTarget.update(
      { acknowledgeMinutes: row.acknowledgeMinutes, restoreMinutes: row.restoreMinutes },
      { where: { priority: row.priority } },
    );
  await drainOutbox(server);
  await server.close();
});

const backdate = (id: number, minutes: number) =>
  Ticket.update({ createdAt: new Date(Date.now() - minutes * 60_000) }, { where: { id }, silent: true });

describe('service targets', () => {
  it('when the database is migrated, then migration 0005 has stored the default target for every priority', async () => {
    const applied = (await createMigrator(server.deps.sequelize).executed()).map((m) => m.name);
    expect(applied).toContain('0005-service-target-defaults.ts');
    const rows = await ServiceTarget.findAll();
    expect(rows.map((r) => r.priority).sort()).toEqual([...PRIORITIES]);
  });

  it('when anyone signed in reads the targets, then all four priorities come back', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const r = await client.get('/api/service-targets');
    expect(r.status).toBe(200);
    expect(r.body.map((t: any) => t.priority)).toEqual([...PRIORITIES]);
    for (const t of r.body) expect(t.acknowledgeMinutes).toBeGreaterThan(0);
  });

  it('when a manager changes P3, then the queue timers follow; a technician may not change them and nonsense is refused', async () => {
    const { client: manager } = await signedInClient(server.url, 'manager');
    const { client: tech } = await signedInClient(server.url, 'technician');
    expect((await tech.put('/api/service-targets/P3', { acknowledgeMinutes: 10, restoreMinutes: 100 })).status).toBe(403);
    expect((await manager.put('/api/service-targets/P3', { acknowledgeMinutes: 100, restoreMinutes: 10 })).status).toBe(400);
    expect((await manager.put('/api/service-targets/P9', { acknowledgeMinutes: 10, restoreMinutes: 100 })).status).toBe(400);

    const r = await manager.put('/api/service-targets/P3', { acknowledgeMinutes: 40, restoreMinutes: 600 });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ priority: 'P3', acknowledgeMinutes: 40, restoreMinutes: 600 });

    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id, { impact: 'tool_limited' });
    expect(t.priority).toBe('P3');
    const item = (await tech.get(`/api/tickets?toolId=${tool.id}`)).body.items[0];
    expect(item.targets.acknowledge.targetMinutes).toBe(40);
    expect(item.targets.restore.targetMinutes).toBe(600);
    expect(new Date(item.targets.acknowledge.dueAt).getTime() - new Date(item.createdAt).getTime()).toBe(40 * 60_000);
  });

  it('when a ticket ages past 75 % of its target, then the queue warns, and past the target it is missed; acknowledging stops that clock', async () => {
    const { client: tech } = await signedInClient(server.url, 'technician');
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const t = await fileReport(member, tool.id, { impact: 'tool_stopped' }); // P2
    const target = (await ServiceTarget.findByPk('P2'))?.acknowledgeMinutes ?? SERVICE_TARGET_DEFAULTS.P2.acknowledgeMinutes;
    const read = async () => (await tech.get(`/api/tickets?toolId=${tool.id}`)).body.items[0].targets;

    expect((await read()).acknowledge.status).toBe('ok');
    await backdate(t.id, target * 0.8);
    expect((await read()).acknowledge.status).toBe('warning');
    await backdate(t.id, target + 5);
    expect((await read()).acknowledge.status).toBe('missed');

    const version = (await tech.get(`/api/tickets/${t.id}`)).body.version;
    await tech.post(`/api/tickets/${t.id}/actions`, { action: 'acknowledge', version });
    const after = await read();
    expect(after.acknowledge.doneAt).not.toBeNull();
    expect(after.acknowledge.status).toBe('missed'); // acknowledged late stays late
  });
});
