import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { makeTool } from '../integration/facility-fixtures';

// The browser half of web push that can run without the internet: the service worker is
// served from the site root and registers for the whole app, and a follower is offered
// phone notifications next to "Follow". (Subscribing needs the browser's own push service,
// which is not reachable here; the server half is tested in tests/integration/push.test.ts.)

let server: TestServer;
let browser: Browser;

beforeAll(async () => {
  const port = await freePort();
  server = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` }, { serveClient: true });
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('phone notifications in the browser', () => {
  it('when a member follows a tool, then "Notify this device too" is offered and the service worker registers for the whole app', async () => {
    const { tool } = await makeTool(server.deps.sequelize, { name: 'Push browser test evaporator' });
    const member = await createUser('member');
    for (const [name, viewport] of Object.entries(VIEWPORTS)) {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      await signInThroughPage(page, server.url, member.email, TEST_PASSWORD);
      await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
      await page.goto(`${server.url}/tools/${tool.code}`);
      const follow = page.getByRole('button', { name: /Follow this tool|Stop following/ });
      await expect.poll(() => follow.count()).toBe(1);
      if ((await follow.textContent())?.includes('Follow this tool')) await follow.click();
      await expect.poll(() => page.getByRole('button', { name: 'Notify this device too' }).count()).toBe(1);

      const scope = await page.evaluate(async () => {
        const registration = await navigator.serviceWorker.register('/service-worker.js', { scope: '/' });
        await navigator.serviceWorker.ready;
        return registration.scope;
      });
      expect(scope).toBe(`${server.url}/`);
      await screenshot(page, `push-toggle-${name}`);
      await context.close();
    }
    const sw = await fetch(`${server.url}/service-worker.js`);
    expect(sw.headers.get('content-type')).toMatch(/javascript/);
    expect(await sw.text()).toContain('showNotification');
  });
});
