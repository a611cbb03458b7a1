import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { TestClient } from '../support/client';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { makeTool } from '../integration/facility-fixtures';
import { runSchedulerPass } from '../../server/modules/maintenance/scheduler';
import { WorkOrder } from '../../server/modules/maintenance/maintenance.model';

// A technician works a PM work order in the browser: the board announces the window, the
// start puts the tool in Maintenance, the checklist marks an out-of-limit reading, a part is
// drawn from the list, a failing requalification blocks the return, a passing one allows it.

let server: TestServer;
let browser: Browser;
const contexts: BrowserContext[] = [];
const DAY = 86400_000;

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

async function pageFor(email: string, viewport: { width: number; height: number }) {
  const context = await browser.newContext({ viewport });
  contexts.push(context);
  const page = await context.newPage();
  await signInThroughPage(page, server.url, email, TEST_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
  return page;
}

describe('working a PM work order', () => {
  it('when a technician works the checklist, parts and requalification (failing, then passing), then the tool returns to service; the board shows the window before and Maintenance during', async () => {
    const tech = await createUser('technician', { name: 'Rosa Lindqvist (test)' });
    const member = await createUser('member', { name: 'Teo Marsh (test)' });
    const { tool } = await makeTool(server.deps.sequelize, {
      name: `Resist coat track (e2e ${Date.now() % 100000})`,
      primaryEngineerId: tech.id,
    });
    const api = new TestClient(server.url);
    await api.signIn(tech.email, TEST_PASSWORD);
    const plan = await api.post('/api/maintenance/plans', {
      toolId: tool.id,
      title: 'Bowl clean and spin check',
      checklist: [
        { text: 'Follow the lock-out procedure for the track', asksValue: false },
        { text: 'Clean the spin bowl and drain', asksValue: false },
        { text: 'Spin motor current at 3000 rpm', asksValue: true, unit: 'A', min: 1.8, max: 2.4 },
      ],
      estimatedMinutes: 120,
      everyDays: 60,
      leadDays: 7,
      lastDoneAt: new Date(Date.now() - 57 * DAY).toISOString(),
    });
    expect(plan.status, plan.text).toBe(201);
    const template = await api.post(`/api/tools/${tool.id}/requal-templates`, {
      name: 'Resist thickness, 5-point test wafer',
      quantity: 'Film thickness',
      unit: 'nm',
      points: 5,
      target: 1000,
      lsl: 970,
      usl: 1030,
      // ±100 Å = a 20 nm range at most (common practice for spun resist).
      limits: [{ figure: 'range', max: 20 }],
    });
    expect(template.status).toBe(201);
    const part = await api.post('/api/parts', {
      name: 'Spin bowl seal kit (e2e)',
      partNumber: `SBK-${Date.now()}`,
      toolIds: [tool.id],
      stock: 4,
      reorderLevel: 1,
    });
    expect(part.status).toBe(201);
    await runSchedulerPass(server.deps);
    const wo = await WorkOrder.findOne({ where: { planId: plan.body.id } });
    expect(wo).not.toBeNull();
    const startsAt = new Date(Date.now() + 3600_000);
    const booked = await api.put(`/api/work-orders/${wo!.id}/window`, {
      version: wo!.version,
      startsAt: startsAt.toISOString(),
      endsAt: new Date(startsAt.getTime() + 4 * 3600_000).toISOString(),
    });
    expect(booked.status, booked.text).toBe(200);

    // A member's board announces the window.
    const board = await pageFor(member.email, VIEWPORTS.desktop);
    await board.goto(`${server.url}/board?q=${encodeURIComponent(tool.code)}`);
    const card = board.getByTestId(`board-tool-${tool.code}`);
    await card.getByTestId('planned-maintenance').waitFor();
    expect(await card.getByTestId('planned-maintenance').innerText()).toMatch(
      /^Maintenance planned \w{3} \d{1,2} \w{3} \d{2}:\d{2}–\d{2}:\d{2}$/,
    );
    await screenshot(board, 'maintenance-board-window-desktop');

    // The technician opens the work order and starts it; the open board turns to Maintenance live.
    const page = await pageFor(tech.email, VIEWPORTS.desktop);
    await page.goto(`${server.url}/maintenance/work-orders/${wo!.id}`);
    await page.getByTestId('wo-window').waitFor();
    await screenshot(page, 'maintenance-work-order-planned-desktop');
    await page.getByTestId('wo-start').click();
    await expect.poll(() => card.getAttribute('data-status'), { timeout: 5000 }).toBe('maintenance');

    // Checklist: ticks, and an out-of-limit reading marked at once, then corrected.
    await page.getByLabel('Step 1 done').click();
    await expect.poll(() => page.getByLabel('Step 1 done').isChecked()).toBe(true);
    await page.getByLabel('Step 2 done').click();
    await expect.poll(() => page.getByLabel('Step 2 done').isChecked()).toBe(true);
    await page.getByTestId('step-2-value').fill('2.9');
    await page.getByTestId('step-2-out').waitFor();
    await page.getByTestId('step-2-value').fill('2.1');
    await expect.poll(() => page.getByTestId('step-2-out').count()).toBe(0);
    await page.getByLabel('Step 3 done').click();
    await expect.poll(() => page.getByLabel('Step 3 done').isChecked()).toBe(true);

    // A part from the list.
    await page.getByTestId('part-pick').selectOption(String(part.body.id));
    await page.getByTestId('part-add').click();
    await page.getByText(/1 × Spin bowl seal kit \(e2e\)/).waitFor();
    await page.getByTestId('hands-on').fill('95');
    await page.getByTestId('save-notes').click();

    // Requalification fails: range 36 nm > 20 nm; the return to service is refused.
    const requal = page.getByTestId(`requal-${template.body.id}`);
    await requal.getByTestId('requal-values').fill('thickness\n1018\n1002\n982\n1000\n995');
    await requal.getByRole('button', { name: 'Compute and record' }).click();
    await expect.poll(() => requal.getByTestId('requal-result').getAttribute('data-passed')).toBe('false');
    await page.getByTestId('wo-complete').click();
    await page.getByText(/needs a passing requalification record/).waitFor();
    await screenshot(page, 'maintenance-work-order-requal-failed-desktop');

    // Repeated, it passes; completing returns the tool to service.
    await requal.getByTestId('requal-values').fill('1004\n1001\n996\n1000\n999');
    await requal.getByRole('button', { name: 'Compute and record' }).click();
    await expect.poll(() => requal.getByTestId('requal-result').getAttribute('data-passed')).toBe('true');
    await page.getByTestId('wo-complete').click();
    await page.getByTestId('return-proof').waitFor();
    expect(await page.getByTestId('return-proof').innerText()).toMatch(/passing requalification record/);
    await expect.poll(() => card.getAttribute('data-status'), { timeout: 5000 }).toBe('running');
    await screenshot(page, 'maintenance-work-order-done-desktop');

    const done = await WorkOrder.findByPk(wo!.id);
    expect(done).toMatchObject({ status: 'done', handsOnMinutes: 95 });
    const parts = await api.get(`/api/parts?toolId=${tool.id}`);
    expect(parts.body.items[0].stock).toBe(3);

    // The same page on a phone, the maintenance overview, and the printed sheet.
    const phone = await pageFor(tech.email, VIEWPORTS.phone);
    await phone.goto(`${server.url}/maintenance/work-orders/${wo!.id}`);
    await phone.getByTestId('return-proof').waitFor();
    await screenshot(phone, 'maintenance-work-order-phone');
    await phone.goto(`${server.url}/maintenance`);
    await phone.getByRole('heading', { name: 'Maintenance', level: 1 }).waitFor();
    await screenshot(phone, 'maintenance-overview-phone');
    await page.goto(`${server.url}/maintenance/work-orders/${wo!.id}/print`);
    await page.getByTestId('work-order-sheet').waitFor();
    await page.emulateMedia({ media: 'print' });
    await screenshot(page, 'maintenance-work-order-print');
    const pdf = await page.pdf({ format: 'A4' });
    // One clean page: a PDF counts its pages as /Type /Page objects.
    expect((pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length).toBe(1);
  });
});
