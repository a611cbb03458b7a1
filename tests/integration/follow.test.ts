import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { drainOutbox, startTestServer, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { createUser, signedInClient } from '../support/factories';
import { changeState } from '../../server/modules/facility/state.service';
import { ToolFollow } from '../../server/modules/facility/facility.model';
import { Notice } from '../../server/modules/notices/notice.model';
import { OutboxMail } from '../../server/lib/outbox.model';
import type { DomainEvent } from '../../server/lib/events';
import { makeTool } from './facility-fixtures';

let server: TestServer;

beforeAll(async () => {
  // The outbox worker is run by hand so each test knows when mail goes out.
  server = await startTestServer({}, { outboxWorker: false });
});
afterAll(() => server.close());

describe('following a tool', () => {
  it('when a follower’s tool goes Down, then they get an e-mail (through the outbox, caught by SMTP) with the reason, a link to the tool and an unfollow link', async () => {
    const follower = await signedInClient(server.url, 'member');
    const tech = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize, { name: 'LPCVD tube follow test' });
    const f = await follower.client.put(`/api/tools/${tool.id}/follow`);
    expect(f.status).toBe(200);
    expect(f.body).toEqual({ following: true });
    const row = await ToolFollow.findOne({ where: { userId: follower.user.id, toolId: tool.id } });
    expect(row!.unfollowToken).toMatch(/^[A-Za-z0-9_-]{43}$/);

    const r = await tech.client.post(`/api/tools/${tool.id}/state`, {
      state: 'unscheduled_downtime',
      reason: 'waiting_parts',
      note: 'Boat elevator motor failed',
      expectedReturnAt: new Date(Date.now() + 86_400_000).toISOString(),
    });
    expect(r.status).toBe(201);
    // The mail was queued in the change's transaction.
    expect(await OutboxMail.count({ where: { toAddress: follower.user.email } })).toBe(1);

    await drainOutbox(server);
    const mail = await server.catcher.waitFor((m) => m.to.includes(follower.user.email));
    expect(mail.subject).toBe(`Faultline: LPCVD tube follow test (${tool.code}) is now Down`);
    expect(mail.text).toContain('from Running to Down');
    expect(mail.text).toContain('Reason: Waiting for parts.');
    expect(mail.text).toContain('Note: Boat elevator motor failed');
    expect(mail.text).toContain('Expected back:');
    expect(mail.text).toContain(`${server.config.publicUrl}/tools/${tool.code}`);
    expect(mail.text).toContain(`${server.config.publicUrl}/unfollow/${row!.unfollowToken}`);
  });

  it('when a followed tool changes, then the follower gets an in-app notice and a notice.created event meant for them alone', async () => {
    const follower = await signedInClient(server.url, 'member');
    const bystander = await createUser('member');
    const { tool } = await makeTool(server.deps.sequelize);
    await follower.client.put(`/api/tools/${tool.id}/follow`);
    const events: DomainEvent[] = [];
    const stop = server.deps.events.subscribe((e) => events.push(e));
    await changeState(server.deps, {
      toolId: tool.id,
      state: 'scheduled_downtime',
      reason: 'preventive_maintenance',
      note: 'Quarterly PM',
      actorId: null,
    });
    stop();

    expect(events).toContainEqual({ type: 'notice.created', audience: { users: [follower.user.id] }, payload: { kind: 'tool_state' } });
    expect(await Notice.count({ where: { userId: bystander.id } })).toBe(0);
    const list = await follower.client.get('/api/notices');
    expect(list.status).toBe(200);
    expect(list.body.unread).toBe(1);
    expect(list.body.items[0]).toMatchObject({
      kind: 'tool_state',
      title: `${tool.name} (${tool.code}) is now Maintenance`,
      link: `/tools/${tool.code}`,
      readAt: null,
    });
  });

  it('when a module of a followed tool goes down, then the mail names the module and what the tool now reads', async () => {
    const follower = await signedInClient(server.url, 'member');
    const { tool, modules } = await makeTool(server.deps.sequelize, { modules: ['PM1', 'PM2'] });
    await follower.client.put(`/api/tools/${tool.id}/follow`);
    await changeState(server.deps, {
      toolId: tool.id,
      moduleId: modules[1].id,
      state: 'unscheduled_downtime',
      note: 'Chuck leak',
      actorId: null,
    });
    await drainOutbox(server);
    const mail = await server.catcher.waitFor((m) => m.to.includes(follower.user.email));
    expect(mail.subject).toContain(`Chamber PM2 of ${tool.name}`);
    expect(mail.text).toContain('The tool as a whole now reads: Limited.');
  });

  it('when the tool only goes from busy to idle, or the follower made the change, then nobody is told', async () => {
    const tech = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    await tech.client.put(`/api/tools/${tool.id}/follow`);
    await changeState(server.deps, { toolId: tool.id, state: 'productive', actorId: null });
    await tech.client.post(`/api/tools/${tool.id}/state`, { state: 'unscheduled_downtime', note: 'I saw it myself' });
    expect(await OutboxMail.count({ where: { toAddress: tech.user.email } })).toBe(0);
    expect(await Notice.count({ where: { userId: tech.user.id } })).toBe(0);
  });

  it('when following twice, then it is one follow with the first token; unfollowing from the tool page stops the mail', async () => {
    const follower = await signedInClient(server.url, 'member');
    const { tool } = await makeTool(server.deps.sequelize);
    await follower.client.put(`/api/tools/${tool.id}/follow`);
    const token = (await ToolFollow.findOne({ where: { userId: follower.user.id, toolId: tool.id } }))!.unfollowToken;
    await follower.client.put(`/api/tools/${tool.id}/follow`);
    expect(await ToolFollow.count({ where: { userId: follower.user.id } })).toBe(1);
    expect((await ToolFollow.findOne({ where: { userId: follower.user.id } }))!.unfollowToken).toBe(token);
    expect((await follower.client.get(`/api/tools/by-code/${tool.code}`)).body.following).toBe(true);

    const un = await follower.client.delete(`/api/tools/${tool.id}/follow`);
    expect(un.status).toBe(200);
    expect(un.body).toEqual({ following: false });
    await changeState(server.deps, { toolId: tool.id, state: 'unscheduled_downtime', note: 'x', actorId: null });
    expect(await OutboxMail.count({ where: { toAddress: follower.user.email } })).toBe(0);
  });

  it('when the unfollow link from the e-mail is used without signing in, then the follow ends; the same link again is 404', async () => {
    const follower = await signedInClient(server.url, 'member');
    const { tool } = await makeTool(server.deps.sequelize, { name: 'Token unfollow tool' });
    await follower.client.put(`/api/tools/${tool.id}/follow`);
    const token = (await ToolFollow.findOne({ where: { userId: follower.user.id, toolId: tool.id } }))!.unfollowToken;

    const anonymous = new TestClient(server.url);
    const r = await anonymous.post('/api/unfollow', { token });
    expect(r.status).toBe(200);
    expect(r.body.tool).toEqual({ id: tool.id, code: tool.code, name: 'Token unfollow tool' });
    expect(await ToolFollow.count({ where: { userId: follower.user.id, toolId: tool.id } })).toBe(0);

    const again = await anonymous.post('/api/unfollow', { token });
    expect(again.status).toBe(404);
    expect(again.body.error.code).toBe('unfollow_link_unknown');
    expect((await anonymous.post('/api/unfollow', { token: 'short' })).status).toBe(400);
  });
});

