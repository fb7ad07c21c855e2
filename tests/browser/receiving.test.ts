import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { TINY_PDF, orderedLine, uniqueTag } from '../helpers/purchasing';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

const files = mkdtempSync(join(tmpdir(), 'phaselot-receiving-'));

describe('purchasing and receiving in the browser', () => {
  it('lets the buyer place a purchase order with two lines', async () => {
    const page = await signedInPage(rig, 'buyer');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Purchasing' }).click();
    await page.getByRole('link', { name: 'New purchase order' }).click();
    const form = page.getByRole('form', { name: 'New purchase order' });
    await form.getByRole('button', { name: 'Place purchase order' }).click();
    await form.getByText('Give the PO number').waitFor();

    const number = `VW-PO-T${uniqueTag()}`;
    await form.getByLabel('PO number').fill(number);
    await form.getByLabel('Supplier').selectOption({ label: 'Quillmere Crystal Foundry' });
    await form.getByLabel('Part of line 1').selectOption({ label: 'VW-QWP-633 — Quarter-wave plate, 632.8 nm, Ø12.7 mm, cemented zero-order' });
    await form.getByLabel('Quantity of line 1').fill('50');
    await form.getByLabel('Unit price of line 1').fill('84.50');
    await form.getByLabel('AQL of line 1').selectOption('0.65');
    // 50 pieces at level II: code letter D; at AQL 0.65 on normal inspection its arrow leads to F,
    // n = 20, Ac 0 / Re 1 (Tables 1 and 2-A; AQLSchemes R/AAZ14Single.R, normal row D at 0.65: 20, 0/1).
    await form
      .getByRole('row', { name: 'Sampling plan of line 1' })
      .getByText('Code letter D (plan of letter F after the arrow), n = 20, Ac 0 / Re 1')
      .waitFor();
    await form.getByRole('button', { name: 'Add line' }).click();
    await form.getByLabel('Part of line 2').selectOption({ label: 'VW-HWP-532 — Half-wave plate, 532 nm, Ø10 mm, MgF₂' });
    await form.getByLabel('Quantity of line 2').fill('10');
    await form.getByLabel('Unit price of line 2').fill('140');
    await form.getByLabel('100 % inspection of line 2').check();
    await form.getByRole('row', { name: 'Sampling plan of line 2' }).getByText('100 % ordered, every piece inspected').waitFor();
    await form.getByRole('button', { name: 'Place purchase order' }).click();

    await page.getByRole('heading', { name: `Purchase order ${number}` }).waitFor();
    await page.getByRole('region', { name: 'Line 1: VW-QWP-633' }).getByText('Level II, AQL 0.65').waitFor();
    const line2 = page.getByRole('region', { name: 'Line 2: VW-HWP-532' });
    await line2.getByText('0 of 10 received, 10 expected').waitFor();
    expect(await line2.getByText('λ/2 at 532 nm').count()).toBe(1);
    await page.context().close();
  });

  it('lets the clerk receive 50 serials given as a range with a PDF, and find the lot in quarantine', async () => {
    const { lineId, tag } = await orderedLine(50);
    const slipFile = join(files, `packing-slip-${tag}.pdf`);
    writeFileSync(slipFile, TINY_PDF);

    const page = await signedInPage(rig, 'clerk');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Receiving' }).click();
    await page.getByRole('link', { name: 'Receive a shipment' }).click();
    const form = page.getByRole('form', { name: 'Receive shipment' });
    await form.getByLabel('PO line').selectOption(String(lineId));
    await form.getByLabel('Packing-slip number').fill(`PS-${tag}`);
    await form.getByLabel("Supplier's lot number").fill(`SL-${tag}`);
    await form.getByLabel('Carrier').fill('Larchway Freight');
    await form.getByLabel('Quantity').fill('49');
    await form.getByLabel('Serial numbers', { exact: true }).fill(`QW${tag}-0001..QW${tag}-0050`);
    expect(await form.getByTestId('serial-count').textContent()).toBe('50');
    await form.getByText('— the quantity says 49').waitFor();
    await form.getByLabel('Packing slip', { exact: true }).setInputFiles(slipFile);
    await form.getByRole('button', { name: 'Receive into quarantine' }).click();
    await form.getByText('The quantity is 49 but the serial numbers give 50').waitFor();

    await form.getByLabel('Quantity').fill('50');
    await form.getByRole('button', { name: 'Receive into quarantine' }).click();
    await page.getByRole('heading', { name: /^Lot L-\d+$/ }).waitFor();
    const lotNumber = (await page.getByRole('heading', { name: /^Lot L-\d+$/ }).textContent())!.replace('Lot ', '');
    await page.getByText('50 pieces are in quarantine').waitFor();
    await page.getByRole('link', { name: `packing-slip-${tag}.pdf` }).waitFor();
    await page.getByRole('region', { name: 'Pieces' }).getByText('50 Quarantine').waitFor();

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Lots' }).click();
    await page.getByLabel('State').selectOption('quarantine');
    await page.getByRole('searchbox', { name: 'Search' }).fill(`QW${tag}-0042`);
    await page.getByText('1 lot · 50 pieces').waitFor();
    const row = page.getByRole('row', { name: new RegExp(`^${lotNumber} `) });
    expect(await row.getByText('Quarantine').count()).toBe(1);
    await page.context().close();
  });

  it('shows the auditor lots and stock without any way to receive or order', async () => {
    const page = await signedInPage(rig, 'auditor');
    await page.goto(`${rig.baseUrl}/purchasing/orders`);
    // The demo's history fills more than one page of orders: find this one by its number.
    await page.getByRole('searchbox').fill('VW-PO-26-0141');
    await page.getByRole('cell', { name: 'VW-PO-26-0141' }).waitFor();
    expect(await page.getByRole('link', { name: 'New purchase order' }).count()).toBe(0);
    await page.goto(`${rig.baseUrl}/receiving/new`);
    await page.getByText('Receiving clerks log shipments').waitFor();
    expect(await page.getByRole('form', { name: 'Receive shipment' }).count()).toBe(0);
    await page.goto(`${rig.baseUrl}/stock`);
    await page.getByRole('cell', { name: 'BIN-A1' }).first().waitFor();
    expect(await page.getByRole('link', { name: 'Issue to work order' }).count()).toBe(0);
    await page.context().close();
  });
});
