import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { Area, StateInterval, Tool } from '../../server/modules/facility/facility.model';
import { Ticket, UNWORKED_TICKET_FIELDS } from '../../server/modules/tickets/ticket.model';
import { createRandom } from '../../server/db/seed/random';
import type { E10State, StateReason } from '../../shared/equipment-state';
import { TICKET_CATEGORIES } from '../../shared/report-options';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createUser, TEST_PASSWORD, unique } from '../support/factories';

// A manager's view of a small invented facility area with a year and a bit of history,
// generated from a fixed seed into the shared test database under unique names.

const H = 3_600_000;
const MODES = ['Robot arm lost its home position', 'Turbo pump tripped', 'RF match fault', 'Door interlock stuck', 'Heater zone overshoot'];

let server: TestServer;
let browser: Browser;
let managerEmail: string;
let areaId: number;
const toolCodes: string[] = [];
const contexts: BrowserContext[] = [];

/** About 400 days of plausible history per tool: running, failures with tickets, PM, engineering. */
async function buildHistory() {
  const rnd = createRandom(4242);
  const area = await Area.create({
    name: unique('Invented litho bay'),
    code: unique('AB').toUpperCase(),
    description: null,
    retiredAt: null,
  });
  areaId = area.id;
  const now = Date.now();
  const start = now - 400 * 24 * H;
  for (const name of ['Resist coat track', 'Mask aligner', 'ICP etcher', 'LPCVD tube', 'E-beam evaporator']) {
    const tool = await Tool.create({
      areaId,
      name: `${name} (invented)`,
      code: unique('AN').toUpperCase(),
      description: null,
      primaryEngineerId: null,
      backupEngineerId: null,
      retiredAt: null,
    });
    toolCodes.push(tool.code);
    const rows: { state: E10State; reason: StateReason; start: number; end: number | null; ticketId: number | null }[] = [];
    let t = start;
    const push = (state: E10State, reason: StateReason, hours: number, ticketId: number | null = null) => {
      const end = Math.min(now, t + Math.max(0.25, hours) * H);
      rows.push({ state, reason, start: t, end: end >= now ? null : end, ticketId });
      t = end;
    };
    // One tool gets worse over the year, so the ranking has a rising failure rate to show.
    const worsening = name === 'ICP etcher';
    while (t < now) {
      const age = (t - start) / (now - start);
      push('standby', 'none', rnd.exp(worsening ? 260 * (1.05 - age) : 150));
      if (t >= now) break;
      const r = rnd.next();
      if (r < 0.45) {
        const created = t + 5 * 60_000;
        const ticket = await Ticket.create({
          toolId: tool.id,
          moduleId: null,
          category: rnd.pick(TICKET_CATEGORIES),
          title: 'Invented fault for the analytics test',
          description: null,
          alarmText: null,
          impact: 'tool_stopped',
          hazards: [],
          wafersOwner: null,
          wafersRecoverable: null,
          status: 'closed',
          priority: rnd.pick(['P1', 'P2', 'P2', 'P3'] as const),
          reporterId: null,
          assigneeId: null,
          ...UNWORKED_TICKET_FIELDS,
          fixKind: 'failure',
          failureMode: rnd.pick(MODES),
          acknowledgedAt: new Date(created + rnd.exp(40) * 60_000),
        });
        push('unscheduled_downtime', 'repair', rnd.exp(3), ticket.id);
        if (rnd.chance(0.4) && t < now) push('unscheduled_downtime', 'waiting_parts', rnd.exp(20), ticket.id);
        if (t < now) push('unscheduled_downtime', 'repair', rnd.exp(2), ticket.id);
        await ticket.sequelize.query('UPDATE tickets SET created_at = :c, fixed_at = :f, resolved_at = :f WHERE id = :id', {
          replacements: { c: new Date(created), f: new Date(Math.min(t, now - 1000)), id: ticket.id },
        });
      } else if (r < 0.7) {
        push('scheduled_downtime', 'preventive_maintenance', rnd.exp(5));
      } else if (r < 0.9) {
        push('engineering', 'process_development', rnd.exp(6));
      } else {
        push('non_scheduled', 'not_staffed', rnd.exp(40));
      }
    }
    await StateInterval.bulkCreate(
      rows.map((row) => ({
        toolId: tool.id,
        moduleId: null,
        state: row.state,
        reason: row.reason,
        note: null,
        startedAt: new Date(row.start),
        endedAt: row.end === null ? null : new Date(row.end),
        expectedReturnAt: null,
        ticketId: row.ticketId,
        setById: null,
        source: 'staff' as const,
        confirmed: true,
      })),
    );
  }
}

