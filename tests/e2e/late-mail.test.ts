import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startTestServer, drainOutbox, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createUser, TEST_PASSWORD, unique } from '../support/factories';
import { OutboxMail } from '../../server/lib/outbox.model';
import { queueMail } from '../../server/lib/mailer';

let server: TestServer;
let browser: Browser;

beforeAll(async () => {
  // The worker is driven by hand, so the late mail stays late until the test resends it.
  server = await startTestServer({}, { serveClient: true, outboxWorker: false });
  browser = await launchBrowser();
  await drainOutbox(server);
});
afterAll(async () => {
  await browser?.close();
  await drainOutbox(server);
  await server?.close();
});

describe('late mail on the admin mail page', () => {
  it('when a mail has not gone out for over an hour, then the admin mail page warns, lists it with its last error, and "Send again now" delivers it', async () => {
    const admin = await createUser('admin');
    const to = `${unique('late-mail')}@test.faultline.test`;
    await queueMail({ to, subject: 'Tool LITHO-04 is down: exposure lamp failed', text: 'Invented demo message.' });
    const row = (await OutboxMail.findOne({ where: { toAddress: to } }))!;
    await server.deps.sequelize.query(
      `UPDATE outbox_mails SET created_at = :at, attempts = 14, last_error = :error, next_attempt_at = :next WHERE id = :id`,
      {
        replacements: {
          at: new Date(Date.now() - 3 * 3600_000),
          error: 'connect ECONNREFUSED 127.0.0.1:2525',
          next: new Date(Date.now() + 8 * 60_000),
          id: row.id,
        },
      },
    );

    for (const [name, viewport] of Object.entries(VIEWPORTS)) {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      await signInThroughPage(page, server.url, admin.email, TEST_PASSWORD);
      await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
      await page.goto(`${server.url}/admin/mail`);
      await page
        .getByText(/not been delivered for over an hour/)
        .first()
        .waitFor();
      await page.getByText('Tool LITHO-04 is down: exposure lamp failed').waitFor();
      expect(await page.getByText(/ECONNREFUSED/).count()).toBeGreaterThan(0);
      await screenshot(page, `late-mail-${name}`);
      if (name === 'phone') {
        await page
          .getByRole('button', { name: /Send .* again now/ })
          .first()
          .click();
        await page
          .getByRole('button', { name: /Queued|Send .* again now/ })
          .first()
          .waitFor();
        await expect.poll(async () => (await row.reload()).nextAttemptAt.getTime() <= Date.now()).toBe(true);
        await server.worker.runOnce();
        await server.catcher.waitFor((m) => m.to.includes(to));
        await page.reload();
        await page.getByRole('heading', { name: 'Caught mail' }).waitFor();
        // The heading shows before the lists load: wait for the caught row, not a count now.
        await page
          .getByRole('button', { name: /^Tool LITHO-04 is down: exposure lamp failed/ })
          .first()
          .waitFor();
        await page
          .getByText(/not been delivered for over an hour/)
          .first()
          .waitFor({ state: 'detached' });
      }
      await context.close();
    }
  });
});
