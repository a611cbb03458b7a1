import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { User } from '../../server/modules/users/user.model';
import { hashPassword } from '../../server/modules/users/password';
import { DEMO_SIGN_INS } from '../../server/db/seed/users';
import { ROLES } from '../../shared/roles';

let server: TestServer;
let browser: Browser;

beforeAll(async () => {
  server = await startTestServer({}, { serveClient: true });
  browser = await launchBrowser();
  // The demo accounts, as `npm start` seeds them (the test database has no demo seed).
  for (const u of DEMO_SIGN_INS) {
    const existing = await User.findOne({ where: { email: u.email } });
    if (!existing)
      await User.create({ email: u.email, name: u.name, role: u.role, passwordHash: await hashPassword(u.password), lastSignInAt: null });
  }
});
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('sign-in and home page', () => {
  for (const role of ROLES) {
    it(`when the demo ${role} signs in, then they land on the home page for their role (desktop and phone)`, async () => {
      const demo = DEMO_SIGN_INS.find((u) => u.role === role)!;
      for (const [size, viewport] of Object.entries(VIEWPORTS)) {
        const context = await browser.newContext({ viewport });
        const page = await context.newPage();
        await signInThroughPage(page, server.url, demo.email, demo.password);
        await page.getByTestId(`home-${role}`).waitFor({ timeout: 10_000 });
        expect(await page.getByTestId('home-card').count()).toBeGreaterThan(0);
        expect(await page.getByTestId(`home-${role}`).innerText()).toContain(demo.name.split(' ')[0]);
        await screenshot(page, `home-${role}-${size}`);
        await context.close();
      }
    });
  }

  it('when the password is wrong, then the sign-in page says so and stays', async () => {
    const context = await browser.newContext({ viewport: VIEWPORTS.phone });
    const page = await context.newPage();
    await signInThroughPage(page, server.url, DEMO_SIGN_INS[0].email, 'definitely-wrong');
    await page.getByRole('alert').waitFor();
    expect(page.url()).toContain('/sign-in');
    await screenshot(page, 'sign-in-error-phone');
    await context.close();
  });

  it('when someone opens a page while signed out, then they are sent to sign-in', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(`${server.url}/admin/mail`);
    await page.waitForURL(/\/sign-in/);
    expect(page.url()).toContain('next=');
    await context.close();
  });
});
