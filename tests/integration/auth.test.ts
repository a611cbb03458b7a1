import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import { startTestServer, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';
import { SessionRow } from '../../server/modules/auth/session.model';
import { Throttle } from '../../server/lib/throttle.model';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

/** Moves a stored session's clock back: what "time passes" means, without waiting. */
async function backdateSession(sid: string, by: { lastSeenMs?: number; signedInMs?: number }) {
  const row = (await SessionRow.findByPk(sid))!;
  const data = JSON.parse(row.data!);
  if (by.lastSeenMs) data.lastSeenAt -= by.lastSeenMs;
  if (by.signedInMs) data.signedInAt -= by.signedInMs;
  await SessionRow.update({ data: JSON.stringify(data) }, { where: { sid } });
}

describe('sign-in', () => {
  it('when the password is right, then 200, the user, and a new session id at every sign-in (the old one is dead)', async () => {
    const user = await createUser('technician');
    const client = new TestClient(server.url);
    const r = await client.signIn(user.email, TEST_PASSWORD);
    expect(r.status).toBe(200);
    expect(r.body.user).toEqual({ id: user.id, email: user.email, name: user.name, role: 'technician' });
    expect(r.body.csrfToken).toEqual(expect.any(String));
    const first = client.sessionId!;
    const firstCookie = client.cookie;
    expect(await SessionRow.findByPk(first)).not.toBeNull();

    // Signing in again over an existing session: a fresh id, and the old session is gone.
    expect((await client.signIn(user.email, TEST_PASSWORD)).status).toBe(200);
    expect(client.sessionId).not.toBe(first);
    expect(await SessionRow.findByPk(first)).toBeNull();
    const old = new TestClient(server.url);
    old.cookie = firstCookie;
    expect((await old.get('/api/session')).body.user).toBeNull();
    expect((await client.get('/api/session')).body.user.id).toBe(user.id);
  });

  it('when the e-mail is unknown or the password wrong, then the same 401 with no hint which was wrong', async () => {
    const user = await createUser();
    const wrongPassword = await new TestClient(server.url).signIn(user.email, 'not-the-password');
    const unknownEmail = await new TestClient(server.url).signIn('nobody-here@test.faultline.test', TEST_PASSWORD);
    expect(wrongPassword.status).toBe(401);
    expect(unknownEmail.status).toBe(401);
    expect(wrongPassword.body).toEqual(unknownEmail.body);
    expect(wrongPassword.body.error.code).toBe('bad_credentials');
  });

  it('when a disabled user tries to sign in, then 401', async () => {
    const user = await createUser('member', { active: false });
    expect((await new TestClient(server.url).signIn(user.email, TEST_PASSWORD)).status).toBe(401);
  });
});

describe('sign-out', () => {
  it('when a user signs out, then the server session is destroyed and the old cookie gets 401', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const cookie = client.cookie;
    const sid = client.sessionId!;
    expect(await SessionRow.findByPk(sid)).not.toBeNull();

    expect((await client.delete('/api/session')).status).toBe(204);
    expect(await SessionRow.findByPk(sid)).toBeNull();

    const replay = new TestClient(server.url);
    replay.cookie = cookie;
    expect((await replay.get('/api/users')).status).toBe(401);
  });
});

describe('session lifetimes (checked on the server)', () => {
  it('when a session sits idle past the idle timeout, then the server refuses it', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    expect((await client.get('/api/users')).status).toBe(200);
    await backdateSession(client.sessionId!, { lastSeenMs: (server.config.SESSION_IDLE_MINUTES * 60 + 1) * 1000 });
    const r = await client.get('/api/users');
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe('session_expired');
  });

  it('when a busy session passes its absolute lifetime, then the server refuses it even though it was never idle', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    expect((await client.get('/api/users')).status).toBe(200);
    // Signed in just over the absolute lifetime ago, seen a moment ago.
    await backdateSession(client.sessionId!, { signedInMs: server.config.SESSION_ABSOLUTE_HOURS * 3_600_000 + 1000 });
    const r = await client.get('/api/users');
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe('session_expired');
  });

  it('when a signed-in user makes many requests within a minute, then the session row is written at most once, and again after a minute', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const sid = client.sessionId!;
    const before = (await SessionRow.findByPk(sid))!;
    for (let i = 0; i < 25; i++) expect((await client.get('/api/users')).status).toBe(200);
    const after = (await SessionRow.findByPk(sid))!;
    expect(after.updatedAt.getTime()).toBe(before.updatedAt.getTime());
    expect(after.expires!.getTime()).toBe(before.expires!.getTime());
    expect(after.data).toBe(before.data);

    // Last seen over a minute ago: the next request moves last-seen and the row's expiry on.
    await backdateSession(sid, { lastSeenMs: 61_000 });
    const backdated = (await SessionRow.findByPk(sid))!;
    expect((await client.get('/api/users')).status).toBe(200);
    const moved = (await SessionRow.findByPk(sid))!;
    expect(JSON.parse(moved.data!).lastSeenAt).toBeGreaterThan(JSON.parse(backdated.data!).lastSeenAt + 60_000);
    expect(moved.expires!.getTime()).toBeGreaterThan(after.expires!.getTime());
    for (let i = 0; i < 10; i++) await client.get('/api/users');
    expect((await SessionRow.findByPk(sid))!.updatedAt.getTime()).toBe(moved.updatedAt.getTime());
  });
});

