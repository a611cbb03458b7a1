import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';

let server: TestServer;
const lines: Record<string, any>[] = [];

beforeAll(async () => {
  const destination = { write: (chunk: string) => void lines.push(JSON.parse(chunk)) };
  server = await startTestServer({ LOG_LEVEL: 'info' }, { logDestination: destination });
});
afterAll(() => server.close());

const security = (event: string) => lines.filter((l) => l.security === event);

describe('security log', () => {
  it('when people sign in, fail, get refused or send bad input, then one structured line each, with time, user, route and address, and never a secret', async () => {
    const user = await createUser('member');
    const wrong = new TestClient(server.url);
    await wrong.signIn(user.email, 'a-wrong-password-1');
    const right = new TestClient(server.url);
    await right.signIn(user.email, TEST_PASSWORD);
    await right.get('/api/users'); // 403: member on an admin route
    await new TestClient(server.url).get('/api/users'); // 401
    const { client: admin } = await signedInClient(server.url, 'admin');
    await admin.post('/api/users', { nonsense: true }); // 400

    const failed = security('sign_in_failed').at(-1)!;
    expect(failed).toMatchObject({ route: 'POST /api/session', address: expect.stringMatching(/127\.0\.0\.1/) });
    expect(new Date(failed.time).toISOString()).toBe(failed.time); // UTC ISO time
    expect(security('sign_in_succeeded').some((l) => l.userId === user.id)).toBe(true);
    expect(security('access_denied').some((l) => l.userId === user.id && l.route === 'GET /api/users')).toBe(true);
    expect(security('unauthenticated').length).toBeGreaterThan(0);
    expect(security('validation_failed').some((l) => l.route === 'POST /api/users')).toBe(true);

    const all = JSON.stringify(lines);
    expect(all).not.toContain(TEST_PASSWORD);
    expect(all).not.toContain('a-wrong-password-1');
    expect(all).not.toContain(right.csrfToken!);
    expect(all).not.toContain(decodeURIComponent(right.cookie!.split('=')[1]).slice(2).split('.')[0]);
  });
});
