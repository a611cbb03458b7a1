import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { changeState } from '../../server/modules/facility/state.service';
import { buildFacility, type BuiltTool } from './board-fixtures';

let server: TestServer;
let browser: Browser;
let tools: Record<string, BuiltTool>;
let technicianEmail: string;
let memberEmail: string;
const contexts: BrowserContext[] = [];

beforeAll(async () => {
  const port = await freePort();
  server = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` }, { serveClient: true });
  browser = await launchBrowser();
  ({ tools } = await buildFacility(server.deps));
  technicianEmail = (await createUser('technician', { name: 'Mira Castellanos' })).email;
  memberEmail = (await createUser('member', { name: 'Oskar Lindqvist-Adeyemi' })).email;
});

afterAll(async () => {
  for (const c of contexts) await c.close();
  await browser?.close();
  await server?.close();
});

async function signedInPage(email: string, viewport: { width: number; height: number } = VIEWPORTS.desktop): Promise<Page> {
  const context = await browser.newContext({ viewport });
  contexts.push(context);
  const page = await context.newPage();
  await signInThroughPage(page, server.url, email, TEST_PASSWORD);
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  return page;
}

const card = (page: Page, code: string) => page.locator(`[data-testid="board-tool-${code}"]`);

describe('the status board in the browser', () => {
  it('when a technician changes a tool’s state in one browser, then another browser’s board shows it without a reload', async () => {
    const tool = tools['RTA-1'];
    const watcher = await signedInPage(memberEmail);
    await watcher.goto(`${server.url}/board`);
    await expect.poll(() => card(watcher, tool.code).getAttribute('data-status')).toBe('running');
    // A marker that a reload would wipe out.
    await watcher.evaluate(() => ((window as unknown as { stillHere: boolean }).stillHere = true));
    await expect.poll(() => watcher.getByText('Live', { exact: true }).count(), { timeout: 5000 }).toBeGreaterThan(0);

    const tech = await signedInPage(technicianEmail);
    await tech.goto(`${server.url}/tools/${tool.code}`);
    await tech.getByRole('radio', { name: /Unscheduled downtime/ }).check();
    await tech.getByLabel(/What people should know/).fill('Lamp bank 2 does not fire');
    const answered = tech.waitForResponse((r) => r.url().endsWith(`/api/tools/${tool.id}/state`) && r.request().method() === 'POST');
    await tech.getByRole('button', { name: 'Set state' }).click();
    expect((await answered).status()).toBe(201);

    await card(watcher, tool.code).and(watcher.locator('[data-status="down"]')).waitFor();
    await expect.poll(() => card(watcher, tool.code).textContent()).toContain('Lamp bank 2 does not fire');
    expect(await watcher.evaluate(() => (window as unknown as { stillHere?: boolean }).stillHere)).toBe(true);
    await expect.poll(() => tech.getByText(/is now unscheduled downtime/).count()).toBe(1);
  });

  it('when the socket drops and a change happens meanwhile, then the board catches up after reconnecting', async () => {
    const tool = tools['ALIGN-1'];
    const watcher = await signedInPage(memberEmail);
    await watcher.goto(`${server.url}/board`);
    await expect.poll(() => card(watcher, tool.code).getAttribute('data-status')).toBe('running');
    await expect.poll(() => watcher.getByText('Live', { exact: true }).count(), { timeout: 5000 }).toBeGreaterThan(0);

    // Cut every socket's transport (as a network blip would) and change the tool while it is down.
    for (const socket of server.io.sockets.sockets.values()) socket.conn.close();
    await changeState(server.deps, {
      toolId: tool.id,
      state: 'scheduled_downtime',
      reason: 'preventive_maintenance',
      note: 'Lamp hours check',
      actorId: null,
    });

    await card(watcher, tool.code).and(watcher.locator('[data-status="maintenance"]')).waitFor({ timeout: 10_000 });
  });

  it('when the board is searched and filtered, then only matching tools show, and each state reads by shape and word as well as colour', async () => {
    const page = await signedInPage(memberEmail);
    await page.goto(`${server.url}/board`);
    await card(page, tools['LPCVD-3'].code).waitFor();
    await page.getByLabel('Search tools').fill(tools['LPCVD-3'].code.toLowerCase());
    await expect.poll(() => page.locator('[data-testid^="board-tool-"]').count(), { timeout: 5000 }).toBe(1);
    await page.getByLabel('Search tools').fill('');
    await page.getByRole('button', { name: /tools Limited/ }).click();
    const statuses = () =>
      page.locator('[data-testid^="board-tool-"]').evaluateAll((els) => [...new Set(els.map((e) => e.getAttribute('data-status')))]);
    await expect.poll(statuses, { timeout: 5000 }).toEqual(['limited']);
    expect(await page.locator('[data-testid^="board-tool-"]').count()).toBeGreaterThanOrEqual(2);
    // Every badge carries its word and a shape, so it never rests on colour alone.
    const badge = page.locator(`[data-testid="board-tool-${tools['ASH-1'].code}"] .state-badge`);
    expect(await badge.textContent()).toContain('Limited');
    expect(await badge.locator('svg path, svg circle').count()).toBe(1);
  });

  it('takes screenshots of the board and a tool page at desktop and phone width', async () => {
    for (const [name, viewport] of Object.entries(VIEWPORTS)) {
      const member = await signedInPage(memberEmail, viewport);
      // Other tests' tools share the database: the search narrows the picture to this file's facility.
      const suffix = tools['LPCVD-3'].code.split('-').pop()!;
      await member.goto(`${server.url}/board?q=${suffix}`);
      await card(member, tools['LPCVD-3'].code).waitFor();
      await screenshot(member, `board-${name}`);
      expect(await member.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(viewport.width);

      const tech = await signedInPage(technicianEmail, viewport);
      await tech.goto(`${server.url}/tools/${tools['TRACK-A'].code}`);
      await tech.getByTestId('tool-status').waitFor();
      // The history is folded, automatic changes collapsed, until asked for.
      await tech.getByTestId('state-history').locator('summary').click();
      await tech.getByLabel(/Show automatic changes/).check();
      await tech.getByTestId('history-entry').first().waitFor();
      expect(await tech.getByTestId('report-fault').getAttribute('href')).toBe(`/report?tool=${tools['TRACK-A'].code}`);
      await screenshot(tech, `tool-page-${name}`);
      // Nothing sticks out sideways on a phone.
      expect(await tech.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(viewport.width);
    }
  });

  it('when the amber-room scheme is on, then every state still reads by shape, border and word (screenshot)', async () => {
    const page = await signedInPage(memberEmail);
    await page.evaluate(() => localStorage.setItem('faultline.amber-room', 'true'));
    const suffix = tools['LPCVD-3'].code.split('-').pop()!;
    await page.goto(`${server.url}/board?q=${suffix}`);
    await card(page, tools['LPCVD-3'].code).waitFor();
    expect(await page.evaluate(() => document.documentElement.getAttribute('data-amber-room'))).toBe('true');
    // Without colour, the badges differ by their words and shapes.
    const words = await page.locator('[data-testid^="board-tool-"] .state-badge').allTextContents();
    expect(new Set(words.map((w) => w.trim()))).toEqual(new Set(['Running', 'Limited', 'Down', 'Maintenance', 'Engineering', 'Offline']));
    await screenshot(page, 'board-amber-desktop');
  });

  it('when a tool page is opened, then it shows state, modules, availability, history and a Report a fault link', async () => {
    const page = await signedInPage(memberEmail, VIEWPORTS.phone);
    await page.goto(`${server.url}/tools/${tools['ICP-1'].code}`);
    await page.getByTestId('tool-status').waitFor();
    expect(await page.getByTestId('tool-status').textContent()).toContain('Maintenance');
    expect(await page.getByTestId('availability').textContent()).toMatch(/^\d+\.\d %$/);
    await page.getByTestId('state-history').locator('summary').click();
    await page.getByLabel(/Show automatic changes/).check();
    await expect.poll(() => page.getByTestId('history-entry').count()).toBe(2);
    // Members follow tools but never see the state form.
    expect(await page.getByRole('button', { name: 'Set state' }).count()).toBe(0);
    await page.getByRole('button', { name: 'Follow this tool' }).click();
    await page.getByRole('button', { name: 'Stop following' }).waitFor();
  });
});
