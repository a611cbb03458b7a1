import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import { drainOutbox, startTestServer, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { createUser, signedInClient, unique } from '../support/factories';
import { User } from '../../server/modules/users/user.model';
import { AccountMailRequest, PasswordReset } from '../../server/modules/auth/account-link.model';
import { SessionRow } from '../../server/modules/auth/session.model';
import { Throttle } from '../../server/lib/throttle.model';
import { OutboxMail } from '../../server/lib/outbox.model';

// Reset, invitation and sign-in links: single use under a race, one use voids the others, and
// asking for one costs the same whether or not the address has an account.

let server: TestServer;

beforeAll(async () => {
  // The queue runs only when a test asks, so a test can look at the state between the request
  // and the mail.
  server = await startTestServer({}, { accountMailQueue: false, outboxWorker: false });
});
afterAll(() => server.close());

/** The per-address limits on these requests outlive a run in the kept test database. */
const clearRequestLimits = () =>
  Throttle.destroy({ where: { key: { [Op.or]: [{ [Op.like]: 'rl:password-reset:%' }, { [Op.like]: 'rl:sign-in-link:%' }] } } });

const NEW_PASSWORD = 'a-brand-new-passphrase-42';

async function mailedResetToken(email: string) {
  await clearRequestLimits();
  expect((await new TestClient(server.url).post('/api/password-resets', { email })).status).toBe(202);
  await server.accountMail.runOnce();
  await drainOutbox(server);
  const rows = await OutboxMail.findAll({
    where: { toAddress: email, subject: { [Op.like]: '%reset your password%' } },
    order: [['id', 'DESC']],
    limit: 1,
  });
  return /\/reset-password\/([A-Za-z0-9_-]{43})/.exec(rows[0].textBody)![1];
}

describe('reset and invitation links', () => {
  it('when one reset link is used 10 times at once, then exactly one use answers 200 and sets the password', async () => {
    const user = await createUser();
    const token = await mailedResetToken(user.email);
    const answers = await Promise.all(
      Array.from({ length: 10 }, (_, i) =>
        new TestClient(server.url).post(`/api/password-resets/${token}`, { password: `${NEW_PASSWORD}-${i}` }),
      ),
    );
    const ok = answers.filter((a) => a.status === 200);
    expect(ok.length).toBe(1);
    expect(answers.filter((a) => a.status === 400).every((a) => a.body.error.code === 'reset_link_invalid')).toBe(true);
    expect(answers.filter((a) => a.status === 400).length).toBe(9);
    // The one password set is the one whose request won.
    const winner = answers.indexOf(ok[0]);
    expect((await new TestClient(server.url).signIn(user.email, `${NEW_PASSWORD}-${winner}`)).status).toBe(200);
  });

  it('when a newer reset link was used, then an older unused one is dead', async () => {
    const user = await createUser();
    const older = await mailedResetToken(user.email);
    const newer = await mailedResetToken(user.email);
    expect(older).not.toBe(newer);
    expect((await new TestClient(server.url).post(`/api/password-resets/${newer}`, { password: NEW_PASSWORD })).status).toBe(200);
    const r = await new TestClient(server.url).post(`/api/password-resets/${older}`, { password: 'another-new-passphrase-9' });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('reset_link_invalid');
    expect(await PasswordReset.count({ where: { userId: user.id, usedAt: null } })).toBe(0);
  });

  it('when the password is reset, then every session of the account ends', async () => {
    const { client, user } = await signedInClient(server.url, 'member');
    const token = await mailedResetToken(user.email);
    expect((await new TestClient(server.url).post(`/api/password-resets/${token}`, { password: NEW_PASSWORD })).status).toBe(200);
    expect(await SessionRow.count({ where: { userId: user.id } })).toBe(0);
    expect((await client.get('/api/session')).body.user).toBeNull();
  });

  it('when an invitation link is used 10 times at once, then exactly one use answers 200', async () => {
    const { client: admin } = await signedInClient(server.url, 'admin');
    const email = `${unique('invitee')}@test.faultline.test`;
    expect((await admin.post('/api/users', { email, name: 'Invited Person', role: 'member' })).status).toBe(201);
    await drainOutbox(server);
    const mail = await OutboxMail.findOne({ where: { toAddress: email } });
    const token = /\/reset-password\/([A-Za-z0-9_-]{43})/.exec(mail!.textBody)![1];
    const answers = await Promise.all(
      Array.from({ length: 10 }, () => new TestClient(server.url).post(`/api/password-resets/${token}`, { password: NEW_PASSWORD })),
    );
    expect(answers.filter((a) => a.status === 200).length).toBe(1);
    expect((await new TestClient(server.url).signIn(email, NEW_PASSWORD)).status).toBe(200);
  });
});

describe('asking for a link by e-mail', () => {
  /** Statements the database ran while `run` was waiting for its answer, with values blanked. */
  async function statementsDuring(run: () => Promise<unknown>) {
    const seen: string[] = [];
    const hook = (_options: unknown, query: { sql?: string }) => {
      if (query.sql) seen.push(query.sql.replace(/'(?:[^'\\]|\\.)*'/g, '?').replace(/\b\d+\b/g, '?'));
    };
    server.deps.sequelize.addHook('afterQuery', 'count-statements', hook as never);
    try {
      await run();
    } finally {
      server.deps.sequelize.removeHook('afterQuery', 'count-statements');
    }
    return seen;
  }

  it('when a known and an unknown address ask for a reset or a sign-in link, then the answers and the work done before answering are the same; only the known one gets mail, afterwards', async () => {
    const user = await createUser();
    const unknown = `${unique('nobody')}@test.faultline.test`;
    await clearRequestLimits();
    for (const path of ['/api/password-resets', '/api/sign-in-links']) {
      const known = new TestClient(server.url);
      const stranger = new TestClient(server.url);
      await known.refreshCsrf();
      await stranger.refreshCsrf();
      let a!: Awaited<ReturnType<TestClient['post']>>;
      let b!: Awaited<ReturnType<TestClient['post']>>;
      const knownWork = await statementsDuring(async () => (a = await known.post(path, { email: user.email })));
      const unknownWork = await statementsDuring(async () => (b = await stranger.post(path, { email: unknown })));
      expect(a.status).toBe(202);
      expect(b.status).toBe(202);
      expect(a.body).toEqual(b.body);
      const headersOf = (r: typeof a) => [...r.headers.keys()].filter((h) => h !== 'date' && h !== 'etag').sort();
      expect(headersOf(a)).toEqual(headersOf(b));
      expect(knownWork).toEqual(unknownWork);
      // Nothing looked the address up yet: the request is all there is.
      expect(knownWork.some((sql) => /FROM `users`/i.test(sql))).toBe(false);
      expect(await AccountMailRequest.count({ where: { email: user.email } })).toBe(1);
      expect(await AccountMailRequest.count({ where: { email: unknown } })).toBe(1);

      await server.accountMail.runOnce();
      expect(await AccountMailRequest.count({ where: { email: [user.email, unknown] } })).toBe(0);
      expect(await OutboxMail.count({ where: { toAddress: unknown } })).toBe(0);
    }
    expect(await OutboxMail.count({ where: { toAddress: user.email } })).toBe(2);
  });

  it('when an account asks for many links, then at most 3 of a kind are mailed per quarter hour', async () => {
    const user = await createUser();
    await clearRequestLimits();
    for (let i = 0; i < 5; i++)
      expect((await new TestClient(server.url).post('/api/sign-in-links', { email: user.email })).status).toBe(202);
    await server.accountMail.runOnce();
    expect(await PasswordReset.count({ where: { userId: user.id, purpose: 'sign_in' } })).toBe(3);
    await clearRequestLimits();
  });

  it('when an invited person without a password asks for a sign-in link, then none is made', async () => {
    const invitee = await User.create({
      email: `${unique('invitee')}@test.faultline.test`,
      name: 'Not Yet',
      role: 'member',
      passwordHash: null,
      lastSignInAt: null,
    });
    expect((await new TestClient(server.url).post('/api/sign-in-links', { email: invitee.email })).status).toBe(202);
    await server.accountMail.runOnce();
    expect(await PasswordReset.count({ where: { userId: invitee.id } })).toBe(0);
  });
});
