// Every page of the app at a desktop, a tablet and a phone width, as each role allowed to open it:
// the document never scrolls sideways (tables scroll inside their card) and axe-core finds no serious
// or critical violation (WCAG 2.1 A/AA rules and axe's best practices, impact as axe-core rates it).
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { can, type Permission } from '../../shared/policies';
import type { Role } from '../../shared/schemas/roles';
import { seriousViolations } from './axe';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

// 1400: a desktop; 768: a tablet held upright; 390: a phone.
const WIDTHS = [1400, 768, 390] as const;

type Ids = Record<
  'decidedLot' | 'quarantineLot' | 'instrument' | 'order' | 'part' | 'supplier' | 'serial' | 'ncr' | 'deviation' | 'request' | 'switchingPair',
  string
>;
type PageCase = { name: string; path: (ids: Ids) => string; permission?: Permission };

const pages: PageCase[] = [
  { name: 'overview', path: () => '/' },
  { name: 'change password', path: () => '/account/password' },
  { name: 'purchase orders', path: () => '/purchasing/orders', permission: 'catalog.read' },
  { name: 'new purchase order', path: () => '/purchasing/orders/new', permission: 'catalog.write' },
  { name: 'purchase order', path: (ids) => `/purchasing/orders/${ids.order}`, permission: 'catalog.read' },
  { name: 'purchase order edit', path: (ids) => `/purchasing/orders/${ids.order}/edit`, permission: 'catalog.write' },
  { name: 'parts', path: () => '/purchasing/parts', permission: 'catalog.read' },
  { name: 'part', path: (ids) => `/purchasing/parts/${ids.part}`, permission: 'catalog.read' },
  { name: 'suppliers', path: () => '/purchasing/suppliers', permission: 'catalog.read' },
  { name: 'shipments', path: () => '/receiving', permission: 'lots.read' },
  { name: 'receive a shipment', path: () => '/receiving/new', permission: 'shipments.receive' },
  { name: 'lots', path: () => '/lots', permission: 'lots.read' },
  { name: 'decided lot', path: (ids) => `/lots/${ids.decidedLot}`, permission: 'lots.read' },
  { name: 'lot in quarantine', path: (ids) => `/lots/${ids.quarantineLot}`, permission: 'lots.read' },
  { name: 'stock', path: () => '/stock', permission: 'stock.read' },
  { name: 'stock moves', path: () => '/stock/moves', permission: 'stock.read' },
  { name: 'issue', path: () => '/stock/issue', permission: 'stock.move' },
  { name: 'transfer', path: () => '/stock/transfer', permission: 'stock.move' },
  { name: 'put away', path: () => '/stock/put-away', permission: 'stock.move' },
  { name: 'piece search', path: () => '/pieces', permission: 'stock.read' },
  { name: 'piece', path: (ids) => `/pieces/${ids.serial}`, permission: 'stock.read' },
  { name: 'inspection queue', path: () => '/inspection', permission: 'lots.read' },
  { name: 'inspection of a decided lot', path: (ids) => `/inspection/lots/${ids.decidedLot}`, permission: 'lots.read' },
  { name: 'inspection of a lot in quarantine', path: (ids) => `/inspection/lots/${ids.quarantineLot}`, permission: 'lots.read' },
  { name: 'switching', path: () => '/switching', permission: 'switching.read' },
  { name: 'switching of a pair', path: (ids) => `/switching/${ids.switchingPair}`, permission: 'switching.read' },
  { name: 'NCRs', path: () => '/nonconformances', permission: 'nonconformance.read' },
  { name: 'open an NCR', path: () => '/nonconformances/new', permission: 'nonconformance.open' },
  { name: 'returns', path: () => '/nonconformances/returns', permission: 'nonconformance.read' },
  { name: 'defect codes', path: () => '/nonconformances/defect-codes', permission: 'nonconformance.read' },
  { name: 'NCR', path: (ids) => `/nonconformances/${ids.ncr}`, permission: 'nonconformance.read' },
  { name: 'deviations', path: () => '/deviations', permission: 'deviations.read' },
  { name: 'new deviation', path: () => '/deviations/new', permission: 'deviations.manage' },
  { name: 'deviation', path: (ids) => `/deviations/${ids.deviation}`, permission: 'deviations.read' },
  { name: 'corrective actions', path: () => '/corrective-actions', permission: 'corrective.read' },
  { name: 'new corrective action', path: () => '/corrective-actions/new', permission: 'corrective.manage' },
  { name: 'corrective action', path: (ids) => `/corrective-actions/${ids.request}`, permission: 'corrective.read' },
  { name: 'supplier ranking', path: () => '/supplier-performance', permission: 'suppliers.performance' },
  { name: 'supplier performance', path: (ids) => `/supplier-performance/${ids.supplier}`, permission: 'suppliers.performance' },
  { name: 'instruments', path: () => '/instruments', permission: 'instruments.read' },
  { name: 'instrument', path: (ids) => `/instruments/${ids.instrument}`, permission: 'instruments.read' },
  { name: 'certificates', path: () => '/certificates', permission: 'certificates.read' },
  { name: 'exports', path: () => '/exports', permission: 'exports.create' },
  { name: 'audit trail', path: () => '/audit', permission: 'audit.read' },
  { name: 'users', path: () => '/admin/users', permission: 'users.manage' },
  { name: 'site settings', path: () => '/admin/settings', permission: 'settings.manage' },
  { name: 'outgoing mail', path: () => '/admin/mail', permission: 'mail.read' },
];

