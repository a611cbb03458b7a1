import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { drainOutbox, startTestServer, type TestServer } from '../support/server';
import { OutboxMail } from '../../server/lib/outbox.model';
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
    expect(all).not.toContain(right.sessionId!);
  });

  it('when links are asked for, used, refused and a password is reset, then one line each, without the token, the e-mail of the link or the password', async () => {
    const user = await createUser('member');
    const visitor = new TestClient(server.url);
    await visitor.post('/api/password-resets', { email: user.email });
    await server.accountMail.runOnce();
    await drainOutbox(server);
    const mail = await OutboxMail.findOne({ where: { toAddress: user.email }, order: [['id', 'DESC']] });
    const token = /\/reset-password\/([A-Za-z0-9_-]{43})/.exec(mail!.textBody)![1];
    const newPassword = 'a-secret-new-passphrase-77';
    expect((await visitor.post(`/api/password-resets/${token}`, { password: newPassword })).status).toBe(200);
    expect((await visitor.post(`/api/password-resets/${token}`, { password: newPassword })).status).toBe(400);
    expect((await visitor.post(`/api/sign-in-links/${'A'.repeat(43)}`)).status).toBe(400);

    expect(security('account_mail_requested').some((l) => l.kind === 'password_reset' && l.route === 'POST /api/password-resets')).toBe(
      true,
    );
    expect(security('password_changed').some((l) => l.changedUserId === user.id && l.via === 'reset_link')).toBe(true);
    expect(security('account_link_refused').map((l) => l.purpose)).toEqual(expect.arrayContaining(['reset', 'sign_in']));
    const all = JSON.stringify(lines);
    expect(all).not.toContain(token);
    expect(all).not.toContain(newPassword);
  });
});
