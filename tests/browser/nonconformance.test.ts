// The NCR pages as the quality manager uses them: open an NCR for a plate found failing at assembly,
// then on a rejected lot's NCR disposition the failed pieces (a wrong password first), return the rest
// and ship them back under the supplier's RMA; the clerk receives the replacement against the NCR and
// the PO shows it. Screenshots at desktop and phone widths.
import { mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sequelize } from '../../db';
import { DEMO_PASSWORD } from '../../db/seeders/demo';
import { as } from '../helpers/api';
import { benchFile, sampleOf, signDecision, uploadBench } from '../helpers/bench';
import { receivedLot } from '../helpers/receivedLot';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

const shots = join(tmpdir(), 'phaselot-nonconformance-shots');
mkdirSync(shots, { recursive: true });

async function decidedLot(quantity: number, bad: number, decision: 'accept' | 'reject') {
  const lot = await receivedLot({ quantity, level: 'II', aql: 1 });
  const { sample } = await sampleOf(lot.lotId);
  await uploadBench(lot.lotId, 'bench.csv', benchFile(sample, sample.slice(0, bad)));
  await signDecision(lot.lotId, decision, null);
  return { ...lot, failed: sample.slice(0, bad) };
}

async function stateOf(serials: string[]) {
  const rows = await sequelize.query<{ state: string; n: number }>('SELECT state, count(*)::int AS n FROM pieces WHERE serial IN (:serials) GROUP BY state', {
    type: QueryTypes.SELECT,
    replacements: { serials },
  });
  return Object.fromEntries(rows.map((r) => [r.state, r.n]));
}

