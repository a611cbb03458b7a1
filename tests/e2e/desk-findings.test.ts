import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createTool, drainOutbox, fileReport } from '../integration/tickets-fixtures';
import { TestClient } from '../support/client';
import { Ticket } from '../../server/modules/tickets/ticket.model';
import { changeState } from '../../server/modules/facility/state.service';
import { makeArea, makeTool } from '../integration/facility-fixtures';

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

describe('hazard reports', () => {
  it('when an admin sets the emergency number and procedure, then a member who ticks "Someone is hurt" on a phone sees cautions for an injury at once, with that number, and the limits line last', async () => {
    const admin = await createUser('admin');
    const adminApi = new TestClient(server.url);
    await adminApi.signIn(admin.email, TEST_PASSWORD);
    const before = (await adminApi.get('/api/facility-settings')).body;
    try {
      // Admin → Facility settings, at desktop width; a bad time zone is shown on its field.
      const desk = await signedInPage(admin.email, VIEWPORTS.desktop);
      await desk.page.goto(`${server.url}/admin`);
      await desk.page.getByRole('link', { name: /Open facility settings/ }).click();
      const form = desk.page.getByRole('form', { name: 'Facility settings' });
      await form.getByLabel(/^Facility name/).fill('Test cleanroom (fictional)');
      await form.getByLabel(/^Time zone/).fill('Nowhere/Atlantis');
      await form.getByLabel(/^Emergency number/).fill('4444');
      await form.getByLabel(/^Local procedure/).fill('Assembly point: the north car park.');
      await form.getByRole('button', { name: 'Save settings' }).click();
      await form.getByText(/Enter a time zone such as/).waitFor();
      expect(await desk.page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.value)).toBe('Nowhere/Atlantis');
      await screenshot(desk.page, 'facility-settings-error-desktop');
      await form.getByLabel(/^Time zone/).fill('Europe/Lisbon');
      await form.getByRole('button', { name: 'Save settings' }).click();
      await form.getByText('The new settings apply at once.').waitFor();
      expect((await adminApi.get('/api/facility-settings')).body).toMatchObject({
        facilityName: 'Test cleanroom (fictional)',
        timeZone: 'Europe/Lisbon',
        emergencyNumber: '4444',
      });
      await screenshot(desk.page, 'facility-settings-desktop');

      const member = await createUser('member');
      const { tool } = await createTool(server.deps.sequelize, { name: 'Wet bench acids (e2e)' });
      const { page } = await signedInPage(member.email, VIEWPORTS.phone);
      await page.goto(`${server.url}/report?tool=${tool.code}`);
      await page.getByTestId('chosen-tool').waitFor();
      // The danger question comes before the description.
      const dangerY = (await page.getByText('Is anyone or anything in danger?').boundingBox())!.y;
      const whatY = (await page.getByLabel(/^What happened\?/).boundingBox())!.y;
      expect(dangerY).toBeLessThan(whatY);

      await page.getByText('Is anyone or anything in danger?').evaluate((el) => el.scrollIntoView({ block: 'start' }));
      await page.getByLabel('Someone is hurt').check();
      const cautions = page.getByTestId('hazard-cautions');
      await cautions.waitFor();
      // Where the user is looking: the cautions' number and first steps are on screen now.
      const inView = async (locator: ReturnType<typeof page.locator>) => {
        const box = (await locator.boundingBox())!;
        return box.y >= 0 && box.y + box.height <= VIEWPORTS.phone.height;
      };
      await expect.poll(() => inView(page.getByTestId('emergency-number'))).toBe(true);
      expect(await inView(cautions.locator('[data-hazard="injury"]'))).toBe(true);
      expect(await page.getByTestId('emergency-number').innerText()).toContain('4444');
      expect(await page.getByTestId('local-procedure').innerText()).toContain('Assembly point: the north car park.');
      const text = await cautions.innerText();
      expect(text).toContain('Call for help on the emergency number');
      expect(text).not.toContain('Step back from the smell');
      expect(text).not.toMatch(/usual cautions/i);
      const lines = await cautions.getByTestId('caution-lines').locator('li').allInnerTexts();
      expect(lines[lines.length - 1]).toMatch(/does not replace the facility's alarm systems/);
      await screenshot(page, 'report-hazard-injury-phone', { fullPage: false });

      // Ticking a second hazard adds its own first steps.
      await page.getByLabel('Unusual smell').check();
      await cautions.locator('[data-hazard="smell"]').waitFor();
    } finally {
      await adminApi.put('/api/admin/facility-settings', before);
    }
  });
});

