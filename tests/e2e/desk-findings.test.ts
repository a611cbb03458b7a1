import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createTool, drainOutbox, fileReport } from '../integration/tickets-fixtures';
import { TestClient } from '../support/client';

// What people at the tools and at the desk ran into, checked in Chromium at phone and desktop
// width.

let server: TestServer;
let browser: Browser;
const contexts: BrowserContext[] = [];

beforeAll(async () => {
  const port = await freePort();
  server = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` }, { serveClient: true });
  browser = await launchBrowser();
});
afterAll(async () => {
  for (const c of contexts) await c.close().catch(() => undefined);
  await browser?.close();
  if (server) await drainOutbox(server);
  await server?.close();
});

async function signedInPage(email: string, viewport: { width: number; height: number }) {
  const context = await browser.newContext({ viewport });
  contexts.push(context);
  const page = await context.newPage();
  await signInThroughPage(page, server.url, email, TEST_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
  return { context, page };
}

async function memberClient() {
  const user = await createUser('member');
  const client = new TestClient(server.url);
  await client.signIn(user.email, TEST_PASSWORD);
  return { user, client };
}

describe('a report opened without a tool', () => {
  it('when the form is opened from the menu, then no tool is chosen and "Change tool" does not pick one again', async () => {
    const member = await createUser('member');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Plasma asher (e2e)' });
    const { page } = await signedInPage(member.email, VIEWPORTS.phone);
    await page.goto(`${server.url}/report`);
    await page.getByRole('list', { name: 'Matching tools' }).waitFor();
    // Give a wrongly chosen tool every chance to appear.
    await page.waitForTimeout(1200);
    expect(await page.getByTestId('chosen-tool').count()).toBe(0);
    expect(await page.getByLabel(/^Which tool\?/).isVisible()).toBe(true);
    await screenshot(page, 'report-no-tool-phone');

    await page.getByLabel(/^Which tool\?/).fill(tool.code);
    await page.getByRole('list', { name: 'Matching tools' }).getByRole('button').filter({ hasText: tool.code }).click();
    await page.getByTestId('chosen-tool').waitFor();
    await page.getByRole('button', { name: 'Change tool' }).click();
    await page.waitForTimeout(1200);
    expect(await page.getByTestId('chosen-tool').count()).toBe(0);
  });
});

describe('marking a ticket fixed in the browser', () => {
  it('when a technician opens "Mark fixed", then "return to service" is not ticked and the wafer outcomes are empty', async () => {
    const tech = await createUser('technician');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Anneal furnace (e2e)' });
    const { client } = await memberClient();
    const t = await fileReport(client, tool.id, { impact: 'tool_stopped', wafersCount: 4 });
    const { page } = await signedInPage(tech.email, VIEWPORTS.desktop);
    await page.goto(`${server.url}/tickets/${t.id}`);
    await page.getByTestId('ticket-view').waitFor();
    await page.getByRole('button', { name: 'Mark fixed', exact: true }).first().click();
    const form = page.getByRole('form', { name: 'Mark fixed' });
    expect(await form.getByLabel(/Return the tool to service now/).isChecked()).toBe(false);
    expect(await form.getByLabel(/^Wafers recovered/).inputValue()).toBe('');
    expect(await form.getByLabel(/^Wafers returned/).inputValue()).toBe('');
    await screenshot(page, 'ticket-fix-defaults-desktop');
  });
});
