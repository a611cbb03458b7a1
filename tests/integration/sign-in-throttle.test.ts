import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { drainOutbox, startTestServer, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { createUser, TEST_PASSWORD, unique } from '../support/factories';
import { pruneThrottles } from '../../server/modules/auth/sign-in-throttle';

// Sign-in throttling: attempts are counted before the password is checked, per account from
// one address, per account, and per address, with growing delays instead of a flat lockout.

let server: TestServer;
const lines: Record<string, any>[] = [];
const FREE = 3;
const DELAY_SECONDS = 30;

beforeAll(async () => {
  const destination = { write: (chunk: string) => void lines.push(JSON.parse(chunk)) };
  // Behind a trusted proxy on loopback, each test can speak from addresses of its own.
  server = await startTestServer(
    {
      LOG_LEVEL: 'info',
      SIGNIN_MAX_FAILURES_PER_ACCOUNT: String(FREE),
      SIGNIN_MAX_FAILURES_PER_ACCOUNT_TOTAL: '8',
      SIGNIN_DELAY_SECONDS: String(DELAY_SECONDS),
      TRUST_PROXY: 'loopback',
    },
    { logDestination: destination, accountMailQueue: false },
  );
});
afterAll(() => server.close());

let lastOctet = 0;
/** Another documentation-range address (RFC 5737), sent as X-Forwarded-For. */
const newAddress = () => `192.0.2.${(lastOctet = (lastOctet % 250) + 1)}`;
const clientFrom = (address: string) => new TestClient(server.url, { 'x-forwarded-for': address });

/** Password checks made for an e-mail: each check ends in exactly one failed or succeeded line. */
function passwordChecks(email: string, userId: number) {
  return lines.filter(
    (l) =>
      (l.security === 'sign_in_failed' && l.email === email) ||
      (l.security === 'sign_in_succeeded' && l.userId === userId && l.method === 'password'),
  ).length;
}

/** "Time passes" for every counter of the account: the wait is over now. */
async function endWaits() {
  await server.deps.sequelize.query('UPDATE sign_in_throttles SET next_allowed_at = NULL WHERE next_allowed_at IS NOT NULL');
}

async function clearAddress(address: string) {
  await server.deps.sequelize.query('DELETE FROM sign_in_throttles WHERE `key` LIKE :k', { replacements: { k: `%${address}` } });
}

describe('sign-in throttling', () => {
  it('when 200 wrong-then-right guesses arrive at once, then at most the free number of passwords is checked and the attacker never gets in past the limit', async () => {
    const user = await createUser();
    const address = newAddress();
    await clearAddress(address);
    const attacker = clientFrom(address);
    await attacker.refreshCsrf();
    const guesses = [...Array.from({ length: 199 }, (_, i) => `wrong-guess-${i}`), TEST_PASSWORD];
    const answers = await Promise.all(guesses.map((password) => attacker.request('POST', '/api/session', { email: user.email, password })));

    const checks = passwordChecks(user.email, user.id);
    expect(checks).toBeLessThanOrEqual(FREE);
    const statuses = answers.map((a) => a.status);
    expect(statuses.filter((s) => s === 429).length).toBeGreaterThanOrEqual(200 - FREE);
    // The right password got in only if it was among the attempts that were checked at all.
    const rightAnswer = answers[answers.length - 1];
    if (rightAnswer.status === 200) expect(checks).toBeLessThanOrEqual(FREE);
    else expect(rightAnswer.status).toBe(429);
    expect(statuses.filter((s) => s === 200).length).toBeLessThanOrEqual(1);
  });

  it('when an account fails the free number of times from one address, then the next attempt waits, and each wait after that is longer', async () => {
    const user = await createUser();
    const address = newAddress();
    await clearAddress(address);
    const client = clientFrom(address);
    for (let i = 0; i < FREE; i++) expect((await client.signIn(user.email, `wrong-${i}`)).status).toBe(401);
    const first = await client.signIn(user.email, TEST_PASSWORD);
    expect(first.status).toBe(429);
    expect(first.body.error.code).toBe('rate_limited');
    expect(first.body.error.message).toMatch(/sign-in link/);
    const firstWait = Number(first.headers.get('retry-after'));
    expect(firstWait).toBeGreaterThan(0);
    expect(firstWait).toBeLessThanOrEqual(DELAY_SECONDS);

    // The wait is over: one more attempt is checked; being wrong, it doubles the next wait.
    await endWaits();
    expect((await client.signIn(user.email, 'wrong-again')).status).toBe(401);
    const second = await client.signIn(user.email, TEST_PASSWORD);
    expect(second.status).toBe(429);
    expect(Number(second.headers.get('retry-after'))).toBeGreaterThan(DELAY_SECONDS);
    expect(Number(second.headers.get('retry-after'))).toBeLessThanOrEqual(2 * DELAY_SECONDS);

    // After the wait the real user signs in, and the account's counters start over.
    await endWaits();
    expect((await client.signIn(user.email, TEST_PASSWORD)).status).toBe(200);
    for (let i = 0; i < FREE; i++) expect((await clientFrom(address).signIn(user.email, `wrong-later-${i}`)).status).toBe(401);
  });

  it('when someone else fails an account from their address, then the owner at another address still signs in', async () => {
    const user = await createUser('admin');
    const attacker = clientFrom(newAddress());
    for (let i = 0; i < FREE; i++) await attacker.signIn(user.email, `wrong-${i}`);
    expect((await attacker.signIn(user.email, `wrong-more`)).status).toBe(429);
    expect((await clientFrom(newAddress()).signIn(user.email, TEST_PASSWORD)).status).toBe(200);
  });

  it('when many addresses together exhaust an account, then the owner gets in by a mailed sign-in link, once, and the counters start over', async () => {
    const user = await createUser('admin');
    // 8 attempts from anywhere are free for one account; these come from 4 addresses.
    for (let i = 0; i < 8; i++) expect((await clientFrom(newAddress()).signIn(user.email, `spread-${i}`)).status).toBe(401);
    const owner = clientFrom(newAddress());
    expect((await owner.signIn(user.email, TEST_PASSWORD)).status).toBe(429);

    const asked = await owner.post('/api/sign-in-links', { email: user.email });
    expect(asked.status).toBe(202);
    await server.accountMail.runOnce();
    await drainOutbox(server);
    const mail = await server.catcher.waitFor((m) => m.to.includes(user.email) && /sign-in link/i.test(m.subject));
    const token = /\/sign-in-link\/([A-Za-z0-9_-]{43})/.exec(mail.text)![1];

    const used = await owner.post(`/api/sign-in-links/${token}`);
    expect(used.status).toBe(200);
    expect(used.body.user.id).toBe(user.id);
    owner.csrfToken = used.body.csrfToken;
    expect((await owner.get('/api/users')).status).toBe(200);
    // Single use.
    const again = await clientFrom(newAddress()).post(`/api/sign-in-links/${token}`);
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('sign_in_link_invalid');
    // The account's counters started over: the password works again from anywhere.
    expect((await clientFrom(newAddress()).signIn(user.email, TEST_PASSWORD)).status).toBe(200);
    expect(lines.some((l) => l.security === 'sign_in_succeeded' && l.userId === user.id && l.method === 'mailed_link')).toBe(true);
  });

  it('when a mailed sign-in link is older than 15 minutes, then it does not sign in', async () => {
    const user = await createUser();
    const client = clientFrom(newAddress());
    await client.post('/api/sign-in-links', { email: user.email });
    await server.accountMail.runOnce();
    await drainOutbox(server);
    const mail = await server.catcher.waitFor((m) => m.to.includes(user.email) && /sign-in link/i.test(m.subject));
    const token = /\/sign-in-link\/([A-Za-z0-9_-]{43})/.exec(mail.text)![1];
    await server.deps.sequelize.query(
      `UPDATE password_resets SET expires_at = NOW(3) - INTERVAL 1 SECOND WHERE user_id = :id AND purpose = 'sign_in'`,
      { replacements: { id: user.id } },
    );
    expect((await client.post(`/api/sign-in-links/${token}`)).status).toBe(400);
  });

  it('when one address fails across many accounts, then it waits too', async () => {
    const s = await startTestServer({ SIGNIN_MAX_FAILURES_PER_ADDRESS: '4', TRUST_PROXY: 'loopback' });
    try {
      const address = newAddress();
      await clearAddress(address);
      const client = new TestClient(s.url, { 'x-forwarded-for': address });
      for (let i = 0; i < 4; i++) expect((await client.signIn(`${unique('probe')}@test.faultline.test`, 'guess-guess')).status).toBe(401);
      expect((await client.signIn(`${unique('probe')}@test.faultline.test`, 'guess-guess')).status).toBe(429);
    } finally {
      await s.close();
    }
  });

  it('when counters are over their window and wait, then pruning deletes them and keeps those still counting or waiting', async () => {
    const q = (sql: string) => server.deps.sequelize.query(sql);
    const tag = unique('prune');
    await q(`INSERT INTO sign_in_throttles (\`key\`, attempts, window_started_at, next_allowed_at) VALUES
      ('old:${tag}', 4, NOW(3) - INTERVAL 2 HOUR, NULL),
      ('waiting:${tag}', 9, NOW(3) - INTERVAL 2 HOUR, NOW(3) + INTERVAL 5 MINUTE),
      ('counting:${tag}', 2, NOW(3) - INTERVAL 1 MINUTE, NULL)`);
    await pruneThrottles(server.deps.sequelize, server.config);
    const left = await server.deps.sequelize.query<{ key: string }>(
      'SELECT `key` FROM sign_in_throttles WHERE `key` LIKE :k ORDER BY `key`',
      { type: QueryTypes.SELECT, replacements: { k: `%:${tag}` } },
    );
    expect(left.map((r) => r.key)).toEqual([`counting:${tag}`, `waiting:${tag}`]);
  });

  it('when counters are stored, then they hold no e-mail address in clear', async () => {
    const user = await createUser();
    await clientFrom(newAddress()).signIn(user.email, 'wrong');
    const rows = await server.deps.sequelize.query<{ key: string }>('SELECT `key` FROM sign_in_throttles WHERE `key` LIKE :k', {
      type: QueryTypes.SELECT,
      replacements: { k: `%${user.email}%` },
    });
    expect(rows).toEqual([]);
  });
});