describe('the NCR pages in the browser', () => {
  it('opens an NCR for a serial found at assembly', async () => {
    const lot = await decidedLot(20, 0, 'accept');
    const serial = lot.serials[3];
    await (await as('clerk')).post('/api/stock/issue').send({ partId: lot.partId, serials: serial, workOrder: 'WO-BROWSER-1' }).expect(201);
    const [{ number }] = await sequelize.query<{ number: string }>('SELECT number FROM parts WHERE id = :id', {
      type: QueryTypes.SELECT,
      replacements: { id: lot.partId },
    });

    const page = await signedInPage(rig, 'quality');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Nonconformance' }).click();
    await page.getByRole('link', { name: 'Open an NCR' }).click();
    const form = page.getByRole('form', { name: 'Open an NCR' });
    await form.getByLabel('Find the part').fill(number);
    await form.getByLabel('Part', { exact: true }).locator(`option:has-text("${number}")`).waitFor({ state: 'attached' });
    await form.getByLabel('Part', { exact: true }).selectOption({ label: `${number} · Test retarder` });
    await form.getByLabel('Serial numbers').fill(serial);
    await form.getByLabel(/Fast-axis mark error/).check();
    await form.getByLabel('What was found').fill('Beam rotated at final alignment: the fast-axis mark is about 2° off');
    await form.getByLabel('Containment').fill('Plate pulled from the build, other plates of the lot checked');
    await page.screenshot({ path: join(shots, 'open-ncr-desktop.png'), fullPage: true });
    await form.getByRole('button', { name: 'Open the NCR' }).click();

    await page.getByRole('heading', { name: /^NCR-\d{4}-\d{4}$/ }).waitFor();
    const pieces = page.getByRole('region', { name: 'Pieces (1)' });
    expect(await pieces.getByRole('cell', { name: 'MRB' }).count()).toBe(1);
    expect(await page.getByLabel('Defect codes').getByText('Fast-axis mark error').count()).toBe(1);
    expect(await stateOf([serial])).toEqual({ held: 1 });
    await page.context().close();
  });

  it('dispositions a rejected lot piece by piece under signatures and ships the rest back under an RMA', async () => {
    const lot = await decidedLot(13, 2, 'reject');
    const list = (await (await as('quality')).get(`/api/nonconformances?lotId=${lot.lotId}`).expect(200)).body.data;
    const ncrNumber = list[0].number as string;

    const page = await signedInPage(rig, 'quality');
    await page.goto(`${rig.baseUrl}/nonconformances?q=${encodeURIComponent(lot.failed[0])}`);
    await page.getByRole('cell', { name: ncrNumber }).click();
    await page.getByRole('heading', { name: ncrNumber }).waitFor();
    await page.getByText('13 pieces await a disposition', { exact: false }).waitFor();
    await page.screenshot({ path: join(shots, 'ncr-open-desktop.png'), fullPage: true });

    // Scrap the two failed plates: tick them, choose scrap, a wrong password first.
    for (const serial of lot.failed) await page.getByLabel(`Choose ${serial}`).check();
    await page.getByRole('button', { name: 'Sign a disposition' }).click();
    const form = page.getByRole('form', { name: 'Sign a disposition' });
    await form.getByText('Covers the 2 pieces ticked').waitFor();
    await form.getByLabel('Scrap').check();
    await form.getByLabel('Note (optional)').fill('Edges chipped as well');
    await form.getByLabel(/I have read the meaning/).check();
    await form.getByLabel('Your password (re-entered to sign)').fill('not-the-password');
    await form.getByRole('button', { name: 'Sign: scrap' }).click();
    await form.getByRole('alert').filter({ hasText: 'The password does not match' }).waitFor();
    expect(await form.getByLabel('Note (optional)').inputValue()).toBe('Edges chipped as well');
    expect(await stateOf(lot.failed)).toEqual({ returned: 2 });
    await form.getByLabel('Your password (re-entered to sign)').fill(DEMO_PASSWORD);
    await form.getByRole('button', { name: 'Sign: scrap' }).click();
    await page.getByText('Scrap: 2 pieces signed.').waitFor();
    expect(await stateOf(lot.failed)).toEqual({ scrapped: 2 });

    // Return every other piece (none ticked: all that still await one).
    await page.getByRole('button', { name: 'Sign a disposition' }).click();
    await form.getByText('every piece still awaiting a disposition (11)').waitFor();
    await form.getByLabel(/I have read the meaning/).check();
    await form.getByLabel('Your password (re-entered to sign)').fill(DEMO_PASSWORD);
    await form.getByRole('button', { name: 'Sign: return to vendor' }).click();
    await page.getByText('Return to vendor: 11 pieces signed.').waitFor();
    await page.getByText('11 pieces to ship back to the vendor', { exact: false }).waitFor();

    // Ship them back under the supplier's RMA, for a replacement.
    await page.getByRole('button', { name: 'Ship back to the vendor' }).click();
    const ship = page.getByRole('form', { name: 'Ship back to the vendor' });
    await ship.getByLabel('RMA number').fill('RMA-40417');
    await ship.getByLabel('Carrier').fill('Brightline Freight');
    await ship.getByLabel('Tracking (optional)').fill('BF-88-2231');
    await page.screenshot({ path: join(shots, 'ship-back-desktop.png'), fullPage: true });
    await ship.getByRole('button', { name: 'Record the shipment' }).click();
    await page.getByText('11 pieces shipped back under RMA RMA-40417.').waitFor();
    await page.getByText('Every disposition has been carried out.').waitFor();
    const records = page.getByRole('region', { name: 'Returns and replacements' });
    expect(await records.getByText('RMA RMA-40417').count()).toBe(1);
    expect(await stateOf(lot.serials)).toEqual({ scrapped: 2, 'shipped-back': 11 });

    await page.screenshot({ path: join(shots, 'ncr-shipped-desktop.png'), fullPage: true });
    await page.setViewportSize({ width: 390, height: 844 });
    await page.screenshot({ path: join(shots, 'ncr-shipped-390.png'), fullPage: true });
    await page.goto(`${rig.baseUrl}/nonconformances`);
    await page.getByRole('cell', { name: ncrNumber }).waitFor();
    await page.screenshot({ path: join(shots, 'ncr-list-390.png'), fullPage: true });
    await page.setViewportSize({ width: 1400, height: 900 });
    await page.screenshot({ path: join(shots, 'ncr-list-desktop.png'), fullPage: true });
    await page.goto(`${rig.baseUrl}/nonconformances/returns`);
    await page.getByRole('cell', { name: 'RMA-40417' }).waitFor();
    await page.screenshot({ path: join(shots, 'returns-desktop.png'), fullPage: true });
    await page.context().close();

    // The replacement arrives: the clerk names the NCR on the receiving form, beyond what the line expects.
    const clerk = await signedInPage(rig, 'clerk');
    await clerk.goto(`${rig.baseUrl}/receiving/new`);
    const receive = clerk.getByRole('form', { name: 'Receive shipment' });
    const lineOption = receive.getByLabel('PO line').locator('option', { hasText: `${lot.poNumber} / 1 ` });
    await receive.getByLabel('PO line').selectOption((await lineOption.getAttribute('value'))!);
    await receive.getByLabel('Replacement for an NCR (optional)').selectOption({ label: `${ncrNumber} · 11 pieces owed` });
    await receive.getByLabel('Packing-slip number').fill('PS-REPL-40417');
    await receive.getByLabel("Supplier's lot number").fill('SL-REPL-1');
    await receive.getByLabel('Quantity').fill('11');
    await receive.getByLabel('Serial numbers', { exact: true }).fill(`R${lot.serials[0]}..R${lot.serials[10]}`);
    expect(await receive.getByText('More than the line expects').count()).toBe(0);
    await clerk.screenshot({ path: join(shots, 'receive-replacement-desktop.png'), fullPage: true });
    await receive.getByRole('button', { name: 'Receive into quarantine' }).click();
    await clerk.waitForURL(/\/lots\/\d+\?received=1/);
    await clerk.context().close();

    const buyer = await signedInPage(rig, 'buyer');
    const [{ poId }] = await sequelize.query<{ poId: number }>('SELECT id AS "poId" FROM purchase_orders WHERE number = :number', {
      type: QueryTypes.SELECT,
      replacements: { number: lot.poNumber },
    });
    await buyer.goto(`${rig.baseUrl}/purchasing/orders/${poId}`);
    await buyer.getByText('11 for pieces returned').waitFor();
    await buyer.screenshot({ path: join(shots, 'po-replaced-desktop.png'), fullPage: true });
    await buyer.setViewportSize({ width: 390, height: 844 });
    await buyer.screenshot({ path: join(shots, 'po-replaced-390.png'), fullPage: true });
    await buyer.context().close();
  });
});
