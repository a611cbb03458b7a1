import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { io as connect, type Socket } from 'socket.io-client';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import { DisplayLink } from '../../server/modules/facility/facility.model';
import { changeState } from '../../server/modules/facility/state.service';
import { makeTool } from './facility-fixtures';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const withKey = (key: string) => ({ headers: { 'x-display-key': key } });

function displaySocket(key: string): Socket {
  return connect(server.url, {
    path: '/socket.io',
    transports: ['websocket'],
    auth: { displayKey: key },
    forceNew: true,
    reconnection: false,
  });
}

function waitFor<T>(register: (done: (value: T) => void) => void, ms = 2000, what = 'event'): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`no ${what} within ${ms} ms`)), ms);
    register((value) => {
      clearTimeout(timer);
      resolve(value);
    });
  });
}

describe('lobby display links', () => {
  it('when an admin creates a link, then the key (43+ random characters) is shown once and only its SHA-256 is stored', async () => {
    const { client, user } = await signedInClient(server.url, 'admin');
    const r = await client.post('/api/admin/display-links', { name: 'Entrance screen' });
    expect(r.status).toBe(201);
    expect(r.body.key).toMatch(/^[A-Za-z0-9_-]{43,}$/);
    expect(r.body.url).toBe(`${server.config.publicUrl}/display/${r.body.key}`);
    const row = await DisplayLink.findByPk(r.body.id);
    expect(row!.keyHash).toBe(crypto.createHash('sha256').update(r.body.key).digest('hex'));
    expect(JSON.stringify(row!.toJSON())).not.toContain(r.body.key);
    expect(row!.createdById).toBe(user.id);

    const list = await client.get('/api/admin/display-links');
    const listed = list.body.items.find((i: { id: number }) => i.id === r.body.id);
    expect(listed).toMatchObject({ name: 'Entrance screen', revokedAt: null, createdBy: user.name });
    expect(JSON.stringify(list.body)).not.toContain(r.body.key);
  });

  it('when a member or technician tries to create or revoke a link, then 403', async () => {
    for (const role of ['member', 'technician'] as const) {
      const { client } = await signedInClient(server.url, role);
      expect((await client.post('/api/admin/display-links', { name: 'Mine' })).status).toBe(403);
      expect((await client.delete('/api/admin/display-links/1')).status).toBe(403);
    }
  });

  it('when a display sends its key without signing in, then it reads the board and its own name, and nothing else', async () => {
    const admin = await signedInClient(server.url, 'admin');
    const { key, id } = (await admin.client.post('/api/admin/display-links', { name: 'Corridor screen' })).body;
    const { tool } = await makeTool(server.deps.sequelize);

    const board = await fetch(`${server.url}/api/board`, withKey(key));
    expect(board.status).toBe(200);
    const data = await board.json();
    expect(data.areas.flatMap((a: { tools: { id: number }[] }) => a.tools.map((t) => t.id))).toContain(tool.id);

    const self = await fetch(`${server.url}/api/display-link`, withKey(key));
    expect(self.status).toBe(200);
    expect(await self.json()).toEqual({ id, name: 'Corridor screen' });
    expect((await DisplayLink.findByPk(id))!.lastSeenAt).not.toBeNull();

    // A display key opens the board only: the tool pages and the notices need a person.
    expect((await fetch(`${server.url}/api/tools/by-code/${tool.code}`, withKey(key))).status).toBe(401);
    expect((await fetch(`${server.url}/api/notices`, withKey(key))).status).toBe(401);
    const write = await fetch(`${server.url}/api/tools/${tool.id}/state`, {
      method: 'POST',
      headers: { 'x-display-key': key, 'content-type': 'application/json' },
      body: JSON.stringify({ state: 'standby' }),
    });
    expect(write.status).toBeGreaterThanOrEqual(401);
    expect(write.status).toBeLessThanOrEqual(403);
  });

  it('when a key is made up, then 401 display_revoked and the socket handshake is refused', async () => {
    const fake = crypto.randomBytes(32).toString('base64url');
    const r = await fetch(`${server.url}/api/board`, withKey(fake));
    expect(r.status).toBe(401);
    expect((await r.json()).error.code).toBe('display_revoked');
    const socket = displaySocket(fake);
    try {
      const error = await waitFor<Error>((done) => socket.once('connect_error', done), 2000, 'connect_error');
      expect(error.message).toBe('unauthorized');
    } finally {
      socket.disconnect();
    }
  });

  it('when a display is connected and the link is revoked, then its socket is cut off, its key gets 401 and it cannot reconnect', async () => {
    const admin = await signedInClient(server.url, 'admin');
    const { key, id } = (await admin.client.post('/api/admin/display-links', { name: 'To be revoked' })).body;
    const { tool } = await makeTool(server.deps.sequelize);

    const socket = displaySocket(key);
    try {
      await waitFor<void>((done) => socket.once('connect', () => done()), 2000, 'connect');
      // The display hears state changes like any board.
      const heard = waitFor<{ toolId: number }>(
        (done) => socket.on('tool.state_changed', (p) => p.toolId === tool.id && done(p)),
        1000,
        'tool.state_changed',
      );
      await changeState(server.deps, { toolId: tool.id, state: 'unscheduled_downtime', note: 'x', actorId: null });
      expect((await heard).toolId).toBe(tool.id);

      const cut = waitFor<string>((done) => socket.once('disconnect', done), 2000, 'disconnect');
      const revoked = await admin.client.delete(`/api/admin/display-links/${id}`);
      expect(revoked.status).toBe(200);
      expect(revoked.body.revokedAt).toEqual(expect.any(String));
      expect(await cut).toBe('io server disconnect');
    } finally {
      socket.disconnect();
    }

    const board = await fetch(`${server.url}/api/board`, withKey(key));
    expect(board.status).toBe(401);
    expect((await board.json()).error.code).toBe('display_revoked');
    expect((await fetch(`${server.url}/api/display-link`, withKey(key))).status).toBe(401);

    const again = displaySocket(key);
    try {
      await waitFor<Error>((done) => again.once('connect_error', done), 2000, 'connect_error');
    } finally {
      again.disconnect();
    }
  });

  it('when someone signed in opens a revoked display link, then the display check still refuses the key', async () => {
    const admin = await signedInClient(server.url, 'admin');
    const { key, id } = (await admin.client.post('/api/admin/display-links', { name: 'Preview' })).body;
    await admin.client.delete(`/api/admin/display-links/${id}`);
    const r = await admin.client.get('/api/display-link', { 'x-display-key': key });
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe('display_revoked');
  });
});
