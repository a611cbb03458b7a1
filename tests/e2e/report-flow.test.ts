import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createTool, drainOutbox, jpegBytes } from '../integration/tickets-fixtures';
import { TestClient } from '../support/client';
import { Ticket, Photo } from '../../server/modules/tickets/ticket.model';
import { StateInterval } from '../../server/modules/facility/facility.model';

// The heart of the product end to end: a member reports a stopped tool from a phone with two
// photos; the tool shows Down; a technician sees the ticket arrive in the queue live,
// acknowledges, marks it fixed and returns the tool to service; the reporter gets the e-mail.

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

async function fillReport(page: Page, text: string) {
  await page.getByTestId('chosen-tool').waitFor();
  await page.getByLabel(/^What happened\?/).fill(text);
  await page.getByLabel(/^Alarm text/).fill('ALM 3107 TRANSFER ARM TIMEOUT');
  await page.getByLabel(/^Tool stopped/).check();
  await page.getByLabel('Alarm or interlock').check();
  await page.locator('input[type=file]').setInputFiles([
    { name: 'alarm-screen.jpg', mimeType: 'image/jpeg', buffer: await jpegBytes(800, 600) },
    { name: 'arm.jpg', mimeType: 'image/jpeg', buffer: await jpegBytes(600, 800) },
  ]);
  await expect.poll(() => page.getByRole('list', { name: 'Photos to send' }).getByRole('img').count()).toBe(2);
}

