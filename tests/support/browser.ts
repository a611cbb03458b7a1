import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { projectRoot } from './env';

/** Debian's Chromium, headless, with its background networking switched off. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

export const VIEWPORTS = {
  desktop: { width: 1280, height: 800 },
  phone: { width: 390, height: 844 },
} as const;

const shotsDir = path.join(projectRoot, 'test-results/screenshots');

/** Saves a screenshot (the full page unless told otherwise) as test-results/screenshots/<name>.png for people to look at. */
export async function screenshot(page: Page, name: string, opts: { fullPage?: boolean } = {}) {
  fs.mkdirSync(shotsDir, { recursive: true });
  const file = path.join(shotsDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: opts.fullPage ?? true });
  return file;
}

/** Signs in through the real sign-in page. */
export async function signInThroughPage(page: Page, baseUrl: string, email: string, password: string) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel(/^E-mail address/).fill(email);
  await page.getByLabel(/^Password/).fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
}
