import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createTool, drainOutbox, fileReport, jpegBytes, multipartReport, reportBody } from '../integration/tickets-fixtures';
import { TestClient } from '../support/client';

// The ticket desk, in Chromium: one vocabulary for states (issue 9 point 12) and the
// printable work sheet (point 14).

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
  return page;
}

async function signedInClient(role: 'member' | 'technician') {
  const user = await createUser(role);
  const client = new TestClient(server.url);
  await client.signIn(user.email, TEST_PASSWORD);
  return { user, client };
}

const BOARD_WORD_FIRST = /^(Running|Limited|Down|Maintenance|Engineering|Offline)$/;

describe('one vocabulary for states', () => {
  it('when a "tool stopped" report puts a tool Down, then the ticket, its timeline, the tool page, the board and the queue each show the board word first with the E10 state beside it', async () => {
    const tech = await createUser('technician');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Vocabulary walk tool (e2e)' });
    const { client } = await signedInClient('member');
    const t = await fileReport(client, tool.id, { impact: 'tool_stopped' });

    for (const [name, viewport] of [
      ['desktop', VIEWPORTS.desktop],
      ['phone', VIEWPORTS.phone],
    ] as const) {
      const page = await signedInPage(tech.email, viewport);

      // The ticket's timeline: "The tool went to [Down] Unscheduled downtime · Repair".
      await page.goto(`${server.url}/tickets/${t.id}`);
      const stateEvent = page.getByTestId('ticket-view').locator('[data-event-kind="tool_state"]').first();
      await stateEvent.waitFor();
      expect(await stateEvent.locator('.state-badge').innerText()).toMatch(BOARD_WORD_FIRST);
      expect(await stateEvent.getByTestId('state-e10').innerText()).toMatch(/^Unscheduled downtime/);
      expect(await stateEvent.getByTestId('state-before').innerText()).toBe('Before: Running (Standby)');
      await screenshot(page, `vocabulary-ticket-${name}`);

      // The tool page: one state block, the history line "from Running (Productive)".
      await page.goto(`${server.url}/tools/${tool.code}`);
      const status = page.getByTestId('tool-status');
      await status.waitFor();
      expect(await status.locator('.state-badge').first().innerText()).toMatch(/^Down/);
      // One state row only: the badge leads, the E10 row sits beside it.
      const rows = await status.locator('dt').allInnerTexts();
      expect(rows.filter((r) => /state/i.test(r))).toEqual(['E10 state']);
      await page.getByTestId('state-history').locator('summary').click();
      await page.getByTestId('history-entry').first().waitFor();
      const history = await page.getByTestId('history-entry').allInnerTexts();
      expect(history.join('\n')).toContain('from Running (Standby)');
      expect(history.join('\n')).not.toMatch(/from (standby|productive|unscheduled downtime) \(/);

      // The board card: the badge and the E10 state beside it.
      await page.goto(`${server.url}/board?q=${encodeURIComponent(tool.code)}`);
      const card = page.getByTestId(`board-tool-${tool.code}`);
      await card.getByTestId('state-e10').waitFor();
      expect(await card.getByTestId('state-e10').innerText()).toBe('Unscheduled downtime');
      await screenshot(page, `vocabulary-board-${name}`);

      // The queue: each row names its tool's state the same way.
      await page.goto(`${server.url}/queue`);
      const row = page.locator(`[data-ticket-id="${t.id}"]:visible`);
      await row.getByTestId('state-name').waitFor();
      expect(await row.getByTestId('state-name').locator('.state-badge').innerText()).toBe('Down');
      expect(await row.getByTestId('state-e10').innerText()).toBe('Unscheduled downtime');
      await screenshot(page, `vocabulary-queue-${name}`);
    }
  });
});

describe('the printed work sheet', () => {
  it('when a ticket is printed, then one page shows the problem, photo thumbnails and the public timeline, without menu, reply box or internal notes — which a staff member can choose to include', async () => {
    const { tool } = await createTool(server.deps.sequelize, { name: 'Print sheet tool (e2e)' });
    const { client: member, user: reporter } = await signedInClient('member');
    const r = await member.post(
      '/api/tickets',
      multipartReport(reportBody(tool.id, { description: 'Belt stopped with a wafer half way out of the cassette' }), [
        { bytes: await jpegBytes(640, 480), name: 'belt.jpg' },
      ]),
    );
    expect(r.status).toBe(201);
    const id = r.body.id as number;
    const { client: techClient, user: tech } = await signedInClient('technician');
    expect(
      (
        await techClient.post(`/api/tickets/${id}/comments`, {
          body: 'Staff only: the belt tensioner was replaced last month',
          internal: true,
        })
      ).status,
    ).toBe(201);
    expect(
      (await techClient.post(`/api/tickets/${id}/comments`, { body: 'Looking at it now, please leave the wafer in place.' })).status,
    ).toBe(201);

    const page = await signedInPage(tech.email, VIEWPORTS.desktop);
    await page.goto(`${server.url}/tickets/${id}`);
    await page.getByTestId('ticket-view').getByText('Looking at it now, please leave the wafer in place.').waitFor();
    await page.getByRole('button', { name: 'Print work sheet' }).waitFor();

    await page.emulateMedia({ media: 'print' });
    await page.setViewportSize({ width: 726, height: 1054 }); // A4 less 12 mm margins, in CSS pixels
    const sheet = page.getByTestId('ticket-print-sheet');
    expect(await sheet.isVisible()).toBe(true);
    const text = await sheet.innerText();
    expect(text).toContain(`ticket #${id}`);
    expect(text).toContain('Belt stopped with a wafer half way out of the cassette');
    expect(text).toContain(tool.code);
    expect(text).toContain('Looking at it now, please leave the wafer in place.');
    expect(text).toContain(reporter.name);
    expect(text).not.toContain('the belt tensioner was replaced');
    const thumb = sheet.locator('img').first();
    await expect.poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0)).toBe(true);
    expect((await thumb.boundingBox())!.height).toBeLessThanOrEqual(90);
    // No menu, no reply box, no buttons on paper.
    expect(await page.getByRole('navigation', { name: 'Main' }).first().isVisible()).toBe(false);
    expect(await page.getByRole('banner').isVisible()).toBe(false);
    expect(await page.getByTestId('ticket-view').isVisible()).toBe(false);
    expect(await page.getByRole('button', { name: 'Print work sheet' }).isVisible()).toBe(false);
    expect(await page.locator('textarea:visible').count()).toBe(0);
    await screenshot(page, 'ticket-print');
    const pdf = (await page.pdf({ format: 'A4', preferCSSPageSize: true, printBackground: true })).toString('latin1');
    expect(pdf.match(/\/Type\s*\/Page[^s]/g)?.length).toBe(1);

    // Staff can ask for the internal notes.
    await page.emulateMedia({ media: 'screen' });
    await page.getByLabel('Include internal notes').check();
    await page.emulateMedia({ media: 'print' });
    expect(await sheet.innerText()).toContain('the belt tensioner was replaced');
    await screenshot(page, 'ticket-print-with-notes');

    // A member sees no such choice, and the sheet has no staff notes.
    const memberPage = await signedInPage(reporter.email, VIEWPORTS.phone);
    await memberPage.goto(`${server.url}/tickets/${id}`);
    await memberPage.getByRole('button', { name: 'Print work sheet' }).waitFor();
    expect(await memberPage.getByLabel('Include internal notes').count()).toBe(0);
    await memberPage.emulateMedia({ media: 'print' });
    const memberSheet = await memberPage.getByTestId('ticket-print-sheet').innerText();
    expect(memberSheet).toContain('Looking at it now');
    expect(memberSheet).not.toContain('the belt tensioner was replaced');
    await screenshot(memberPage, 'ticket-print-phone');
  });
});