describe('the same draft in two tabs', () => {
  it('when a member types in a second tab and sends from the first, then both tabs held the same words and the second tab says the draft went elsewhere', async () => {
    const member = await createUser('member');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Oxidation furnace (e2e)' });
    const { context, page: first } = await signedInPage(member.email, VIEWPORTS.desktop);
    await first.goto(`${server.url}/report?tool=${tool.code}`);
    await first.getByTestId('chosen-tool').waitFor();
    await first.getByLabel(/^What happened\?/).fill('Words from the first tab');

    const second = await context.newPage();
    await second.goto(`${server.url}/report`);
    await second.getByTestId('chosen-tool').waitFor();
    expect(await second.getByLabel(/^What happened\?/).inputValue()).toBe('Words from the first tab');
    await second.getByLabel(/^What happened\?/).fill('Words from the first tab, and more typed in the second tab');
    // The first tab now shows the second tab's words: neither will overwrite the other.
    await expect
      .poll(() => first.getByLabel(/^What happened\?/).inputValue())
      .toBe('Words from the first tab, and more typed in the second tab');

    await first.getByLabel(/^Still usable/).check();
    await first.getByLabel('Other', { exact: true }).check();
    await first.getByRole('button', { name: 'Send report' }).click();
    await first.waitForURL(/\/tickets\/\d+$/);
    await second.getByText('This draft was sent or discarded in another tab').waitFor();
    await screenshot(second, 'report-two-tabs-desktop');
    const sent = await Ticket.findAll({ where: { toolId: tool.id } });
    expect(sent.map((t) => t.description)).toEqual(['Words from the first tab, and more typed in the second tab']);
  });
});

describe('words, panels and targets', () => {
  it('when a member looks around, then every way in says "Report a fault", never "Report a problem"', async () => {
    const member = await createUser('member');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Wording check tool (e2e)' });
    const { page } = await signedInPage(member.email, VIEWPORTS.desktop);
    for (const path of ['/', '/board', `/tools/${tool.code}`, '/my-reports', '/report']) {
      await page.goto(`${server.url}${path}`);
      await page.locator('main').first().waitFor();
      await page.waitForTimeout(300);
      const text = await page.locator('body').innerText();
      expect(text, path).not.toMatch(/report a problem/i);
    }
    expect(await page.title()).toBe('Report a fault · Faultline');
    expect(await page.getByRole('navigation').getByRole('link', { name: 'Report a fault' }).count()).toBeGreaterThan(0);
    await page.goto(`${server.url}/tools/${tool.code}`);
    expect(await page.getByTestId('report-fault').innerText()).toBe('Report a fault');
  });

  it('when the notices panel is opened on a phone, then it lies wholly on screen', async () => {
    const member = await createUser('member');
    const { page } = await signedInPage(member.email, VIEWPORTS.phone);
    await page.goto(`${server.url}/board`);
    await page
      .getByRole('button', { name: /notices/i })
      .first()
      .click();
    const panel = page.getByRole('region', { name: 'Notices' });
    await panel.waitFor();
    const box = (await panel.boundingBox())!;
    expect(box.x).toBeGreaterThanOrEqual(0);
    expect(box.x + box.width).toBeLessThanOrEqual(VIEWPORTS.phone.width);
    await screenshot(page, 'notices-panel-phone', { fullPage: false });
  });

  it('when a manager sets a restore target of 12 days, then it is typed as days and kept as 17,280 minutes', async () => {
    const manager = await createUser('manager');
    const api = new TestClient(server.url);
    await api.signIn(manager.email, TEST_PASSWORD);
    const before = (await api.get('/api/service-targets')).body.find((t: any) => t.priority === 'P4');
    try {
      const { page } = await signedInPage(manager.email, VIEWPORTS.phone);
      await page.goto(`${server.url}/admin/service-targets`);
      const row = page.getByRole('form', { name: /Targets for .*P4|Targets for/ }).last();
      await row.getByLabel(/^Restore within$/).fill('12');
      await row.getByLabel('Restore within: unit').selectOption('days');
      await row.getByRole('button', { name: /^Save P4/ }).click();
      await expect
        .poll(async () => (await api.get('/api/service-targets')).body.find((t: any) => t.priority === 'P4').restoreMinutes)
        .toBe(17_280);
      await page.reload();
      const again = page.getByRole('form', { name: /Targets for/ }).last();
      expect(await again.getByLabel(/^Restore within$/).inputValue()).toBe('12');
      expect(await again.getByLabel('Restore within: unit').inputValue()).toBe('days');
      await screenshot(page, 'service-targets-phone');
    } finally {
      await api.put('/api/service-targets/P4', { acknowledgeMinutes: before.acknowledgeMinutes, restoreMinutes: before.restoreMinutes });
    }
  });
});

