import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createTool } from '../integration/tickets-fixtures';
import { Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';

// Long lists in the browser: a ticket whose timeline runs past a page shows its newest events
// and loads the older ones on request; the queue pages by the tickets at the page's edges and
// keeps showing where the page is.

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

function ticketRow(toolId: number, i: number, createdAt: Date) {
  return {
    toolId,
    moduleId: null,
    category: 'alarm_interlock',
    title: `Long list ticket ${i}`,
    description: 'Invented for the long-list browser test',
    alarmText: null,
    impact: 'tool_limited' as const,
    hazards: [],
    wafersOwner: null,
    wafersRecoverable: null,
    status: 'acknowledged' as const,
    waitReason: null,
    priority: 'P3' as const,
    reporterId: null,
    assigneeId: null,
    mergedIntoId: null,
    fixKind: null,
    failureMode: null,
    cause: null,
    workDone: null,
    partsUsed: null,
    handsOnMinutes: null,
    wafersRecovered: null,
    wafersReturned: null,
    acknowledgedAt: null,
    fixedAt: null,
    closedAt: null,
    resolvedAt: null,
    createdAt,
    updatedAt: createdAt,
  };
}

describe('long lists', () => {
  it('when a ticket has 230 events, then the page shows the newest 200 and "Show 30 older events" loads the rest above them', async () => {
    const tech = await createUser('technician', { name: 'Rhea Okafor (test)' });
    const { tool } = await createTool(server.deps.sequelize, { name: 'Long-history furnace (e2e)' });
    const ticket = await Ticket.create(ticketRow(tool.id, 0, new Date(Date.now() - 5 * 86_400_000)));
    const start = ticket.createdAt.getTime();
    await TicketEvent.bulkCreate(
      Array.from({ length: 230 }, (_, i) => ({
        ticketId: ticket.id,
        actorId: tech.id,
        kind: 'reply',
        internal: false,
        body: `Shift note ${i + 1}: checked the boat, temperatures steady.`,
        data: null,
        createdAt: new Date(start + (i + 1) * 60_000),
      })),
    );

    for (const [name, viewport] of Object.entries(VIEWPORTS)) {
      const page = await signedInPage(tech.email, viewport);
      await page.goto(`${server.url}/tickets/${ticket.id}`);
      const timeline = page.getByTestId('timeline');
      await timeline.waitFor();
      expect(await timeline.locator(':scope > li').count()).toBe(200);
      await expect.poll(() => timeline.locator(':scope > li').first().innerText()).toMatch(/Shift note 31:/);
      const more = page.getByRole('button', { name: 'Show 30 older events' });
      await more.waitFor();
      await screenshot(page, `long-timeline-before-${name}`);
      await more.click();
      await expect.poll(() => timeline.locator(':scope > li').count()).toBe(230);
      expect(await timeline.locator(':scope > li').first().innerText()).toMatch(/Shift note 1:/);
      expect(await page.getByTestId('older-events').count()).toBe(0);
      await screenshot(page, `long-timeline-after-${name}`);
    }
  });

  it('when the queue pages through 60 tickets of a tool, then Next, Last and Previous show the right tickets and position', async () => {
    const tech = await createUser('technician', { name: 'Ivo Lindqvist (test)' });
    const { tool } = await createTool(server.deps.sequelize, { name: 'Paged-queue sputter tool (e2e)' });
    // Pairs of tickets share a creation time: only the id orders them.
    const base = Date.now() - 40 * 86_400_000;
    const tickets = await Ticket.bulkCreate(
      Array.from({ length: 60 }, (_, i) => ticketRow(tool.id, i + 1, new Date(base + Math.floor(i / 2) * 3_600_000))),
    );
    const ordered = tickets.map((t) => t.id);

    const page = await signedInPage(tech.email, VIEWPORTS.desktop);
    await page.goto(`${server.url}/queue?status=all&toolId=${tool.id}`);
    const rowIds = async () =>
      page
        .getByTestId('ticket-table')
        .locator('tbody tr')
        .evaluateAll((rows) => rows.map((r) => Number(r.getAttribute('data-ticket-id'))));
    const position = page.getByTestId('queue-position');
    await expect.poll(() => position.innerText()).toBe('1–25 of 60');
    expect(await rowIds()).toEqual(ordered.slice(0, 25));

    await page.getByRole('button', { name: 'Next', exact: true }).click();
    await expect.poll(() => position.innerText()).toBe('26–50 of 60');
    expect(page.url()).toContain(`after=${ordered[24]}`);
    expect(await rowIds()).toEqual(ordered.slice(25, 50));

    await page.getByRole('button', { name: 'Last', exact: true }).click();
    await expect.poll(() => position.innerText()).toBe('51–60 of 60');
    expect(await rowIds()).toEqual(ordered.slice(50));
    expect(await page.getByRole('button', { name: 'Next', exact: true }).isDisabled()).toBe(true);
    await screenshot(page, 'queue-last-page-desktop');

    await page.getByRole('button', { name: 'Previous', exact: true }).click();
    await expect.poll(() => position.innerText()).toBe('26–50 of 60');
    expect(await rowIds()).toEqual(ordered.slice(25, 50));

    await page.setViewportSize(VIEWPORTS.phone);
    await screenshot(page, 'queue-middle-page-phone');
  });
});
