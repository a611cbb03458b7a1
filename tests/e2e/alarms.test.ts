import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import type { Browser, BrowserContext } from 'playwright-core';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { projectRoot } from '../support/env';
import { createTool, drainOutbox } from '../integration/tickets-fixtures';

// The tool simulator plays its stream (a chattering level switch, a vacuum-trip flood, a
// gas-detector alarm, counters, a pressure alarm left set) against the real app; people then
// see it on the tool page, the ticket page and the analytics page.

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

function runSimulator(code: string, key: string) {
  return new Promise<string>((resolve, reject) => {
    const child = spawn(
      process.execPath,
      ['--import', 'tsx', 'scripts/tool-sim.ts', '--tool', code, '--key', key, '--url', server.url, '--fast'],
      { cwd: projectRoot, stdio: ['ignore', 'pipe', 'pipe'] },
    );
    let out = '';
    child.stdout.on('data', (d) => (out += String(d)));
    child.stderr.on('data', (d) => (out += String(d)));
    child.once('exit', (code) => (code === 0 ? resolve(out) : reject(new Error(`tool-sim exited ${code}:\n${out}`))));
  });
}

async function pageAs(email: string, viewport: { width: number; height: number }) {
  const context = await browser.newContext({ viewport });
  contexts.push(context);
  const page = await context.newPage();
  await signInThroughPage(page, server.url, email, TEST_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
  return page;
}

describe('alarms from a tool, seen by people', () => {
  it('when the simulator runs, then the tool page shows the active alarm and the chattering mark, the ticket page the alarm history, and analytics the alarm load', async () => {
    const tech = await createUser('technician', { name: 'Ines Marlow (test)' });
    const manager = await createUser('manager', { name: 'Teo Brandt (test)' });
    const { tool } = await createTool(server.deps.sequelize, { name: 'ICP etcher (alarm e2e)', primaryEngineerId: tech.id });
    const { client: admin } = await signedInClient(server.url, 'admin');
    const key = (await admin.post(`/api/tools/${tool.code}/keys`, { label: 'Host computer' })).body.key as string;
    // The technicians' rules: the level switch opens a ticket; the pressure alarm takes the tool Down.
    await admin.post(`/api/tools/${tool.code}/alarm-definitions/import`, {
      csv: 'alarm id,text,category\n3105,Waste container level high,6\n2041,Chamber pressure high during process step,4',
    });
    const defs = (await admin.get(`/api/tools/${tool.code}/alarm-definitions`)).body.items as { id: number; alarmId: string }[];
    await admin.patch(`/api/alarm-definitions/${defs.find((d) => d.alarmId === '3105')!.id}`, { rule: 'ticket' });
    await admin.patch(`/api/alarm-definitions/${defs.find((d) => d.alarmId === '2041')!.id}`, { rule: 'ticket_down' });

    const output = await runSimulator(tool.code, key);
    expect(output).toContain('done');

    for (const [name, viewport] of Object.entries(VIEWPORTS)) {
      const page = await pageAs(tech.email, viewport);
      await page.goto(`${server.url}/tools/${tool.code}`);
      const active = page.getByTestId('active-alarm-2041');
      await active.waitFor();
      await expect.poll(() => active.textContent()).toContain('Chamber pressure high during process step');
      await page.getByTestId('chattering-alarms').waitFor();
      expect(await page.getByTestId('chattering-alarms').textContent()).toContain('3105');
      await page.getByTestId('tool-alarms').scrollIntoViewIfNeeded();
      await screenshot(page, `alarms-tool-page-${name}`);

      // The ticket the level switch opened: its alarm history.
      await page.goto(`${server.url}/board`);
      await page.getByTestId(`board-alarm-${tool.code}`).waitFor();
      await screenshot(page, `alarms-board-${name}`);
    }

    const tickets = (await admin.get(`/api/tickets?toolId=${tool.id}`)).body.items as { id: number; title: string }[];
    const levelTicket = tickets.find((t) => t.title.includes('Waste container level high'))!;
    expect(levelTicket).toBeTruthy();
    for (const [name, viewport] of Object.entries(VIEWPORTS)) {
      const page = await pageAs(tech.email, viewport);
      await page.goto(`${server.url}/tickets/${levelTicket.id}`);
      await page.getByTestId('ticket-alarm').waitFor();
      expect(await page.getByTestId('ticket-alarm-count').textContent()).toMatch(/Set 4 times/);
      expect(await page.getByTestId('ticket-alarm-history').textContent()).toMatch(
        /set 4 times on this tool in 90 days; 0 earlier tickets/,
      );
      await expect.poll(() => page.getByTestId('ticket-view').textContent()).toContain('Reported by the tool');
      await page.getByTestId('ticket-alarm').scrollIntoViewIfNeeded();
      await screenshot(page, `alarms-ticket-page-${name}`);
    }

    for (const [name, viewport] of Object.entries(VIEWPORTS)) {
      const page = await pageAs(manager.email, viewport);
      await page.goto(`${server.url}/analytics`);
      await page.getByTestId('alarm-load-figures').waitFor();
      expect(await page.getByTestId('alarm-load-tools').textContent()).toContain(tool.code);
      await page.getByTestId('alarm-load').scrollIntoViewIfNeeded();
      await screenshot(page, `alarms-analytics-${name}`);
    }
  }, 180_000);
});
