import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, drainOutbox, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { createUser, signedInClient } from '../support/factories';
import { Op } from 'sequelize';
import { OutboxMail } from '../../server/lib/outbox.model';
import { Throttle } from '../../server/lib/throttle.model';
import { Notice } from '../../server/modules/notices/notice.model';
import { createTransport, OutboxWorker, queueMail } from '../../server/lib/mailer';

let server: TestServer;
beforeAll(async () => {
  // Worker and account-mail queue driven by hand (runOnce) so the test controls the timing; short back-off.
  server = await startTestServer({ OUTBOX_BASE_BACKOFF_MS: '200' }, { outboxWorker: false, accountMailQueue: false });
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
    // The request is answered first; the reset mail is written just after.
    await server.accountMail.runOnce();
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
    await server.accountMail.runOnce();
    expect(await OutboxMail.count()).toBe(before);
  });

  it('when the e-mailed reset link is used, then the new password works, the link is spent, and common passwords are refused', async () => {
    const user = await createUser('member');
    await new TestClient(server.url).post('/api/password-resets', { email: user.email });
    await server.accountMail.runOnce();
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

const address = (what: string) => `${what}-${Date.now()}-${Math.random().toString(36).slice(2, 7)}@test.faultline.test`;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** A second worker on the same outbox, as another server process would run one. */
function otherWorker(opts: { leaseMs: number; delayMs?: number }) {
  const real = createTransport(server.config);
  const transport = opts.delayMs
    ? ({ sendMail: async (m: unknown) => (await sleep(opts.delayMs!), real.sendMail(m as never)) } as unknown as typeof real)
    : real;
  return new OutboxWorker(transport, server.config, server.deps.log, { pollMs: 60_000, leaseMs: opts.leaseMs });
}

describe('mail delivery at least once', () => {
  it('when a mail is sent again after a crash between sending it and recording it, then the copy carries the same Message-ID', async () => {
    const to = address('repeat');
    await queueMail({ to, subject: 'Repeated notice', text: 'Sent twice on purpose.' });
    await drainOutbox(server);
    const first = await server.catcher.waitFor((m) => m.to.includes(to));
    expect(first.messageId).toMatch(/^<outbox\.\d+\.[0-9a-z]+@[A-Za-z0-9.-]+>$/);

    // What a kill -9 between the SMTP answer and the status update leaves behind.
    const row = (await OutboxMail.findOne({ where: { toAddress: to } }))!;
    await row.update({ status: 'pending', sentAt: null, nextAttemptAt: new Date() });
    await drainOutbox(server);
    await expect.poll(() => server.catcher.messages.filter((m) => m.to.includes(to)).length).toBe(2);
    const copies = server.catcher.messages.filter((m) => m.to.includes(to));
    expect(new Set(copies.map((m) => m.messageId))).toEqual(new Set([first.messageId]));
  });

  it('when the worker that claimed mail dies, then another worker sends it once the short lease has run out; a live worker keeps its claim by heartbeat', async () => {
    await drainOutbox(server);
    const lost = address('claimed-by-dead-worker');
    await queueMail({ to: lost, subject: 'Claimed, then the worker died', text: '…' });
    const dead = otherWorker({ leaseMs: 600 });
    const claimed = await dead.claim();
    expect(claimed.map((m) => m.toAddress)).toContain(lost);
    // Within the lease nobody else takes it …
    const rescuer = otherWorker({ leaseMs: 600 });
    await rescuer.runOnce();
    expect(server.catcher.messages.some((m) => m.to.includes(lost))).toBe(false);
    // … after it, the next pass does.
    await sleep(700);
    await rescuer.runOnce();
    await server.catcher.waitFor((m) => m.to.includes(lost), 3000);
    expect((await OutboxMail.findOne({ where: { toAddress: lost } }))!.status).toBe('sent');

    // A slow but live worker renews its lease while it sends, so the mail goes out once.
    const slowTo = [address('slow-a'), address('slow-b')];
    for (const to of slowTo) await queueMail({ to, subject: 'Sent by a slow worker', text: '…' });
    const slow = otherWorker({ leaseMs: 300, delayMs: 500 });
    const busy = slow.runOnce();
    for (let i = 0; i < 4; i++) {
      await sleep(250);
      await rescuer.runOnce();
    }
    expect(await busy).toBe(2);
    await sleep(200);
    for (const to of slowTo) expect(server.catcher.messages.filter((m) => m.to.includes(to))).toHaveLength(1);
  });

  it('when mail has failed for over an hour, then it is still retried, admins get one in-app warning, the admin mail page lists it, and resend delivers it', async () => {
    await drainOutbox(server);
    const { client: admin, user: adminUser } = await signedInClient(server.url, 'admin');
    const to = address('late');
    await queueMail({ to, subject: 'Stuck behind a broken relay', text: '…' });
    const row = (await OutboxMail.findOne({ where: { toAddress: to } }))!;
    // Queued two hours ago, already tried many times (past the old give-up count of 60).
    await server.deps.sequelize.query(`UPDATE outbox_mails SET created_at = :at, attempts = 75 WHERE id = :id`, {
      replacements: { at: new Date(Date.now() - 2 * 3600_000), id: row.id },
    });

    await server.catcher.stop();
    try {
      await server.worker.runOnce();
      await row.reload();
      expect(row.status).toBe('pending');
      expect(row.attempts).toBe(76);
      // The back-off stays capped at ten minutes, however many attempts failed.
      expect(row.nextAttemptAt.getTime() - Date.now()).toBeLessThanOrEqual(10 * 60_000);
      await server.worker.runOnce();

      const warnings = await Notice.findAll({ where: { userId: adminUser.id, kind: 'mail.late' } });
      expect(warnings).toHaveLength(1);
      expect(warnings[0].link).toBe('/admin/mail');
      expect((await admin.get('/api/notices?unread=true')).body.items.some((n: { kind: string }) => n.kind === 'mail.late')).toBe(true);

      const late = await admin.get('/api/mail/late');
      expect(late.status).toBe(200);
      const listed = late.body.items.find((m: { id: number }) => m.id === Number(row.id));
      expect(listed).toMatchObject({ to, subject: 'Stuck behind a broken relay', attempts: 76 });
      expect(listed.lastError).toBeTruthy();
      const { client: member } = await signedInClient(server.url, 'member');
      expect((await member.get('/api/mail/late')).status).toBe(403);
    } finally {
      await server.catcher.start();
    }

    const resent = await admin.post(`/api/mail/${row.id}/resend`);
    expect(resent.status).toBe(200);
    expect(new Date(resent.body.nextAttemptAt).getTime()).toBeLessThanOrEqual(Date.now());
    await server.worker.runOnce();
    await server.catcher.waitFor((m) => m.to.includes(to));
    expect((await admin.get('/api/mail/late')).body.items.some((m: { id: number }) => m.id === Number(row.id))).toBe(false);
    expect((await admin.post(`/api/mail/${row.id}/resend`)).status).toBe(409);
  });
});
