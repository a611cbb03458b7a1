import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { AxeBuilder } from '@axe-core/playwright';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { launchBrowser, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createTool, drainOutbox, fileReport } from '../integration/tickets-fixtures';
import { TestClient } from '../support/client';

// Every main page, at desktop and phone width, checked with axe-core (WCAG 2.x A and AA
// rules). Serious and critical findings fail the test; the list printed names each one.

let server: TestServer;
let browser: Browser;
let pages: { name: string; path: string }[] = [];
let adminEmail = '';
let displayPath = '';

beforeAll(async () => {
  const port = await freePort();
  server = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` }, { serveClient: true });
  browser = await launchBrowser();
  const admin = await createUser('admin');
  adminEmail = admin.email;
  const api = new TestClient(server.url);
  await api.signIn(admin.email, TEST_PASSWORD);
  const { tool } = await createTool(server.deps.sequelize, { name: 'Accessibility check tool (e2e)', modules: ['PM1'] });
  const ticket = await fileReport(api, tool.id, { impact: 'tool_stopped', hazards: ['smell'] });
  const link = await api.post('/api/admin/display-links', { name: 'Axe lobby (e2e)' });
  displayPath = `/display/${link.body.key}`;
  pages = [
    { name: 'home', path: '/' },
    { name: 'board', path: '/board' },
    { name: 'tool page', path: `/tools/${tool.code}` },
    { name: 'report form', path: `/report?tool=${tool.code}` },
    { name: 'ticket', path: `/tickets/${ticket.id}` },
    { name: 'my reports', path: '/my-reports' },
    { name: 'queue', path: '/queue' },
    { name: 'analytics', path: '/analytics' },
    { name: 'admin', path: '/admin' },
    { name: 'facility settings', path: '/admin/settings' },
    { name: 'users', path: '/admin/users' },
    { name: 'tools and areas', path: '/admin/facility' },
    { name: 'lobby displays', path: '/admin/displays' },
    { name: 'service targets', path: '/admin/service-targets' },
  ];
});
afterAll(async () => {
  await browser?.close();
  if (server) await drainOutbox(server);
  await server?.close();
});

async function seriousFindings(page: Page) {
  // Let lazy pages, queries and charts settle before looking.
  await page.waitForTimeout(700);
  const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'best-practice']).analyze();
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map(
      (v) =>
        `${v.id} (${v.impact}): ${v.help} — ${v.nodes
          .slice(0, 3)
          .map((n) => n.target.join(' '))
          .join(' | ')}`,
    );
}

describe('accessibility of the main pages', () => {
  for (const [width, viewport] of Object.entries(VIEWPORTS)) {
    it(`when every main page is opened at ${width} width, then axe finds nothing serious or critical`, async () => {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      const found: string[] = [];
      try {
        await page.goto(`${server.url}/sign-in`);
        found.push(...(await seriousFindings(page)).map((f) => `sign-in: ${f}`));
        await signInThroughPage(page, server.url, adminEmail, TEST_PASSWORD);
        await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
        for (const p of pages) {
          await page.goto(`${server.url}${p.path}`);
          await page.locator('main').first().waitFor();
          found.push(...(await seriousFindings(page)).map((f) => `${p.name}: ${f}`));
        }
        const display = await browser.newContext({ viewport: width === 'phone' ? viewport : { width: 1920, height: 1080 } });
        const screen = await display.newPage();
        await screen.goto(`${server.url}${displayPath}`);
        await screen.getByTestId('display-board').waitFor();
        found.push(...(await seriousFindings(screen)).map((f) => `lobby display: ${f}`));
        await display.close();
      } finally {
        await context.close();
      }
      expect(found).toEqual([]);
    }, 300_000);
  }
});
