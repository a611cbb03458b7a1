import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, VIEWPORTS } from '../support/browser';
import { signedInClient } from '../support/factories';
import type { TestClient } from '../support/client';
import { changeState } from '../../server/modules/facility/state.service';
import { buildFacility, type BuiltTool } from './board-fixtures';

let server: TestServer;
let browser: Browser;
let tools: Record<string, BuiltTool>;
let areas: { code: string }[];
let admin: TestClient;
const contexts: BrowserContext[] = [];

beforeAll(async () => {
  const port = await freePort();
  server = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` }, { serveClient: true });
  browser = await launchBrowser();
  ({ tools, areas } = await buildFacility(server.deps));
  ({ client: admin } = await signedInClient(server.url, 'admin'));
});

afterAll(async () => {
  for (const c of contexts) await c.close();
  await browser?.close();
  await server?.close();
});

/** A browser with nobody signed in, as on the screen in the lobby. */
async function lobbyScreen(viewport: { width: number; height: number } = { width: 1920, height: 1080 }): Promise<Page> {
  const context = await browser.newContext({ viewport });
  contexts.push(context);
  return context.newPage();
}

async function newLink(name: string): Promise<{ id: number; key: string; url: string }> {
  const r = await admin.post('/api/admin/display-links', { name });
  expect(r.status).toBe(201);
  return r.body;
}

const row = (page: Page, code: string) => page.locator(`[data-testid="display-tool-${code}"]`);

describe('the lobby display', () => {
  it('when the display link is opened without signing in, then the board shows full screen and follows changes live', async () => {
    const link = await newLink('Gowning room entrance');
    const page = await lobbyScreen();
    await page.goto(`${server.url}/display/${link.key}`);
    await page.getByTestId('display-board').waitFor();
    expect(new URL(page.url()).pathname).toBe(`/display/${link.key}`);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Tool status');
    expect(await page.getByText('Gowning room entrance').count()).toBe(1);
    expect(await row(page, tools['LPCVD-3'].code).getAttribute('data-status')).toBe('down');
    // No controls: a lobby screen has nothing to press.
    expect(await page.locator('button, input, select, textarea').count()).toBe(0);

    await expect.poll(() => page.getByText('Live', { exact: true }).count(), { timeout: 5000 }).toBe(1);
    const tool = tools['RTA-1'];
    expect(await row(page, tool.code).count()).toBe(0);
    await changeState(server.deps, {
      toolId: tool.id,
      state: 'unscheduled_downtime',
      reason: 'repair',
      note: 'Lamp bank 2 does not fire',
      actorId: null,
    });
    await row(page, tool.code).waitFor();
    expect(await row(page, tool.code).textContent()).toContain('Lamp bank 2 does not fire');
  });

  it('takes screenshots of the lobby display at desktop and phone width (one screen per set of bays)', async () => {
    const link = await newLink('Corridor screen');
    const codes = areas.map((a) => a.code).join(',');
    for (const [name, viewport] of Object.entries(VIEWPORTS)) {
      const page = await lobbyScreen(viewport);
      // Other tests' tools share the database; ?areas= limits the screen to this file's bays.
      await page.goto(`${server.url}/display/${link.key}?areas=${codes}`);
      await row(page, tools['LPCVD-3'].code).waitFor();
      const shown = await page
        .locator('[data-testid^="display-tool-"]')
        .evaluateAll((els) => els.map((e) => e.getAttribute('data-testid')));
      expect(shown.every((id) => Object.values(tools).some((t) => id === `display-tool-${t.code}`))).toBe(true);
      expect(await page.getByTestId('display-count-down').textContent()).toBe('3');
      await screenshot(page, `display-${name}`);
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(viewport.width);
    }
  });

  it('when an admin revokes the link, then the open screen is cut off and shows that the link is no longer valid, and a fresh load is refused', async () => {
    const link = await newLink('To be revoked');
    const page = await lobbyScreen();
    await page.goto(`${server.url}/display/${link.key}`);
    await page.getByTestId('display-board').waitFor();
    await expect.poll(() => page.getByText('Live', { exact: true }).count(), { timeout: 5000 }).toBe(1);

    const revoked = await admin.delete(`/api/admin/display-links/${link.id}`);
    expect(revoked.status).toBe(200);
    await page.getByText('This display link is not valid any more').waitFor({ timeout: 5000 });
    expect(await page.getByTestId('display-board').count()).toBe(0);

    const again = await lobbyScreen();
    const refused = again.waitForResponse((r) => r.url().endsWith('/api/display-link'));
    await again.goto(`${server.url}/display/${link.key}`);
    const answer = await refused;
    expect(answer.status()).toBe(401);
    await again.getByText('This display link is not valid any more').waitFor();
    expect(await again.getByTestId('display-board').count()).toBe(0);
  });

  it('when a made-up key is opened, then the display refuses it', async () => {
    const page = await lobbyScreen(VIEWPORTS.phone);
    await page.goto(`${server.url}/display/${'x'.repeat(43)}`);
    await page.getByText('This display link is not valid any more').waitFor();
  });
});