describe('notices', () => {
  it('when notices are paged and marked read, then the unread count follows, and nobody can mark another person’s notice', async () => {
    const me = await signedInClient(server.url, 'member');
    const other = await signedInClient(server.url, 'member');
    await Notice.bulkCreate(
      [1, 2, 3].map((n) => ({ userId: me.user.id, kind: 'test', title: `Notice ${n}`, body: null, link: null, readAt: null })),
    );
    const page1 = await me.client.get('/api/notices?limit=2');
    expect(page1.body).toMatchObject({ total: 3, unread: 3, limit: 2, offset: 0 });
    expect(page1.body.items).toHaveLength(2);
    const page2 = await me.client.get('/api/notices?limit=2&offset=2');
    expect(page2.body.items).toHaveLength(1);

    const id = page1.body.items[0].id;
    expect((await other.client.post(`/api/notices/${id}/read`)).status).toBe(404);
    const read = await me.client.post(`/api/notices/${id}/read`);
    expect(read.status).toBe(200);
    expect(read.body.readAt).toEqual(expect.any(String));
    expect((await me.client.get('/api/notices?unread=true')).body).toMatchObject({ total: 2, unread: 2 });

    const all = await me.client.post('/api/notices/read-all');
    expect(all.body).toEqual({ marked: 2 });
    expect((await me.client.get('/api/notices')).body.unread).toBe(0);
  });
});
