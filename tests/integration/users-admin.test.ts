import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { io as connect } from 'socket.io-client';
import { startTestServer, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';
import { SessionRow } from '../../server/modules/auth/session.model';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

describe('disabling a user', () => {
  it('when an admin disables a user, then all their sessions end and their sockets are disconnected', async () => {
    const { client: admin } = await signedInClient(server.url, 'admin');
    const user = await createUser('technician');
    const phone = new TestClient(server.url);
    const desk = new TestClient(server.url);
    await phone.signIn(user.email, TEST_PASSWORD);
    await desk.signIn(user.email, TEST_PASSWORD);
    expect(await SessionRow.count({ where: { userId: user.id } })).toBe(2);

    const socket = connect(server.url, { extraHeaders: { cookie: desk.cookie! }, transports: ['websocket'] });
    await new Promise<void>((resolve, reject) => {
      socket.on('connect', () => resolve());
      socket.on('connect_error', reject);
    });
    const disconnected = new Promise<string>((resolve) => socket.on('disconnect', (reason) => resolve(reason)));

    const r = await admin.patch(`/api/users/${user.id}`, { active: false });
    expect(r.status).toBe(200);
    expect(r.body.active).toBe(false);
    expect(await disconnected).toBe('io server disconnect');
    expect(await SessionRow.count({ where: { userId: user.id } })).toBe(0);
    expect((await phone.get('/api/session')).body.user).toBeNull();
    socket.close();
  });

  it('when an admin tries to disable themselves, then 409', async () => {
    const { client, user } = await signedInClient(server.url, 'admin');
    expect((await client.patch(`/api/users/${user.id}`, { active: false })).status).toBe(409);
  });
});

describe('sockets', () => {
  it('when nobody is signed in, then the socket handshake is refused', async () => {
    const socket = connect(server.url, { transports: ['websocket'], reconnection: false });
    const err = await new Promise<Error>((resolve) => socket.on('connect_error', resolve));
    expect(err.message).toMatch(/unauthorized/);
    socket.close();
  });

  it('when the Origin is foreign, then the socket handshake is refused even with a session', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const socket = connect(server.url, {
      extraHeaders: { cookie: client.cookie!, origin: 'https://evil.example' },
      transports: ['websocket'],
      reconnection: false,
    });
    const err = await new Promise<Error>((resolve) => socket.on('connect_error', resolve));
    expect(err).toBeTruthy();
    expect(socket.connected).toBe(false);
    socket.close();
  });
});
