import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createUser, TEST_PASSWORD } from '../support/factories';

let server: TestServer;
let browser: Browser;

beforeAll(async () => {
  // Two free attempts and a long first wait: the third attempt is paused for minutes.
  server = await startTestServer({ SIGNIN_MAX_FAILURES_PER_ACCOUNT: '2', SIGNIN_DELAY_SECONDS: '300' }, { serveClient: true });
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('signing in by a mailed link while sign-in is paused', () => {
  for (const [size, viewport] of Object.entries(VIEWPORTS)) {
    it(`when someone has used up the attempts of an account, then its owner gets in by a mailed link (${size})`, async () => {
      const user = await createUser('technician', { name: 'Noor Link-Tester' });
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      for (const wrong of ['not-it-1', 'not-it-2']) {
        await signInThroughPage(page, server.url, user.email, wrong);
        await page.getByText('do not match an account').waitFor();
      }
      await signInThroughPage(page, server.url, user.email, TEST_PASSWORD);
      await page.getByText(/Too many sign-in attempts.*sign-in link/).waitFor();
      await screenshot(page, `sign-in-paused-${size}`);

      await page.getByRole('link', { name: 'E-mail me a sign-in link' }).click();
      await page.getByRole('heading', { name: 'Sign in by e-mail' }).waitFor();
      await page.getByLabel(/^E-mail address/).fill(user.email);
      await page.getByRole('button', { name: 'Send the link' }).click();
      await page.getByText('a sign-in link is on its way').waitFor();
      await screenshot(page, `sign-in-link-sent-${size}`);

      const mail = await server.catcher.waitFor((m) => m.to.includes(user.email) && /sign-in link/i.test(m.subject));
      const path = /\/sign-in-link\/[A-Za-z0-9_-]{43}/.exec(mail.text)![0];
      await page.goto(`${server.url}${path}`);
      await page.getByRole('button', { name: 'Sign me in' }).waitFor();
      await screenshot(page, `sign-in-link-confirm-${size}`);
      await page.getByRole('button', { name: 'Sign me in' }).click();
      await page.getByTestId('home-technician').waitFor({ timeout: 10_000 });

      // The link worked once; opened again, it says so and offers a new one.
      await page.goto(`${server.url}${path}`);
      await page.getByRole('button', { name: 'Sign me in' }).click();
      await page.getByText('This link no longer works').waitFor();
      expect(await page.getByRole('link', { name: 'Get a new link' }).count()).toBe(1);
      await screenshot(page, `sign-in-link-used-${size}`);
      await context.close();
    });
  }
});
