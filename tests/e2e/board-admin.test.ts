import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createUser, TEST_PASSWORD, unique } from '../support/factories';
import { Area, DisplayLink, Tool, ToolModule } from '../../server/modules/facility/facility.model';

// The admin pages that feed the board: tools and areas, and lobby display links.

let server: TestServer;
let browser: Browser;
let page: Page;
let area: Area;

beforeAll(async () => {
  const port = await freePort();
  server = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` }, { serveClient: true });
  browser = await launchBrowser();
  area = await Area.create({
    name: unique('Thin-film bay'),
    code: unique('TF')
      .toUpperCase()
      .replace(/[^A-Z0-9-]/g, '')
      .slice(0, 20),
    description: null,
    sortOrder: -200,
    retiredAt: null,
  });
  await createUser('technician', { name: 'Hedda Marangoni' });
  const admin = await createUser('admin', { name: 'Yusuf Brennecke' });
  const context = await browser.newContext({ viewport: VIEWPORTS.desktop });
  page = await context.newPage();
  await signInThroughPage(page, server.url, admin.email, TEST_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
});

afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('facility admin pages', () => {
  it('when an admin adds a tool with a module through the form, then it is saved, starts Running and shows on the board', async () => {
    const code = unique('SPUT').toUpperCase().slice(0, 14);
    await page.goto(`${server.url}/admin/facility`);
    await page.getByRole('button', { name: 'Add a tool' }).click();
    const form = page.getByRole('form', { name: 'New tool' });
    await form.getByLabel(/^Name/).fill('Sputter cluster');
    await form.getByLabel(/^Code/).fill(code.toLowerCase());
    await form.getByLabel('Area').selectOption(String(area.id));
    await form.getByLabel('Primary engineer').selectOption({ label: 'Hedda Marangoni' });
    await form.getByRole('button', { name: 'Add a module' }).click();
    await form.getByLabel('Module 1 name').fill('Magnetron chamber 1');
    await form.getByLabel('Code', { exact: true }).last().fill('pm1');
    await screenshot(page, 'admin-tool-form-desktop');
    await form.getByRole('button', { name: 'Add tool' }).click();
    await page.getByText(`Added Sputter cluster (${code})`).waitFor();

    const tool = await Tool.findOne({ where: { code } });
    expect(tool).toMatchObject({ name: 'Sputter cluster', areaId: area.id });
    expect((await ToolModule.findAll({ where: { toolId: tool!.id } })).map((m) => m.code)).toEqual(['PM1']);

    await page.goto(`${server.url}/board?q=${code}`);
    await page.locator(`[data-testid="board-tool-${code}"][data-status="running"]`).waitFor();
  });

  it('when an admin creates a display link, then its address is shown once; revoking it marks it revoked', async () => {
    await page.goto(`${server.url}/admin/displays`);
    const name = unique('Lobby screen');
    await page.getByLabel(/Name of the screen/).fill(name);
    await page.getByRole('button', { name: 'Create display link' }).click();
    const url = await page.getByTestId('new-display-url').textContent();
    expect(url).toMatch(new RegExp(`^http://127\\.0\\.0\\.1:${server.port}/display/[A-Za-z0-9_-]{43,}$`));
    await screenshot(page, 'admin-displays-desktop');

    const link = await DisplayLink.findOne({ where: { name } });
    await page.getByTestId(`display-link-${link!.id}`).getByRole('button', { name: 'Revoke…' }).click();
    await page.getByTestId(`display-link-${link!.id}`).getByRole('button', { name: 'Yes, revoke' }).click();
    await expect.poll(async () => (await DisplayLink.findByPk(link!.id))!.revokedAt !== null, { timeout: 5000 }).toBe(true);
  });
});