describe('signed-out visitors', () => {
  it('when 500 requests arrive without cookies, then no session row is stored, and their CSRF token still works for signing in', async () => {
    const startedAt = new Date(Date.now() - 1000);
    const paths = ['/api/session', '/api/board', '/api/users', '/api/no-such-route'];
    for (let batch = 0; batch < 10; batch++) {
      await Promise.all(
        Array.from({ length: 50 }, (_, i) => fetch(`${server.url}${paths[(batch * 50 + i) % paths.length]}`).then((r) => r.arrayBuffer())),
      );
    }
    expect(await SessionRow.count({ where: { createdAt: { [Op.gte]: startedAt }, userId: null } })).toBe(0);

    // The first request of a visitor sets only the CSRF cookie; the token bound to it signs in.
    const user = await createUser();
    const visitor = new TestClient(server.url);
    await visitor.refreshCsrf();
    expect([...visitor.jar.keys()]).toEqual(['faultline.csrf']);
    expect((await visitor.post('/api/session', { email: user.email, password: TEST_PASSWORD })).status).toBe(200);
    // A token from another visitor's cookie does not.
    const other = new TestClient(server.url);
    await other.refreshCsrf();
    const stranger = new TestClient(server.url);
    await stranger.refreshCsrf();
    stranger.csrfToken = other.csrfToken;
    const r = await stranger.post('/api/session', { email: user.email, password: TEST_PASSWORD });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('csrf_failed');
  });

  it('when one address sends more signed-out requests than the per-minute limit, then 429 with Retry-After', async () => {
    const s = await startTestServer({ ANONYMOUS_REQUESTS_PER_MINUTE: '30', TRUST_PROXY: 'loopback' });
    try {
      // A fresh address for this run (behind the trusted loopback proxy), so earlier runs do not count.
      const address = `203.0.113.${Math.floor(Math.random() * 250) + 1}`;
      await Throttle.destroy({ where: { key: `rl:anonymous:ip:${address}` } });
      const statuses: number[] = [];
      for (let i = 0; i < 32; i++) statuses.push((await fetch(`${s.url}/api/session`, { headers: { 'x-forwarded-for': address } })).status);
      expect(statuses.slice(0, 30).every((x) => x === 200)).toBe(true);
      const limited = await fetch(`${s.url}/api/session`, { headers: { 'x-forwarded-for': address } });
      expect(limited.status).toBe(429);
      expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0);
      // Signed-in people are not counted against their address (they sign in from a fresh one,
      // since the counters of loopback are shared with every other test).
      const user = await createUser();
      const client = new TestClient(s.url, { 'x-forwarded-for': `198.51.100.${Math.floor(Math.random() * 250) + 1}` });
      expect((await client.signIn(user.email, TEST_PASSWORD)).status).toBe(200);
      expect((await client.get('/api/session', { 'x-forwarded-for': address })).status).toBe(200);
    } finally {
      await s.close();
    }
  });
});

describe('session cookie', () => {
  it('when a session is created, then the cookie is HttpOnly, SameSite=Lax, path /, with no Domain, and the visitor CSRF cookie is HttpOnly and SameSite=Strict', async () => {
    const user = await createUser();
    const visitor = await fetch(`${server.url}/api/session`);
    const csrfCookie = visitor.headers.getSetCookie().find((c) => c.startsWith('faultline.csrf='))!;
    expect(csrfCookie).toMatch(/HttpOnly/i);
    expect(csrfCookie).toMatch(/SameSite=Strict/i);
    expect(visitor.headers.getSetCookie().some((c) => c.startsWith('faultline.sid='))).toBe(false);

    const client = new TestClient(server.url);
    await client.refreshCsrf();
    const r = await fetch(`${server.url}/api/session`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', cookie: client.cookie!, 'x-csrf-token': client.csrfToken! },
      body: JSON.stringify({ email: user.email, password: TEST_PASSWORD }),
    });
    const cookie = r.headers.getSetCookie().find((c) => c.startsWith('faultline.sid='))!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).toMatch(/Path=\//);
    expect(cookie).not.toMatch(/Domain=/i);
  });
});
