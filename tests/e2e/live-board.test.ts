import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { TestClient } from '../support/client';
import { createDisplayLink } from '../../server/modules/facility/display-links.service';
import { buildFacility, type BuiltTool } from './board-fixtures';
import { Area } from '../../server/modules/facility/facility.model';

// A state change reaches other browsers through the socket with its board entry: the board,
// the tool page and the lobby display show it without asking the API again.

let server: TestServer;
let browser: Browser;
let tools: Record<string, BuiltTool>;
let memberEmail: string;
let technician: TestClient;
let displayKey: string;
const contexts: BrowserContext[] = [];

beforeAll(async () => {
  const port = await freePort();
  server = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` }, { serveClient: true });
  browser = await launchBrowser();
  ({ tools } = await buildFacility(server.deps));
  memberEmail = (await createUser('member', { name: 'Ilse Varga-Moreau' })).email;
  const tech = await createUser('technician', { name: 'Tomasz Okafor' });
  technician = new TestClient(server.url);
  expect((await technician.signIn(tech.email, TEST_PASSWORD)).status).toBe(200);
  const admin = await createUser('admin');
  displayKey = (await createDisplayLink(server.deps, 'Lobby east', admin.id)).key;
});

afterAll(async () => {
  for (const c of contexts) await c.close();
  await browser?.close();
  await server?.close();
});

async function newPage(viewport: { width: number; height: number } = VIEWPORTS.desktop): Promise<Page> {
  const context = await browser.newContext({ viewport });
  contexts.push(context);
  // Fail with the locator's name rather than the test's timeout.
  context.setDefaultTimeout(10_000);
  return context.newPage();
}

/** Every request a page makes to the board or to this tool's page API, from now on. */
function countApiRequests(page: Page, toolCode: string) {
  const seen: string[] = [];
  page.on('request', (r) => {
    const path = new URL(r.url()).pathname;
    if (path === '/api/board' || path.startsWith(`/api/tools/by-code/${toolCode}`)) seen.push(`${r.method()} ${path}`);
  });
  return seen;
}

const live = (page: Page) => expect.poll(() => page.getByText('Live', { exact: true }).count(), { timeout: 10_000 }).toBeGreaterThan(0);

describe('live changes in the browser', () => {
  it('when a technician changes a state, then another browser’s board, tool page and lobby display show it without any request to the board or the tool’s API', async () => {
    const tool = tools['RTA-1'];
    const board = await newPage();
    await signInThroughPage(board, server.url, memberEmail, TEST_PASSWORD);
    await board.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    await board.goto(`${server.url}/board`);
    const toolPage = await board.context().newPage();
    await toolPage.goto(`${server.url}/tools/${tool.code}`);
    const display = await newPage(VIEWPORTS.desktop);
    // Other tests' tools share the database; ?areas= limits the screen to this tool's bay.
    const area = await Area.findByPk(tool.areaId);
    await display.goto(`${server.url}/display/${displayKey}?areas=${area!.code}`);

    const card = board.locator(`[data-testid="board-tool-${tool.code}"]`);
    const status = toolPage.locator('[data-testid="tool-status"] [data-status]').first();
    const row = display.locator(`[data-testid="display-tool-${tool.code}"]`);
    await expect.poll(() => card.getAttribute('data-status')).toBe('running');
    await expect.poll(() => status.getAttribute('data-status')).toBe('running');
    // The lobby lists only the tools that need attention; a running tool has no row yet.
    await expect.poll(() => display.locator('[data-testid^="display-tool-"]').count()).toBeGreaterThan(0);
    expect(await row.count()).toBe(0);
    await Promise.all([live(board), live(toolPage), live(display)]);

    const requests = [board, toolPage, display].map((p) => countApiRequests(p, tool.code));
    const r = await technician.post(`/api/tools/${tool.id}/state`, { state: 'unscheduled_downtime', note: 'Heater zone 3 open circuit' });
    expect(r.status).toBe(201);

    await expect.poll(() => card.getAttribute('data-status'), { timeout: 5000 }).toBe('down');
    await expect.poll(() => status.getAttribute('data-status'), { timeout: 5000 }).toBe('down');
    await expect.poll(() => row.getAttribute('data-status'), { timeout: 5000 }).toBe('down');
    await expect.poll(() => card.textContent()).toContain('Heater zone 3 open circuit');
    await expect.poll(() => toolPage.locator('[data-testid="tool-status"]').textContent()).toContain('Heater zone 3 open circuit');
    await expect.poll(() => toolPage.locator('[data-testid="tool-status"]').textContent()).toContain('Tomasz Okafor');
    // The board's counts moved with the entry (the summary counts every Down tool).
    await screenshot(board, 'live-board-after-change-desktop');
    await screenshot(toolPage, 'live-tool-page-after-change-desktop');
    await screenshot(display, 'live-display-after-change-desktop');
    expect(requests).toEqual([[], [], []]);
  });

  it('when the phone-width board gets a change, then it shows it too', async () => {
    const tool = tools['ALIGN-1'];
    const page = await newPage(VIEWPORTS.phone);
    await signInThroughPage(page, server.url, memberEmail, TEST_PASSWORD);
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    const suffix = tool.code.split('-').pop()!;
    await page.goto(`${server.url}/board?q=${suffix}`);
    const card = page.locator(`[data-testid="board-tool-${tool.code}"]`);
    await expect.poll(() => card.getAttribute('data-status')).toBe('running');
    await live(page);
    const requests = countApiRequests(page, tool.code);
    expect((await technician.post(`/api/tools/${tool.id}/state`, { state: 'engineering', note: 'Recipe trial' })).status).toBe(201);
    await expect.poll(() => card.getAttribute('data-status'), { timeout: 5000 }).toBe('engineering');
    await screenshot(page, 'live-board-after-change-phone');
    expect(requests).toEqual([]);
  });
});