beforeAll(async () => {
  const port = await freePort();
  server = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` }, { serveClient: true });
  browser = await launchBrowser();
  managerEmail = (await createUser('manager', { name: 'Invented Manager' })).email;
  await buildHistory();
});

afterAll(async () => {
  for (const c of contexts) await c.close();
  await browser?.close();
  await server?.close();
});

async function managerPage(viewport: { width: number; height: number }): Promise<Page> {
  const context = await browser.newContext({ viewport, acceptDownloads: true });
  contexts.push(context);
  const page = await context.newPage();
  await signInThroughPage(page, server.url, managerEmail, TEST_PASSWORD);
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  return page;
}

/** Rows of a downloaded CSV (the export quotes only fields that need it; ours have no quotes). */
function parseCsv(text: string): Record<string, string>[] {
  const [header, ...lines] = text
    .replace(/^\uFEFF/, '')
    .trim()
    .split('\r\n')
    .map((l) => l.split(','));
  return lines.map((cells) => Object.fromEntries(header.map((h, i) => [h, cells[i]])));
}

async function download(page: Page, testId: string): Promise<string> {
  const [file] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testId).click()]);
  return fs.readFileSync((await file.path())!, 'utf8');
}

const figure = async (page: Page, id: string) => Number(await page.getByTestId(`figure-${id}`).getAttribute('data-value'));

describe('the analytics page in the browser', () => {
  it('when a manager picks an area and the last 12 months, then figures and charts render and the CSVs carry the same totals', async () => {
    const page = await managerPage(VIEWPORTS.desktop);
    await page.getByRole('link', { name: 'Analytics' }).first().click();
    await page.waitForURL(/\/analytics/);
    // Choose the scope as a manager would: one area, from the list.
    await page.getByText('One area', { exact: true }).click();
    await page.getByLabel('Area', { exact: true }).selectOption(String(areaId));
    await expect.poll(() => page.getByRole('radio', { name: 'Last 12 months' }).isChecked()).toBe(true);
    await page.getByTestId('report-subtitle').waitFor();
    await expect.poll(() => page.getByTestId('report-subtitle').textContent()).toContain('Invented litho bay');

    // Headline figures with values, the interval sentence and the MTTR definition.
    const availability = await figure(page, 'availability');
    expect(availability).toBeGreaterThan(50);
    expect(availability).toBeLessThan(100);
    const failures = await figure(page, 'failures');
    expect(failures).toBeGreaterThan(5);
    expect(await page.getByTestId('mtbf-interval').textContent()).toMatch(
      /^With 90 % confidence the true MTBF lies between [\d,.]+ h and [\d,.]+ h, assuming failures occur at a constant rate\.$/,
    );
    expect(await page.getByText('MTTR (E10: repair only)').count()).toBe(1);

    // Every chart drew its bars or line.
    await page.locator('[data-testid="chart-state-hours"] .recharts-bar-rectangle').first().waitFor();
    expect(await page.locator('[data-testid="chart-state-hours"] .recharts-bar-rectangle').count()).toBeGreaterThan(12);
    expect(await page.locator('[data-testid="chart-availability"] .recharts-line-curve').count()).toBe(1);
    expect(await page.locator('[data-testid="chart-pareto-mode"] .recharts-bar-rectangle').count()).toBeGreaterThanOrEqual(MODES.length);
    // The tools table links to each tool page.
    const links = page.locator('[data-testid="tool-ranking"] a');
    expect(await links.count()).toBe(toolCodes.length);
    expect((await links.first().getAttribute('href'))?.startsWith('/tools/')).toBe(true);
    await page.getByRole('button', { name: 'Getting worse first' }).click();
    expect(await page.locator('[data-testid="tool-ranking"] [data-trend]').count()).toBe(toolCodes.length);

    await screenshot(page, 'analytics-desktop');

    // The months CSV adds up to the page's unscheduled downtime, the tools CSV to its failures.
    const months = parseCsv(await download(page, 'csv-months'));
    expect(months.length).toBeGreaterThanOrEqual(12);
    const udt = months.reduce((s, m) => s + Number(m['Unscheduled downtime h']), 0);
    expect(Math.abs(udt - (await figure(page, 'unscheduled-hours')))).toBeLessThan(0.05);
    expect(months.reduce((s, m) => s + Number(m.Failures), 0)).toBe(failures);
    const tools = parseCsv(await download(page, 'csv-tools'));
    expect(tools.map((t) => t['Tool code']).sort()).toEqual([...toolCodes].sort());
    expect(tools.reduce((s, t) => s + Number(t.Failures), 0)).toBe(failures);

    // The printed report is one clean A4 page per scope.
    // A4 less 9 mm margins is about 726 × 1054 CSS pixels: the screenshot shows the sheet.
    await page.emulateMedia({ media: 'print' });
    await page.setViewportSize({ width: 726, height: 1054 });
    await screenshot(page, 'analytics-print');
    expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false);
    const pdf = (await page.pdf({ format: 'A4', preferCSSPageSize: true, printBackground: true })).toString('latin1');
    expect(pdf.match(/\/Type\s*\/Page[^s]/g)?.length).toBe(1);
  });

  it('when a manager opens a report on a phone, then it reads in one column and the tool page shows the tool’s figures', async () => {
    const page = await managerPage(VIEWPORTS.phone);
    await page.goto(`${server.url}/analytics?period=12m&scope=area&area=${areaId}`);
    await page.locator('[data-testid="chart-state-hours"] .recharts-bar-rectangle').first().waitFor();
    const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(scrollWidth).toBeLessThanOrEqual(VIEWPORTS.phone.width);
    await screenshot(page, 'analytics-phone');

    await page.goto(`${server.url}/tools/${toolCodes[2]}`);
    await page.getByTestId('tool-reliability').waitFor();
    expect(await page.getByTestId('reliability-availability-365').textContent()).toMatch(/\d+\.\d %/);
    await page.getByTestId('tool-reliability').scrollIntoViewIfNeeded();
    await screenshot(page, 'analytics-tool-panel-phone');
  });

  it('when a technician opens the analytics address, then the page says it is not for their role and no figures load', async () => {
    const email = (await createUser('technician')).email;
    const context = await browser.newContext({ viewport: VIEWPORTS.desktop });
    contexts.push(context);
    const page = await context.newPage();
    await signInThroughPage(page, server.url, email, TEST_PASSWORD);
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    const calls: string[] = [];
    page.on('request', (r) => {
      if (r.url().includes('/api/analytics')) calls.push(r.url());
    });
    await page.goto(`${server.url}/analytics?period=12m&scope=area&area=${areaId}`);
    await page.getByText('This page is not for your account').waitFor();
    expect(calls).toEqual([]);
  });
});