const publicPages = ['/sign-in', '/forgot-password', '/reset-password', '/verify', '/respond'];

/** The first value of the first row, or a failure naming what the demo lacks. */
async function one(what: string, sql: string): Promise<string> {
  const rows = await sequelize.query<{ value: string | number }>(sql, { type: QueryTypes.SELECT });
  if (!rows[0]) throw new Error(`the demo data has no ${what}`);
  return String(rows[0].value);
}

async function demoIds(): Promise<Ids> {
  return {
    decidedLot: await one('decided lot', `SELECT lot_id AS value FROM dispositions ORDER BY id LIMIT 1`),
    quarantineLot: await one('lot in quarantine', `SELECT id AS value FROM lots WHERE state = 'quarantine' ORDER BY id LIMIT 1`),
    instrument: await one('instrument', `SELECT id AS value FROM instruments ORDER BY id LIMIT 1`),
    order: await one('purchase order', `SELECT id AS value FROM purchase_orders ORDER BY id LIMIT 1`),
    part: await one('part', `SELECT id AS value FROM parts ORDER BY id LIMIT 1`),
    supplier: await one('supplier', `SELECT id AS value FROM suppliers ORDER BY id LIMIT 1`),
    serial: await one('measured piece', `SELECT p.serial AS value FROM pieces p JOIN piece_results r ON r.piece_id = p.id ORDER BY p.id LIMIT 1`),
    ncr: await one('NCR', `SELECT id AS value FROM nonconformances ORDER BY id LIMIT 1`),
    deviation: await one('deviation', `SELECT id AS value FROM deviations ORDER BY id LIMIT 1`),
    request: await one('corrective-action request', `SELECT id AS value FROM corrective_actions ORDER BY id LIMIT 1`),
    switchingPair: await one('switching pair', `SELECT supplier_id || '/' || part_id AS value FROM switching_states ORDER BY supplier_id, part_id LIMIT 1`),
  };
}

/** What is wrong with the page as it is on screen at each width: sideways overflow and axe violations. */
async function problemsAt(page: Page, name: string): Promise<string[]> {
  const problems: string[] = [];
  for (const width of WIDTHS) {
    await page.setViewportSize({ width, height: 900 });
    // Two frames: the media queries of the new width are applied and laid out.
    await page.evaluate(() => new Promise((done) => requestAnimationFrame(() => requestAnimationFrame(done))));
    const { scrollWidth, clientWidth } = await page.evaluate(() => ({
      scrollWidth: document.documentElement.scrollWidth,
      clientWidth: document.documentElement.clientWidth,
    }));
    if (scrollWidth > clientWidth) problems.push(`${name} at ${width} px: the page is ${scrollWidth} px wide in a ${clientWidth} px window`);
    for (const violation of await seriousViolations(page)) problems.push(`${name} at ${width} px: ${violation}`);
  }
  return problems;
}

async function visit(page: Page, url: string) {
  await page.setViewportSize({ width: WIDTHS[0], height: 900 });
  const response = await page.goto(url);
  // A page the server did not serve (the client build being replaced meanwhile) is not the app's page.
  if (!response?.ok()) throw new Error(`${url} answered ${response?.status()} instead of the app`);
  await page.waitForLoadState('networkidle');
  // Pages say "Loading…" while their data is on its way; the check is of the page with its data.
  await page.getByText('Loading…', { exact: false }).first().waitFor({ state: 'hidden' });
}

/**
 * The roles a page is checked as: the first role holding its permission in the order below (the
 * roles that change things see the most controls), or every such role with PHASELOT_ALL_ROLES=1.
 */
const ROLE_ORDER = ['quality', 'buyer', 'clerk', 'inspector', 'admin', 'auditor'] as const satisfies readonly Role[];
function rolesFor(permission: Permission | undefined): Role[] {
  const allowed = ROLE_ORDER.filter((role) => !permission || can({ roles: [role] }, permission));
  return process.env.PHASELOT_ALL_ROLES === '1' ? allowed : allowed.slice(0, 1);
}

let rig: BrowserRig;
let ids: Ids;
const signedIn = new Map<Role, Promise<Page>>();
beforeAll(async () => {
  rig = await startBrowserRig();
  ids = await demoIds();
});
afterAll(async () => {
  for (const page of signedIn.values()) await (await page).context().close();
  await rig?.close();
});

