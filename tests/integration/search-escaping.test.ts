import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient, unique } from '../support/factories';
import { createTool } from './tickets-fixtures';
import { likePattern } from '../../server/lib/like-pattern';

// Every search box runs through likePattern: what people type is matched literally, so % and _
// are not wildcards and a backslash is just a backslash.

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

describe('likePattern', () => {
  it('when text holds %, _ or a backslash, then each is escaped and the whole is wrapped in %', () => {
    expect(likePattern('50%_a\\b')).toBe('%50\\%\\_a\\\\b%');
    expect(likePattern('plain')).toBe('%plain%');
  });
});

describe('search boxes', () => {
  it('when someone searches for text with % and _, then only names with those very characters match, in every search', async () => {
    const token = unique('q');
    // "5%_a" as a pattern would also match "5xxa"; escaped, it matches only itself.
    const literal = `${token} 5%_a`;
    const lookalike = `${token} 5xxa`;
    const { client: admin } = await signedInClient(server.url, 'admin');
    const exact = await createUser('technician', { name: `Tech ${literal}` });
    await createUser('technician', { name: `Tech ${lookalike}` });
    const tool = (await createTool(server.deps.sequelize, { name: `Etcher ${literal}` })).tool;
    await createTool(server.deps.sequelize, { name: `Etcher ${lookalike}` });
    const q = encodeURIComponent(literal);

    const users = await admin.get(`/api/users?q=${q}`);
    expect(users.status).toBe(200);
    expect(users.body.items.map((u: { id: number }) => u.id)).toEqual([exact.id]);

    const engineers = await admin.get(`/api/admin/engineers?q=${q}`);
    expect(engineers.body.items.map((u: { id: number }) => u.id)).toEqual([exact.id]);

    const assignees = await admin.get(`/api/assignees?q=${q}`);
    expect(assignees.status).toBe(200);
    expect(assignees.body.map((u: { id: number }) => u.id)).toEqual([exact.id]);

    const reportTools = await admin.get(`/api/report-tools?q=${q}`);
    expect(reportTools.body.items.map((t: { id: number }) => t.id)).toEqual([tool.id]);

    const adminTools = await admin.get(`/api/admin/tools?q=${q}`);
    expect(adminTools.body.items.map((t: { id: number }) => t.id)).toEqual([tool.id]);
  });
});