describe('a tool page on a phone', () => {
  it('when a member opens a tool with a long history, then Follow sits right under the current state, the history is folded, and the tool then shows on "Tools I follow"', async () => {
    const member = await createUser('member');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Long history tool (e2e)' });
    // Thirty automatic busy/idle flips, like a tool in steady use.
    for (let i = 0; i < 30; i++) {
      await changeState(server.deps, { toolId: tool.id, state: i % 2 ? 'standby' : 'productive', source: 'system', actorId: null });
    }
    const { page } = await signedInPage(member.email, VIEWPORTS.phone);
    await page.goto(`${server.url}/tools/${tool.code}`);
    const follow = page.getByRole('button', { name: 'Follow this tool' });
    await follow.waitFor();
    const followY = (await follow.boundingBox())!.y;
    expect(followY).toBeLessThan(VIEWPORTS.phone.height);
    expect(followY).toBeGreaterThan((await page.getByTestId('tool-status').boundingBox())!.y);
    expect(await page.getByTestId('history-entry').count()).toBe(0);
    await screenshot(page, 'tool-page-follow-first-phone', { fullPage: false });

    await page.getByTestId('state-history').locator('summary').click();
    await page.getByText(/automatic changes on this page folded away/).waitFor();
    await follow.click();
    await page.getByRole('button', { name: 'Stop following' }).waitFor();

    await page.goto(`${server.url}/following`);
    const list = page.getByTestId('followed-tools');
    await list.waitFor();
    expect(await list.innerText()).toContain(tool.code);
    await screenshot(page, 'tools-i-follow-phone');
  });
});

describe('the lobby display', () => {
  async function facilityOf(bays: number, perBay: number, attention: number) {
    const codes: string[] = [];
    let down = 0;
    for (let b = 0; b < bays; b++) {
      const area = await makeArea();
      codes.push(area.code);
      for (let i = 0; i < perBay; i++) {
        const { tool } = await makeTool(server.deps.sequelize, { areaId: area.id, name: `Display tool ${b + 1}.${i + 1} (e2e)` });
        if (down++ < attention)
          await changeState(server.deps, {
            toolId: tool.id,
            state: 'unscheduled_downtime',
            reason: 'repair',
            note: 'Pump fault under investigation',
            actorId: null,
            source: 'staff',
          });
      }
    }
    return codes;
  }

  it('when the demo-sized facility (40 tools, 13 needing attention) is shown at 1920×1080 and 1280×720, then every tool is on screen without scrolling, in the facility time zone', async () => {
    const admin = await createUser('admin');
    const api = new TestClient(server.url);
    await api.signIn(admin.email, TEST_PASSWORD);
    const before = (await api.get('/api/facility-settings')).body;
    const codes = await facilityOf(8, 5, 13);
    const link = await api.post('/api/admin/display-links', { name: 'Entrance screen (e2e)' });
    try {
      await api.put('/api/admin/facility-settings', { ...before, timeZone: 'Pacific/Kiritimati' });
      for (const viewport of [
        { width: 1920, height: 1080 },
        { width: 1280, height: 720 },
      ]) {
        const context = await browser.newContext({ viewport });
        contexts.push(context);
        const page = await context.newPage();
        await page.goto(`${server.url}/display/${link.body.key}?areas=${codes.join(',')}`);
        await page.getByTestId('display-board').waitFor();
        await expect.poll(() => page.getByTestId('display-bay-tool').count()).toBe(40);
        await page.waitForTimeout(500);
        expect(await page.getByTestId('display-board').getAttribute('data-pages')).toBe('1');
        expect(await page.locator('[data-testid^="display-tool-"]').count()).toBe(13);
        const offScreen = await page.evaluate(
          () =>
            [...document.querySelectorAll('[data-testid="display-bay-tool"], [data-testid^="display-tool-"]')].filter((el) => {
              const r = el.getBoundingClientRect();
              return r.top < 0 || r.bottom > window.innerHeight || r.left < 0 || r.right > window.innerWidth;
            }).length,
        );
        expect(offScreen).toBe(0);
        expect(await page.evaluate(() => document.documentElement.scrollHeight <= window.innerHeight)).toBe(true);
        expect(await page.getByTestId('display-board').innerText()).toContain('Pacific/Kiritimati');
        const expected = new Intl.DateTimeFormat('en-US', { hour: '2-digit', minute: '2-digit', timeZone: 'Pacific/Kiritimati' })
          .format(new Date())
          .slice(0, 2);
        expect((await page.getByTestId('display-clock').innerText()).slice(0, 2)).toBe(expected);
        await screenshot(page, `display-${viewport.width}x${viewport.height}`, { fullPage: false });
      }
    } finally {
      await api.put('/api/admin/facility-settings', before);
    }
  });

  it('when a facility has more bays than fit, then the display pages through them by itself with a page indicator', async () => {
    const admin = await createUser('admin');
    const api = new TestClient(server.url);
    await api.signIn(admin.email, TEST_PASSWORD);
    const codes = await facilityOf(16, 8, 4);
    const link = await api.post('/api/admin/display-links', { name: 'Big facility screen (e2e)' });
    const context = await browser.newContext({ viewport: { width: 1280, height: 720 } });
    contexts.push(context);
    const page = await context.newPage();
    await page.clock.install();
    await page.goto(`${server.url}/display/${link.body.key}?areas=${codes.join(',')}`);
    const indicator = page.getByTestId('display-page');
    await indicator.waitFor();
    expect(await indicator.innerText()).toMatch(/^Page 1 of \d+/);
    const firstBays = await page.getByTestId('display-bay').allInnerTexts();
    await page.clock.runFor(16_000);
    await expect.poll(() => indicator.innerText()).toMatch(/^Page 2 of/);
    expect(await page.getByTestId('display-bay').allInnerTexts()).not.toEqual(firstBays);
    await screenshot(page, 'display-paged-1280x720', { fullPage: false });
  });
});

