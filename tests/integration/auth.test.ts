import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { Op } from 'sequelize';
import { SessionRow } from '../../server/modules/auth/session.model';
import { Throttle } from '../../server/lib/throttle.model';

let server: TestServer;

beforeAll(async () => {
  // A short throttle window so the test can wait it out.
  server = await startTestServer({ SIGNIN_MAX_FAILURES_PER_ACCOUNT: '3', SIGNIN_WINDOW_SECONDS: '2' });
});
afterAll(() => server.close());

describe('sign-in', () => {
  it('when the password is right, then 200, the user, and a new session id replaces the anonymous one', async () => {
    const user = await createUser('technician');
    const client = new TestClient(server.url);
    await client.refreshCsrf();
    const before = client.cookie;
    expect(before).toMatch(/^faultline\.sid=/);

    const r = await client.post('/api/session', { email: user.email, password: TEST_PASSWORD });
    expect(r.status).toBe(200);
    expect(r.body.user).toEqual({ id: user.id, email: user.email, name: user.name, role: 'technician' });
    expect(r.body.csrfToken).toEqual(expect.any(String));
    expect(client.cookie).not.toBe(before);

    // The anonymous session from before sign-in is dead: it does not carry the user.
    const old = new TestClient(server.url);
    old.cookie = before;
    expect((await old.get('/api/session')).body.user).toBeNull();
    // And the new one does.
    expect((await client.get('/api/session')).body.user.id).toBe(user.id);
  });

  it('when the e-mail is unknown or the password wrong, then the same 401 with no hint which was wrong', async () => {
    const user = await createUser();
    const a = new TestClient(server.url);
    const wrongPassword = await a.signIn(user.email, 'not-the-password');
    const b = new TestClient(server.url);
    const unknownEmail = await b.signIn('nobody-here@test.faultline.test', TEST_PASSWORD);
    expect(wrongPassword.status).toBe(401);
    expect(unknownEmail.status).toBe(401);
    expect(wrongPassword.body).toEqual(unknownEmail.body);
    expect(wrongPassword.body.error.code).toBe('bad_credentials');
  });

  it('when an account fails N times in the window, then the next attempt gets 429, and after the window the real user signs in', async () => {
    const user = await createUser();
    const client = new TestClient(server.url);
    for (let i = 0; i < 3; i++) expect((await client.signIn(user.email, `wrong-${i}`)).status).toBe(401);
    const throttled = await client.signIn(user.email, TEST_PASSWORD);
    expect(throttled.status).toBe(429);
    expect(throttled.body.error.code).toBe('rate_limited');
    expect(Number(throttled.headers.get('retry-after'))).toBeGreaterThan(0);

    await new Promise((r) => setTimeout(r, 2200));
    expect((await client.signIn(user.email, TEST_PASSWORD)).status).toBe(200);
  });

  it('when one address fails N times across different accounts, then it gets 429 too', async () => {
    const s = await startTestServer({ SIGNIN_MAX_FAILURES_PER_ADDRESS: '4' });
    try {
      await Throttle.destroy({ where: { key: { [Op.like]: 'signin:address:%' } } });
      const client = new TestClient(s.url);
      for (let i = 0; i < 4; i++)
        expect((await client.signIn(`probe-${i}-${Date.now()}@test.faultline.test`, 'guess-guess')).status).toBe(401);
      expect((await client.signIn(`probe-last-${Date.now()}@test.faultline.test`, 'guess-guess')).status).toBe(429);
    } finally {
      await Throttle.destroy({ where: { key: { [Op.like]: 'signin:address:%' } } });
      await s.close();
    }
  });

  it('when a disabled user tries to sign in, then 401', async () => {
    const user = await createUser('member', { active: false });
    expect((await new TestClient(server.url).signIn(user.email, TEST_PASSWORD)).status).toBe(401);
  });
});

describe('sign-out', () => {
  it('when a user signs out, then the server session is destroyed and the old cookie gets 401', async () => {
    const user = await createUser();
    const client = new TestClient(server.url);
    await client.signIn(user.email, TEST_PASSWORD);
    const cookie = client.cookie;
    const sid = decodeURIComponent(cookie!.split('=')[1]).slice(2).split('.')[0];
    expect(await SessionRow.findByPk(sid)).not.toBeNull();

    expect((await client.delete('/api/session')).status).toBe(204);
    expect(await SessionRow.findByPk(sid)).toBeNull();

    const replay = new TestClient(server.url);
    replay.cookie = cookie;
    expect((await replay.get('/api/users')).status).toBe(401);
  });
});

describe('session lifetimes', () => {
  const sessionId = (client: TestClient) => decodeURIComponent(client.cookie!.split('=')[1]).slice(2).split('.')[0];

  /** Moves the session's clocks back, as if time had passed, instead of waiting. */
  async function backdate(client: TestClient, fields: { signedInAt?: number; lastSeenAt?: number }) {
    const row = await SessionRow.findByPk(sessionId(client));
    const data = JSON.parse(row!.data!);
    await row!.update({ data: JSON.stringify({ ...data, ...fields }) });
  }

  it('when a session sits idle past the idle timeout, then the server refuses it', async () => {
    const user = await createUser('admin');
    const client = new TestClient(server.url);
    await client.signIn(user.email, TEST_PASSWORD);
    expect((await client.get('/api/users')).status).toBe(200);
    const idleMs = server.deps.config.SESSION_IDLE_MINUTES * 60_000;
    await backdate(client, { lastSeenAt: Date.now() - idleMs - 60_000 });
    const r = await client.get('/api/users');
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe('session_expired');
  });

  it('when a busy session passes its absolute lifetime, then the server refuses it even though it was never idle', async () => {
    const user = await createUser('admin');
    const client = new TestClient(server.url);
    await client.signIn(user.email, TEST_PASSWORD);
    expect((await client.get('/api/users')).status).toBe(200);
    const absoluteMs = server.deps.config.SESSION_ABSOLUTE_HOURS * 3_600_000;
    // Signed in longer ago than the lifetime, but seen a moment ago.
    await backdate(client, { signedInAt: Date.now() - absoluteMs - 60_000, lastSeenAt: Date.now() - 1000 });
    const r = await client.get('/api/users');
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe('session_expired');
  });

  it('when a session was seen within the idle timeout and signed in within its lifetime, then it still works', async () => {
    const user = await createUser('admin');
    const client = new TestClient(server.url);
    await client.signIn(user.email, TEST_PASSWORD);
    const idleMs = server.deps.config.SESSION_IDLE_MINUTES * 60_000;
    const absoluteMs = server.deps.config.SESSION_ABSOLUTE_HOURS * 3_600_000;
    await backdate(client, { signedInAt: Date.now() - absoluteMs + 60_000, lastSeenAt: Date.now() - idleMs + 60_000 });
    expect((await client.get('/api/users')).status).toBe(200);
  });
});

describe('session cookie', () => {
  it('when a session is created, then the cookie is HttpOnly, SameSite=Lax, path /, with no Domain', async () => {
    const r = await fetch(`${server.url}/api/session`);
    const cookie = r.headers.get('set-cookie')!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Domain=/i);
  });
});
