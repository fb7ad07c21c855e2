// The web surface in a real browser: a page on another origin (another port of 127.0.0.1, the same
// site, so the session cookie goes along) cannot post a receipt; and every page of the built client
// keeps to the content security policy.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Page } from 'playwright-core';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { ROLES } from '../../shared/schemas/roles';
import { freshUser } from '../helpers/api';
import { acceptedLot } from '../helpers/acceptedLot';
import { orderedLine, uniqueTag } from '../helpers/purchasing';
import { startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
let otherSite: Server;
let otherOrigin: string;
let attackPage = '';

beforeAll(async () => {
  rig = await startBrowserRig();
  // The other origin serves whatever page the test puts in `attackPage`.
  otherSite = createServer((_req, res) => res.writeHead(200, { 'content-type': 'text/html' }).end(attackPage));
  await new Promise<void>((done) => otherSite.listen(0, '127.0.0.1', done));
  otherOrigin = `http://127.0.0.1:${(otherSite.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await rig?.close();
  await new Promise((done) => otherSite?.close(done));
});

/** Signs in through the sign-in page, so the browser holds the session cookie. */
async function signIn(page: Page, email: string, password: string) {
  await page.goto(`${rig.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('signed-in-user').waitFor();
}

/** Records every content security policy violation and every console error of a page. */
async function watchPolicy(page: Page) {
  const problems: string[] = [];
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (event) => console.error(`CSP violation: ${event.violatedDirective} ${event.blockedURI}`));
  });
  page.on('console', (message) => {
    if (message.type() === 'error') problems.push(`${page.url()}: ${message.text()}`);
  });
  page.on('pageerror', (error) => problems.push(`${page.url()}: ${error.message}`));
  return problems;
}

describe('the web surface in the browser', () => {
  it('refuses a receipt posted from a page on another port of the same host, with the session cookie', async () => {
    const line = await orderedLine(2);
    const supplierLot = `SL-${uniqueTag()}`;
    const fields = { poLineId: line.lineId, packingSlipNumber: `PS-${uniqueTag()}`, supplierLot, quantity: 2, serials: `${supplierLot}-1, ${supplierLot}-2` };
    attackPage = `<!doctype html><form method="post" enctype="multipart/form-data" action="${rig.baseUrl}/api/shipments">
      ${Object.entries(fields)
        .map(([name, value]) => `<input type="hidden" name="${name}" value="${value}">`)
        .join('')}
      </form><script>document.forms[0].submit()</script>`;
    const { email, password } = await freshUser(['clerk']);
    const context = await rig.browser.newContext();
    const page = await context.newPage();
    await signIn(page, email, password);
    const answer = page.waitForResponse((response) => response.url() === `${rig.baseUrl}/api/shipments`);
    await page.goto(`${otherOrigin}/`);
    const response = await answer;
    expect(response.status()).toBe(403);
    expect((await response.json()).error).toMatchObject({ code: 'cross_origin', message: expect.stringContaining(otherOrigin) });
    expect(await sequelize.query('SELECT id FROM lots WHERE supplier_lot = :supplierLot', { type: QueryTypes.SELECT, replacements: { supplierLot } })).toEqual(
      [],
    );
    await context.close();
  });
});

describe('every page under the content security policy', () => {
  let lot: Awaited<ReturnType<typeof acceptedLot>>;
  let page: Page;
  let problems: string[];
  beforeAll(async () => {
    lot = await acceptedLot(10);
    const { email, password } = await freshUser([...ROLES]);
    const context = await rig.browser.newContext({ viewport: { width: 1400, height: 900 } });
    context.setDefaultTimeout(15_000);
    page = await context.newPage();
    problems = await watchPolicy(page);
    await signIn(page, email, password);
  });
  afterAll(async () => page?.context().close());

  const pages = [
    '/',
    '/purchasing/orders',
    '/purchasing/orders/new',
    '/purchasing/parts',
    '/purchasing/parts/:part',
    '/purchasing/suppliers',
    '/receiving',
    '/receiving/new',
    '/lots',
    '/lots/:lot',
    '/stock',
    '/stock/moves',
    '/stock/issue',
    '/stock/transfer',
    '/stock/put-away',
    '/pieces/:serial',
    '/inspection',
    '/inspection/lots/:lot',
    '/instruments',
    '/certificates',
    '/exports',
    '/audit',
    '/admin/users',
    '/admin/settings',
    '/admin/mail',
    '/verify?number=:number&hash=:hash',
    '/deviations',
    '/deviations/new',
    '/corrective-actions',
    '/corrective-actions/new',
    '/respond',
  ];

  it.each(pages)('%s shows without a violation or console error', async (path) => {
    problems.length = 0;
    const url = path
      .replace(':part', String(lot.partId))
      .replace(':lot', String(lot.lotId))
      .replace(':serial', lot.serials[0])
      .replace(':number', lot.certificate.number)
      .replace(':hash', lot.certificate.dataHash);
    await page.goto(`${rig.baseUrl}${url}`);
    await page.waitForLoadState('networkidle');
    await page.locator('main').waitFor();
    expect(problems).toEqual([]);
  });

  it('cannot be framed by a page on another origin (the signing page here)', async () => {
    attackPage = `<!doctype html><iframe src="${rig.baseUrl}/inspection/lots/${lot.lotId}"></iframe>`;
    problems.length = 0;
    await page.goto(`${otherOrigin}/`);
    await page.waitForLoadState('networkidle');
    const frame = page.frames().find((f) => f !== page.mainFrame());
    expect(frame).toBeDefined();
    expect(await frame!.locator('main').count()).toBe(0);
    expect(problems.join('\n')).toMatch(/frame-ancestors/);
  });
});