describe('reporting a fault from a phone and fixing it', () => {
  it('when a member reports "tool stopped" with two photos, then the tool is Down, the queue shows it live, and after the fix the reporter is e-mailed', async () => {
    const tech = await createUser('technician', { name: 'Ada Quintero (test)' });
    const member = await createUser('member', { name: 'Milo Ferreira (test)' });
    const { tool } = await createTool(server.deps.sequelize, { name: 'ICP etcher (e2e)', primaryEngineerId: tech.id });

    // The technician watches the queue on a desktop before anything is reported.
    const staff = await signedInPage(tech.email, VIEWPORTS.desktop);
    await staff.page.goto(`${server.url}/queue`);
    await staff.page.getByTestId('queue-count').waitFor();
    // The shared test database holds many open tickets; the engineer looks at their own tools.
    await staff.page.getByRole('button', { name: 'My tools' }).click();
    await staff.page.waitForURL(/myTools=true/);
    await expect.poll(() => staff.page.getByTestId('queue-count').innerText()).toMatch(/Nothing here/);
    await staff.page.evaluate(() => ((window as unknown as { queueNotReloaded: boolean }).queueNotReloaded = true));

    // The member is at the tool with a phone: tool page, then "Report a fault".
    const reporter = await signedInPage(member.email, VIEWPORTS.phone);
    await reporter.page.goto(`${server.url}/tools/${tool.code}`);
    await reporter.page.getByTestId('report-fault').click();
    await reporter.page.waitForURL(/\/report\?tool=/);
    await fillReport(reporter.page, 'The transfer arm stopped half-way into the chamber and the tool halted.');
    await screenshot(reporter.page, 'report-form-phone');

    await reporter.page.getByRole('button', { name: 'Send report' }).click();
    await reporter.page.waitForURL(/\/tickets\/\d+$/, { timeout: 15_000 });
    const ticketId = Number(new URL(reporter.page.url()).pathname.split('/').pop());
    await reporter.page.getByTestId('ticket-view').waitFor();
    expect(await reporter.page.getByTestId('tool-state').innerText()).toMatch(/Down \(reported by a user\)/);
    expect(await Photo.count({ where: { ticketId } })).toBe(2);
    await expect.poll(() => reporter.page.locator('[data-event-kind="reported"] img').count()).toBe(2);
    await screenshot(reporter.page, 'ticket-reported-phone');

    // The tool page (and so the board) shows Down.
    await reporter.page.goto(`${server.url}/tools/${tool.code}`);
    await reporter.page.locator('[data-status="down"]').first().waitFor();

    // The queue picked the new ticket up over the socket, without a reload.
    const row = staff.page.locator(`tr[data-ticket-id="${ticketId}"]`);
    await row.waitFor({ timeout: 10_000 });
    expect(await staff.page.evaluate(() => (window as unknown as { queueNotReloaded?: boolean }).queueNotReloaded)).toBe(true);
    expect(await row.innerText()).toContain('P2');
    await screenshot(staff.page, 'queue-desktop');

    await row.getByRole('link').click();
    await staff.page.getByTestId('ticket-view').waitFor();
    await staff.page.getByRole('button', { name: 'Acknowledge', exact: true }).click();
    await staff.page.locator('[data-testid="ticket-view"][data-ticket-status="acknowledged"]').waitFor();
    await staff.page.getByRole('button', { name: 'Mark fixed', exact: true }).first().click();
    const form = staff.page.getByRole('form', { name: 'Mark fixed' });
    await form.getByLabel(/^What was done/).fill('Re-seated the arm encoder cable and re-taught the transfer positions.');
    await form.getByLabel('Failure mode').fill('Transfer arm encoder');
    await form.getByLabel('Hands-on time (minutes)').fill('45');
    // Returning to service is a deliberate tick, never the default.
    expect(await form.getByLabel(/Return the tool to service now/).isChecked()).toBe(false);
    await form.getByLabel(/Return the tool to service now/).check();
    await screenshot(staff.page, 'ticket-fix-form-desktop');
    await form.getByRole('button', { name: 'Mark fixed' }).click();
    await staff.page.locator('[data-testid="ticket-view"][data-ticket-status="fixed"]').waitFor();
    await expect.poll(async () => staff.page.getByTestId('tool-state').innerText()).toMatch(/Running/);
    await screenshot(staff.page, 'ticket-desktop');

    expect(await Ticket.findByPk(ticketId)).toMatchObject({ status: 'fixed', fixKind: 'failure', failureMode: 'Transfer arm encoder' });
    expect((await StateInterval.findOne({ where: { toolId: tool.id, moduleId: null, endedAt: null } }))!.state).toBe('standby');

    const mail = await server.catcher.waitFor((m) => m.to.includes(member.email) && m.subject.includes(`[#${ticketId}] Fixed`), 15_000);
    expect(mail.text).toContain('back in service');
    expect(mail.text).toContain(`/tickets/${ticketId}`);

    // The same ticket and the queue, on a phone.
    await reporter.page.goto(`${server.url}/tickets/${ticketId}`);
    await reporter.page.locator('[data-testid="ticket-view"][data-ticket-status="fixed"]').waitFor();
    await screenshot(reporter.page, 'ticket-phone');
    const phoneStaff = await signedInPage(tech.email, VIEWPORTS.phone);
    await phoneStaff.page.goto(`${server.url}/queue?status=all`);
    await phoneStaff.page.getByTestId('queue-count').waitFor();
    await screenshot(phoneStaff.page, 'queue-phone');
  });

  it('when the server answers 503 or the phone goes offline, then the report stays as a draft across a reload and goes out once the connection is back', async () => {
    const member = await createUser('member');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Resist coat track (e2e)' });
    const { context, page } = await signedInPage(member.email, VIEWPORTS.phone);
    const text = 'Spin chuck lost vacuum during the coat step.';

    // 1. The database is away: the server says 503.
    let down = true;
    await page.route(
      (url) => url.pathname === '/api/tickets',
      (route) =>
        route.request().method() === 'POST' && down
          ? route.fulfill({
              status: 503,
              contentType: 'application/json',
              body: JSON.stringify({
                error: { code: 'db_unavailable', message: 'The database is not reachable right now. Nothing was saved.' },
              }),
            })
          : route.continue(),
    );
    await page.goto(`${server.url}/report?tool=${tool.code}`);
    await fillReport(page, text);
    await page.getByRole('button', { name: 'Send report' }).click();
    await page.getByText('Saved as draft — will send when back online').waitFor();
    await screenshot(page, 'report-draft-phone');

    await page.reload();
    await page.getByText('Saved as draft — will send when back online').waitFor();
    expect(await page.getByLabel(/^What happened\?/).inputValue()).toBe(text);
    await expect.poll(() => page.getByRole('list', { name: 'Photos to send' }).getByRole('img').count()).toBe(2);
    expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(0);

    // 2. Now the phone loses its connection altogether, then gets it back.
    down = false;
    await context.setOffline(true);
    await page.getByRole('button', { name: 'Try to send now' }).click();
    await page.getByText('Saved as draft — will send when back online').waitFor();
    expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(0);
    await context.setOffline(false); // the browser fires 'online'; the draft sends itself

    await page.waitForURL(/\/tickets\/\d+$/, { timeout: 15_000 });
    const tickets = await Ticket.findAll({ where: { toolId: tool.id } });
    expect(tickets).toHaveLength(1);
    expect(tickets[0].description).toBe(text);
    expect(await Photo.count({ where: { ticketId: tickets[0].id } })).toBe(2);

    // The draft is gone once sent.
    await page.goto(`${server.url}/report`);
    await page.getByTestId('report-form').waitFor();
    expect(await page.getByLabel(/^What happened\?/).inputValue()).toBe('');
  });
});

