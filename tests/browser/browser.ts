// Browser tests drive Debian's Chromium through playwright-core against the real app, served on a
// free port from the test database. No browser is downloaded.
import { chromium, type Browser, type Page } from 'playwright-core';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { startServer } from '../../server/main';
import { startBackgroundWork, stopBackgroundWork } from '../../server/background';
import { demoLogin } from '../../db/seeders/demo';
import type { Role } from '../../shared/schemas/roles';

export const CHROMIUM_FLAGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

export type BrowserRig = { browser: Browser; server: Server; baseUrl: string; close(): Promise<void> };

export async function startBrowserRig(): Promise<BrowserRig> {
  const server = await startServer(0, '127.0.0.1');
  // Exports and mail are queue jobs, worked by the server's process as under npm start.
  await startBackgroundWork();
  const { port } = server.address() as AddressInfo;
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    // launch() gives every browser a fresh, empty profile directory of its own.
    args: CHROMIUM_FLAGS,
  });
  return {
    browser,
    server,
    baseUrl: `http://127.0.0.1:${port}`,
    async close() {
      await browser.close();
      await stopBackgroundWork();
      server.closeAllConnections();
      await new Promise((done) => server.close(done));
    },
  };
}

/** A new page signed in as the demo account of a role, on the overview. */
export async function signedInPage(rig: BrowserRig, role: Role): Promise<Page> {
  const context = await rig.browser.newContext({ viewport: { width: 1400, height: 900 } });
  // Shorter than the test's own timeout, so a missing element is named in the failure.
  context.setDefaultTimeout(10_000);
  const page = await context.newPage();
  await page.goto(`${rig.baseUrl}/sign-in`);
  const { email, password } = demoLogin(role);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('signed-in-user').waitFor();
  return page;
}