describe('one vocabulary for states', () => {
  it('when a technician opens "Set tool state" on a ticket, then each choice reads the board word first with the E10 state beside it', async () => {
    const tech = await createUser('technician');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Vocabulary check tool (e2e)' });
    const { client } = await memberClient();
    const t = await fileReport(client, tool.id, { impact: 'still_usable' });
    const { page } = await signedInPage(tech.email, VIEWPORTS.desktop);
    await page.goto(`${server.url}/tickets/${t.id}`);
    await page.getByRole('button', { name: 'Set tool state' }).click();
    const options = await page.getByLabel('State', { exact: true }).locator('option').allInnerTexts();
    expect(options).toContain('Down (Unscheduled downtime)');
    expect(options).toContain('Maintenance (Scheduled downtime)');
    expect(options.every((o) => /^(Running|Limited|Down|Maintenance|Engineering|Offline) \(/.test(o))).toBe(true);
    // The ticket links to its tool's page.
    await page.getByTestId('ticket-tool-link').click();
    await page.waitForURL(new RegExp(`/tools/${tool.code}$`));
    await page.getByTestId('tool-status').waitFor();
    expect(await page.getByTestId('tool-status').innerText()).not.toMatch(/Tool state/);
  });
});

describe('ticket actions', () => {
  it('when a technician opens a reported "tool stopped" ticket, then the next steps lead, the rest sit apart, and a one-click step says it was done', async () => {
    const tech = await createUser('technician');
    const { tool } = await createTool(server.deps.sequelize, { name: 'Actions check tool (e2e)' });
    const { client } = await memberClient();
    const t = await fileReport(client, tool.id, { impact: 'tool_stopped' });
    const { page } = await signedInPage(tech.email, VIEWPORTS.phone);
    await page.goto(`${server.url}/tickets/${t.id}`);
    const next = page.getByTestId('next-steps');
    await next.waitFor();
    expect(await next.getByRole('button').allInnerTexts()).toEqual(['Confirm it is Down', 'Not down: revert', 'Acknowledge']);
    const others = await page.getByTestId('other-actions').getByRole('button').allInnerTexts();
    expect(others).toEqual(expect.arrayContaining(['Assign', 'Change priority', 'Set tool state']));
    expect(others).not.toContain('Acknowledge');
    await next.getByRole('button', { name: 'Acknowledge' }).click();
    await page.getByText('Acknowledged.', { exact: true }).waitFor();
    await expect
      .poll(() => page.getByTestId('next-steps').getByRole('button').allInnerTexts())
      .toEqual(expect.arrayContaining(['Start repair', 'Mark fixed']));
    await screenshot(page, 'ticket-actions-phone');
  });
});
