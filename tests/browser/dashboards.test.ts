// Each role's dashboard and the notification bell in the browser. What each role's first screen
// holds is Phaselot's own rule (issue 14: a new user at each role finds their work there); that
// every row opens its record and that the page passes axe-core with no serious or critical
// violation (WCAG 2.1 AA rules as axe-core encodes them) is checked on the seeded demo site.
// Screenshots at 1400 and 390 px.
import { mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/schemas/roles';
import { freshUser } from '../helpers/api';
import { benchFile, sampleOf, uploadBench } from '../helpers/bench';
import { receivedLot } from '../helpers/receivedLot';
import { seriousViolations } from './axe';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
  // The first page a fresh server serves can take longer than a step's 10 s on a busy machine: the
  // sign-in page is opened once here, with room, so the tests' own steps time what they test.
  const page = await rig.browser.newPage();
  await page.goto(`${rig.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').waitFor({ timeout: 60_000 });
  await page.close();
}, 90_000);
afterAll(async () => rig?.close());

const shots = join(tmpdir(), 'phaselot-dashboard-shots');
mkdirSync(shots, { recursive: true });

/** The section each role sees and the panels it must hold (panel titles as on screen). */
const SECTIONS: Partial<Record<Role, { section: string; panels: string[]; opens: RegExp }>> = {
  clerk: { section: 'Receiving', panels: ['PO lines due', 'Shipments to receive'], opens: /\/purchasing\/orders\/\d+$/ },
  inspector: { section: 'Inspection', panels: ['Lots to measure'], opens: /\/inspection\/lots\/\d+$/ },
  quality: { section: 'Quality', panels: ['Lots awaiting signature', 'Open NCRs', 'Calibrations due'], opens: /\/inspection\/lots\/\d+$/ },
  buyer: { section: 'Purchasing', panels: ['Rejected lots, last 90 days', 'Open corrective actions'], opens: /\/lots\/\d+$/ },
  auditor: { section: 'Audit', panels: ['Recent documents', 'Audit chain'], opens: /\/lots\/\d+$/ },
};

const noSideways = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth);

describe('the dashboard of each role', () => {
  for (const [role, expected] of Object.entries(SECTIONS) as [Role, NonNullable<(typeof SECTIONS)[Role]>][]) {
    it(`shows the ${role} their work, each row a link`, async () => {
      const page = await signedInPage(rig, role);
      const section = page.getByTestId(`section-${expected.section.toLowerCase()}`);
      await section.getByRole('heading', { name: expected.section, exact: true }).waitFor();
      for (const panel of expected.panels) await section.getByRole('heading', { name: panel, exact: true }).waitFor();
      // Only this role's section: the others' headings are absent.
      for (const other of Object.values(SECTIONS).filter((s) => s.section !== expected.section))
        expect(await page.getByTestId(`section-${other.section.toLowerCase()}`).count(), other.section).toBe(0);
      // The seeded site gives every role something to show: the first panel lists at least one row.
      const firstPanel = section.getByRole('region', { name: expected.panels[0], exact: true });
      const total = Number((await firstPanel.getByTestId(/-total$/).textContent())!.replace(/\s/g, ''));
      expect(total, `${role}: ${expected.panels[0]}`).toBeGreaterThan(0);
      expect(await seriousViolations(page)).toEqual([]);
      await page.screenshot({ path: join(shots, `${role}-1400.png`), fullPage: true });

      await page.setViewportSize({ width: 390, height: 844 });
      await section.getByRole('heading', { name: expected.panels[0], exact: true }).waitFor();
      expect(await noSideways(page)).toBe(true);
      await page.screenshot({ path: join(shots, `${role}-390.png`), fullPage: true });

      await firstPanel.getByRole('listitem').first().getByRole('link').click();
      await page.waitForURL(expected.opens);
      await page.context().close();
    });
  }

  it('shows the administrator, who has no queue of their own, the areas instead', async () => {
    const page = await signedInPage(rig, 'admin');
    await page.getByRole('region', { name: 'Areas' }).getByRole('link', { name: 'Users' }).waitFor();
    expect(await page.getByTestId(/^section-/).count()).toBe(0);
    await page.context().close();
  });
});

describe('the bell', () => {
  it('counts unread notifications, lists them with links, and marks them read', async () => {
    const quality = await freshUser(['quality']);
    // Two lots whose samples fail: each waits for this quality manager's signed decision.
    const lots = [];
    for (let i = 0; i < 2; i++) {
      const lot = await receivedLot({ quantity: 20, level: 'II', aql: 1 });
      const { sample } = await sampleOf(lot.lotId);
      await uploadBench(lot.lotId, 'bench.csv', benchFile(sample, sample.slice(0, 3)));
      lots.push(lot);
    }
    const context = await rig.browser.newContext({ viewport: { width: 1400, height: 900 } });
    context.setDefaultTimeout(10_000);
    const page = await context.newPage();
    await page.goto(`${rig.baseUrl}/sign-in`);
    await page.getByLabel('E-mail').fill(quality.email);
    await page.getByLabel('Password').fill(quality.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByTestId('signed-in-user').waitFor();

    const bell = page.getByRole('button', { name: /^Notifications/ });
    // The count arrives with the first poll of the notifications, after the page has drawn.
    await expect.poll(() => bell.getAttribute('aria-label')).toBe('Notifications, 2 unread');
    await expect(page.getByTestId('unread-count').textContent()).resolves.toBe('2');
    await bell.click();
    const panel = page.getByRole('dialog', { name: 'Notifications' });
    await panel.getByRole('link', { name: new RegExp(`Lot L-${lots[0].lotId} awaits a signed decision`) }).waitFor();
    expect(await seriousViolations(page)).toEqual([]);
    await page.screenshot({ path: join(shots, 'bell-1400.png') });

    await panel.getByRole('link', { name: new RegExp(`Lot L-${lots[1].lotId} awaits`) }).click();
    await page.waitForURL(`**/inspection/lots/${lots[1].lotId}`);
    await expect.poll(() => bell.getAttribute('aria-label')).toBe('Notifications, 1 unread');

    await page.setViewportSize({ width: 390, height: 844 });
    await bell.click();
    await panel.getByRole('link').first().waitFor();
    expect(await noSideways(page)).toBe(true);
    await page.screenshot({ path: join(shots, 'bell-390.png') });
    await panel.getByRole('button', { name: 'Mark all read' }).click();
    await expect.poll(() => bell.getAttribute('aria-label')).toBe('Notifications, none unread');
    expect(await page.getByTestId('unread-count').count()).toBe(0);
    await context.close();
  });
});