/** One signed-in tab per role, shared by that role's pages. */
function pageOf(role: Role): Promise<Page> {
  if (!signedIn.has(role)) signedIn.set(role, signedInPage(rig, role));
  return signedIn.get(role)!;
}

describe('layout and accessibility of every page at 1400, 768 and 390 px', () => {
  it('covers every route of the router', () => {
    // A page added to the router without a case here would go unchecked.
    const routes = [...readFileSync(new URL('../../src/app/router.tsx', import.meta.url), 'utf8').matchAll(/path: '([^']+)'/g)].map((m) => m[1]);
    const placeholders: Ids = {
      decidedLot: ':lotId',
      quarantineLot: ':lotId',
      instrument: ':id',
      order: ':orderId',
      part: ':partId',
      supplier: ':supplierId',
      serial: ':serial',
      ncr: ':ncrId',
      deviation: ':deviationId',
      request: ':requestId',
      switchingPair: ':supplierId/:partId',
    };
    const covered = new Set([...pages.map((p) => p.path(placeholders).replace(/^\//, '') || '/'), ...publicPages]);
    // Redirects and the not-found page have nothing of their own to check.
    const uncovered = routes.filter((route) => !covered.has(route) && route !== '*' && route !== 'purchasing');
    expect(uncovered).toEqual([]);
  });

  for (const path of publicPages) {
    it(`signed out: ${path}`, async () => {
      const context = await rig.browser.newContext({ viewport: { width: WIDTHS[0], height: 900 } });
      context.setDefaultTimeout(10_000);
      const page = await context.newPage();
      await visit(page, `${rig.baseUrl}${path}`);
      const problems = await problemsAt(page, path);
      await context.close();
      expect(problems).toEqual([]);
    });
  }

  for (const { name, path, permission } of pages) {
    for (const role of rolesFor(permission)) {
      it(`as the ${role}: ${name}`, async () => {
        const page = await pageOf(role);
        await visit(page, `${rig.baseUrl}${path(ids)}`);
        expect(await problemsAt(page, name)).toEqual([]);
      });
    }
  }
});

describe('the menu on a phone, from the keyboard alone', () => {
  it('skips to the content, opens the menu at the current page, closes on Escape and on a choice, focus back on its button', async () => {
    const page = await signedInPage(rig, 'quality');
    await page.setViewportSize({ width: 390, height: 800 });
    await page.goto(`${rig.baseUrl}/lots`);
    await page.waitForLoadState('networkidle');
    await page.getByRole('heading', { name: 'Lots', exact: true }).waitFor();
    const menu = page.getByRole('navigation', { name: 'Main' });
    const menuButton = page.getByRole('button', { name: 'Menu', exact: true });
    const focused = () => page.evaluate(() => ({ text: document.activeElement?.textContent?.trim(), id: document.activeElement?.id }));

    // The first Tab reaches the skip link, shown while focused; it moves the focus to the page's content.
    await page.keyboard.press('Tab');
    expect(await focused()).toMatchObject({ text: 'Skip to main content' });
    expect(await page.getByRole('link', { name: 'Skip to main content' }).isVisible()).toBe(true);
    await page.keyboard.press('Enter');
    expect(await focused()).toMatchObject({ id: 'main-content' });

    // The side bar is folded away; the next Tab from the top is the menu button.
    expect(await menu.isVisible()).toBe(false);
    await page.goto(`${rig.baseUrl}/lots`);
    await menuButton.waitFor({ state: 'visible' });
    await page.keyboard.press('Tab');
    await page.keyboard.press('Tab');
    expect(await focused()).toMatchObject({ text: 'Menu' });
    expect(await menuButton.getAttribute('aria-expanded')).toBe('false');

    // Opened, the focus is on the page one is on, marked as the current page.
    await page.keyboard.press('Enter');
    expect(await menuButton.getAttribute('aria-expanded')).toBe('true');
    expect(await menu.isVisible()).toBe(true);
    expect(await focused()).toMatchObject({ text: 'Lots' });
    expect(await menu.getByRole('link', { name: 'Lots' }).getAttribute('aria-current')).toBe('page');

    // Escape closes it and gives the focus back to its button.
    await page.keyboard.press('Escape');
    expect(await menu.isVisible()).toBe(false);
    expect(await focused()).toMatchObject({ text: 'Menu' });

    // A choice made with the keyboard opens that page, closes the menu and returns the focus.
    await page.keyboard.press('Enter');
    await page.keyboard.press('Tab');
    expect(await focused()).toMatchObject({ text: 'Inspection' });
    await page.keyboard.press('Enter');
    await page.waitForURL(`${rig.baseUrl}/inspection`);
    expect(await menu.isVisible()).toBe(false);
    expect(await focused()).toMatchObject({ text: 'Menu' });
    await page.keyboard.press('Enter');
    await expect.poll(() => menu.getByRole('link', { name: 'Inspection' }).getAttribute('aria-current')).toBe('page');
    expect(await menu.getByRole('link', { name: 'Lots' }).getAttribute('aria-current')).toBeNull();
    await page.context().close();
  });
});
