// Scanning and labels in the browser: the header's scan box fed as a keyboard-wedge scanner feeds it
// (the code's characters at once, then Enter) with a serial, a lot name, a PO number and an unknown
// code, and a scan made while no field has the focus; the clerk scanning serials into a receipt; the
// lot page's label PDF whose Data Matrix codes decode (ZXing) to the lot's serials. Screenshots at
// 1400 and 390 px.
import { mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pdfCodes } from '../helpers/pdfCodes';
import { uniqueTag } from '../helpers/purchasing';
import { receivedLot } from '../helpers/receivedLot';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

const shots = join(tmpdir(), 'phaselot-scanning-shots');
mkdirSync(shots, { recursive: true });

/** As a keyboard-wedge scanner types: every character without pause, then Enter. */
async function scan(page: Page, code: string) {
  const box = page.getByRole('search', { name: 'Scan or find' }).getByRole('textbox');
  await box.click();
  await box.pressSequentially(code);
  await box.press('Enter');
}

describe('the scan box', () => {
  it('opens a serial, a lot and a PO, and says when nothing is found', async () => {
    const lot = await receivedLot({ quantity: 3 });
    const page = await signedInPage(rig, 'clerk');

    await scan(page, lot.serials[1]);
    await page.getByRole('heading', { name: `Serial ${lot.serials[1]}` }).waitFor();
    await scan(page, `L-${lot.lotId}`);
    await page.getByRole('heading', { name: `Lot L-${lot.lotId}` }).waitFor();
    await page.screenshot({ path: join(shots, 'lot-labels-1400.png'), fullPage: true });
    await scan(page, lot.poNumber);
    await page.getByRole('heading', { name: `Purchase order ${lot.poNumber}` }).waitFor();

    const unknown = `NX-${uniqueTag()}`;
    await scan(page, unknown);
    const result = page.getByRole('dialog', { name: 'Scan result' });
    await result.getByText(`Nothing found for ${unknown}`).waitFor();
    await page.screenshot({ path: join(shots, 'nothing-found-1400.png') });
    await result.getByRole('link', { name: 'Purchase orders' }).click();
    await page.waitForURL(`**/purchasing/orders?q=${unknown}`);
    expect(await page.getByRole('dialog', { name: 'Scan result' }).count()).toBe(0);

    await page.setViewportSize({ width: 390, height: 844 });
    await scan(page, `L-${lot.lotId}`);
    await page.getByRole('heading', { name: `Lot L-${lot.lotId}` }).waitFor();
    await page.screenshot({ path: join(shots, 'lot-labels-390.png'), fullPage: true });
    await scan(page, unknown);
    await page.getByRole('dialog', { name: 'Scan result' }).getByText(`Nothing found for ${unknown}`).waitFor();
    await page.screenshot({ path: join(shots, 'nothing-found-390.png') });
    await page.context().close();
  });

  it('takes a scan made while no field has the focus', async () => {
    const lot = await receivedLot({ quantity: 2 });
    const page = await signedInPage(rig, 'inspector');
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    // A scanner's burst: the keys follow each other within milliseconds, which a person's typing does not.
    await page.evaluate((code) => {
      for (const key of [...code, 'Enter']) window.dispatchEvent(new KeyboardEvent('keydown', { key, bubbles: true }));
    }, lot.serials[0]);
    await page.getByRole('heading', { name: `Serial ${lot.serials[0]}` }).waitFor();
    await page.context().close();
  });
});

describe('labels from the lot page', () => {
  it('opens a PDF with one label per serial whose codes decode to the serials', async () => {
    const lot = await receivedLot({ quantity: 2 });
    const page = await signedInPage(rig, 'clerk');
    await page.goto(`${rig.baseUrl}/lots/${lot.lotId}`);
    const labels = page.getByRole('group', { name: `Labels of L-${lot.lotId}` });
    await labels.getByLabel('What to print').selectOption({ label: 'A label per serial' });
    await labels.getByLabel('Label stock').selectOption({ label: '4 × 6 in shipping label' });
    const href = await labels.getByRole('link', { name: 'Open labels (PDF)' }).getAttribute('href');
    expect(href).toBe(`/api/labels/lots/${lot.lotId}?kind=serials&stock=4x6in`);
    const response = await page.request.get(`${rig.baseUrl}${href}`);
    expect(response.headers()['content-type']).toBe('application/pdf');
    expect(await pdfCodes(Buffer.from(await response.body()))).toEqual(lot.serials.map((serial) => [serial]));
    // Quarantine is offered while the pieces wait there; accepted and material review are not.
    const kinds = await labels.getByLabel('What to print').locator('option').allTextContents();
    expect(kinds).toEqual(['Lot label', 'A label per serial', 'Status: quarantine']);
    await page.context().close();
  });
});

describe('receiving by scanning', () => {
  it('appends each scanned serial to the list, refuses one already there, and counts them', async () => {
    const page = await signedInPage(rig, 'clerk');
    await page.goto(`${rig.baseUrl}/receiving/new`);
    const form = page.getByRole('form', { name: 'Receive shipment' });
    const field = form.getByLabel('Scan a serial');
    const tag = uniqueTag();
    for (const serial of [`SC${tag}-0001`, `SC${tag}-0002`]) {
      await field.pressSequentially(serial);
      await field.press('Enter');
    }
    expect(await form.getByLabel('Serial numbers').inputValue()).toBe(`SC${tag}-0001\nSC${tag}-0002`);
    await field.pressSequentially(`SC${tag}-0001`);
    await field.press('Enter');
    await form.getByText(`SC${tag}-0001 is already in the list (line 1); not added again`).waitFor();
    expect(await form.getByTestId('scanned-count').textContent()).toBe('2');
    expect(await form.getByLabel('Serial numbers').inputValue()).toBe(`SC${tag}-0001\nSC${tag}-0002`);
    // Enter in the scan field did not submit the receipt.
    expect(await form.getByText('Nothing was received').count()).toBe(0);
    await page.screenshot({ path: join(shots, 'receive-scan-1400.png'), fullPage: true });
    await page.setViewportSize({ width: 390, height: 844 });
    await page.screenshot({ path: join(shots, 'receive-scan-390.png'), fullPage: true });
    await page.context().close();
  });
});
