import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, drainOutbox, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { createUser, signedInClient } from '../support/factories';
import { Op } from 'sequelize';
import { OutboxMail } from '../../server/lib/outbox.model';
import { Throttle } from '../../server/lib/throttle.model';

let server: TestServer;
beforeAll(async () => {
  // Worker driven by hand (runOnce) so the test controls the timing; short back-off.
  server = await startTestServer({ OUTBOX_BASE_BACKOFF_MS: '200' }, { outboxWorker: false });
  // The reset-request limit counts per address across runs of a kept test database.
  await Throttle.destroy({ where: { key: { [Op.like]: 'rl:password-reset:%' } } });
  // Start from an empty queue so the first pass below is about this test's mail only.
  await drainOutbox(server);
});
afterAll(() => server.close());

describe('mail outbox', () => {
  it('when SMTP is down while a mail is queued, then the outbox keeps it, records attempts, and delivers it once SMTP is back', async () => {
    const user = await createUser('member');
    await server.catcher.stop();

    const anonymous = new TestClient(server.url);
    const r = await anonymous.post('/api/password-resets', { email: user.email });
    expect(r.status, r.text).toBe(202);
    const row = await OutboxMail.findOne({ where: { toAddress: user.email }, order: [['id', 'DESC']] });
    expect(row?.status).toBe('pending');

    await server.worker.runOnce();
    await row!.reload();
    expect(row!.status).toBe('pending');
    expect(row!.attempts).toBe(1);
    expect(row!.lastError).toBeTruthy();
    expect(row!.nextAttemptAt.getTime()).toBeGreaterThan(Date.now());

    await server.catcher.start();
    await new Promise((res) => setTimeout(res, 300)); // past the first back-off
    await drainOutbox(server);
    const mail = await server.catcher.waitFor((m) => m.to.includes(user.email));
    expect(mail.subject).toMatch(/reset your password/i);
    await row!.reload();
    expect(row!.status).toBe('sent');
    expect(row!.attempts).toBe(2);
    expect(row!.sentAt).toBeInstanceOf(Date);
  });

  it('when a password reset is asked for an unknown address, then the same answer and no mail', async () => {
    const before = await OutboxMail.count();
    const r = await new TestClient(server.url).post('/api/password-resets', { email: `nobody-${Date.now()}@test.faultline.test` });
    expect(r.status).toBe(202);
    expect(await OutboxMail.count()).toBe(before);
  });

  it('when the e-mailed reset link is used, then the new password works, the link is spent, and common passwords are refused', async () => {
    const user = await createUser('member');
    await new TestClient(server.url).post('/api/password-resets', { email: user.email });
    await drainOutbox(server);
    const mail = await server.catcher.waitFor((m) => m.to.includes(user.email) && /reset/i.test(m.subject));
    const token = mail.text.match(/reset-password\/([A-Za-z0-9_-]{43})/)![1];

    const c = new TestClient(server.url);
    const common = await c.post(`/api/password-resets/${token}`, { password: 'password123' });
    expect(common.status).toBe(400);
    expect(common.body.error.fields).toHaveProperty('password');
    const tooShort = await c.post(`/api/password-resets/${token}`, { password: 'short' });
    expect(tooShort.status).toBe(400);

    const long = 'a long passphrase about wafers and resist '.repeat(3);
    expect((await c.post(`/api/password-resets/${token}`, { password: long })).status).toBe(200);
    expect((await new TestClient(server.url).signIn(user.email, long)).status).toBe(200);
    expect((await c.post(`/api/password-resets/${token}`, { password: long + 'x' })).status).toBe(400);
  });

  it('when an admin invites a person, then the invitation goes out through the outbox', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const email = `invitee-${Date.now()}@test.faultline.test`;
    const r = await client.post('/api/users', { email, name: 'New Person', role: 'member' });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ email, role: 'member', invited: true });
    await drainOutbox(server);
    const mail = await server.catcher.waitFor((m) => m.to.includes(email));
    expect(mail.text).toMatch(/reset-password\//);
  });
});