describe('safety and concurrent edits in the browser', () => {
  it('when a member ticks a hazard, then the form shows the cautions before anything is sent', async () => {
    const member = await createUser('member');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Wet bench (e2e)' });
    const { page } = await signedInPage(member.email, VIEWPORTS.phone);
    await page.goto(`${server.url}/report?tool=${tool.code}`);
    await page.getByTestId('chosen-tool').waitFor();
    expect(await page.getByTestId('hazard-cautions').count()).toBe(0);
    await page.getByLabel('Unusual smell').check();
    const cautions = page.getByTestId('hazard-cautions');
    await cautions.waitFor();
    expect(await cautions.innerText()).toMatch(/raise the facility alarm/);
    expect(await cautions.innerText()).toMatch(/does not replace/);
    await cautions.scrollIntoViewIfNeeded();
    await screenshot(page, 'report-hazard-phone');
  });

  it('when two technicians act on the same ticket, then the second sees what changed and can apply their change again', async () => {
    const one = await createUser('technician', { name: 'First Tech (test)' });
    const two = await createUser('technician', { name: 'Second Tech (test)' });
    const member = await createUser('member');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Sputter coater (e2e)' });
    const reporterClient = new TestClient(server.url);
    await reporterClient.signIn(member.email, TEST_PASSWORD);
    const created = await reporterClient.post('/api/tickets', {
      toolId: tool.id,
      category: 'vacuum',
      description: 'Base pressure will not come down',
      impact: 'tool_limited',
    });
    const id = created.body.id as number;

    const a = await signedInPage(one.email, VIEWPORTS.desktop);
    const b = await signedInPage(two.email, VIEWPORTS.desktop);
    for (const p of [a.page, b.page]) {
      await p.goto(`${server.url}/tickets/${id}`);
      await p.getByTestId('ticket-view').waitFor();
    }
    // The second technician starts changing the priority…
    await b.page.getByRole('button', { name: 'Change priority' }).click();
    await b.page.getByLabel('Priority').selectOption('P2');
    await b.page.getByLabel(/^Why/).fill('Needed for a course on Monday');
    // …while the first acknowledges the ticket.
    await a.page.getByRole('button', { name: 'Acknowledge', exact: true }).click();
    await a.page.locator('[data-testid="ticket-view"][data-ticket-status="acknowledged"]').waitFor();

    await b.page.getByRole('button', { name: 'Change priority' }).last().click();
    const conflict = b.page.getByText('Someone else changed this ticket while you had it open');
    await conflict.waitFor();
    const changes = await b.page.getByTestId('stale-changes').innerText();
    expect(changes).toMatch(/Status\s+Reported\s+Acknowledged/);
    expect(changes).toMatch(/Assigned to\s+Nobody\s+First Tech \(test\)/);
    await screenshot(b.page, 'ticket-conflict-desktop');
    expect((await Ticket.findByPk(id))!.priority).toBe('P3');

    await b.page.getByRole('button', { name: 'Apply my change again' }).click();
    await expect.poll(async () => (await Ticket.findByPk(id))!.priority).toBe('P2');
    expect((await Ticket.findByPk(id))!.status).toBe('acknowledged');
  });
});
