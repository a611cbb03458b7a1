import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient } from '../support/factories';
import { makeTool } from './facility-fixtures';

// Members see who looks after a tool by name; staff e-mail addresses are for staff only, so a
// member cannot collect them (for phishing or to aim lockouts at them).

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

describe('engineers on the tool page', () => {
  it('when a member opens a tool page, then the engineers are named without e-mail; a technician sees the e-mail', async () => {
    const primary = await createUser('technician', { name: 'Primary Engineer' });
    const backup = await createUser('manager', { name: 'Backup Engineer' });
    const { tool } = await makeTool(server.deps.sequelize, { primaryEngineerId: primary.id, backupEngineerId: backup.id });

    const member = await signedInClient(server.url, 'member');
    const seen = await member.client.get(`/api/tools/by-code/${tool.code}`);
    expect(seen.status).toBe(200);
    expect(seen.body.primaryEngineer).toEqual({ id: primary.id, name: 'Primary Engineer' });
    expect(seen.body.backupEngineer).toEqual({ id: backup.id, name: 'Backup Engineer' });
    expect(seen.text).not.toContain(primary.email);
    expect(seen.text).not.toContain(backup.email);

    const tech = await signedInClient(server.url, 'technician');
    const staffView = await tech.client.get(`/api/tools/by-code/${tool.code}`);
    expect(staffView.body.primaryEngineer).toEqual({ id: primary.id, name: 'Primary Engineer', email: primary.email });
  });

  it('when a member reads the board and the tool history, then no staff e-mail address is in them', async () => {
    const primary = await createUser('technician', { name: 'Another Engineer' });
    const { tool } = await makeTool(server.deps.sequelize, { primaryEngineerId: primary.id });
    const member = await signedInClient(server.url, 'member');
    for (const path of ['/api/board', `/api/tools/${tool.id}/history`]) {
      const r = await member.client.get(path);
      expect(r.status).toBe(200);
      expect(r.text).not.toContain(primary.email);
    }
  });
});
