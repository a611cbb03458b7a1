import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import sharp from 'sharp';
import jsQR from 'jsqr';
import { freePort, startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { buildFacility, type BuiltTool } from './board-fixtures';

let server: TestServer;
let browser: Browser;
let tools: Record<string, BuiltTool>;
let areaId: number;

beforeAll(async () => {
  const port = await freePort();
  server = await startTestServer({ PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` }, { serveClient: true });
  browser = await launchBrowser();
  const built = await buildFacility(server.deps);
  tools = built.tools;
  areaId = built.areas[1].id;
});

afterAll(async () => {
  await browser?.close();
  await server?.close();
});

/** Reads a QR code from a PNG screenshot, as a phone camera would. */
async function decodePng(png: Buffer): Promise<string | null> {
  const { data, info } = await sharp(png).flatten({ background: '#ffffff' }).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
  return jsQR(new Uint8ClampedArray(data.buffer, data.byteOffset, data.length), info.width, info.height)?.data ?? null;
}

describe('the QR label sheet', () => {
  it('when a technician opens the label sheet for an area, then every label shows name and code and its QR code (screenshotted in Chromium) decodes to the tool’s page', async () => {
    const email = (await createUser('technician')).email;
    const context = await browser.newContext({ viewport: VIEWPORTS.desktop, deviceScaleFactor: 2 });
    const page = await context.newPage();
    await signInThroughPage(page, server.url, email, TEST_PASSWORD);
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
    await page.goto(`${server.url}/labels?area=${areaId}`);

    const expected = Object.values(tools).filter((t) => t.areaId === areaId);
    expect(expected.length).toBe(4);
    await expect
      .poll(() => page.locator('[data-testid^="label-"]:not([data-testid="label-qr"]):not([data-testid="label-sheet"])').count(), {
        timeout: 10_000,
      })
      .toBe(expected.length);

    for (const tool of expected) {
      const label = page.getByTestId(`label-${tool.code}`);
      const text = await label.textContent();
      expect(text).toContain(tool.name);
      expect(text).toContain(tool.code);
      const qr = label.getByTestId('label-qr');
      await qr.evaluate((img: HTMLImageElement) => (img.complete ? null : new Promise((r) => (img.onload = r))));
      const decoded = await decodePng(await qr.screenshot());
      expect(decoded).toBe(`http://127.0.0.1:${server.port}/tools/${tool.code}`);
    }
    await screenshot(page, 'labels-desktop');
    await context.close();
  });

  it('when a member opens the label page, then it is not offered to them', async () => {
    const email = (await createUser('member')).email;
    const context = await browser.newContext({ viewport: VIEWPORTS.phone });
    const page = await context.newPage();
    await signInThroughPage(page, server.url, email, TEST_PASSWORD);
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
    await page.goto(`${server.url}/labels`);
    await page.getByText('This page is not for your account').waitFor();
    expect(await page.getByTestId('label-sheet').count()).toBe(0);
    await context.close();
  });
});
