// An instrument's calibrations in the browser: the quality manager opens an instrument from the
// list (due status in words), records a new calibration with its certificate PDF and sees it at the
// head of the history, in force, with the earlier one superseded and the certificate served back; the
// files measured with it link to their lots; an inspector reads the page without the form. Keeping
// each calibration's certificate and interval, and accepting readings only inside one, is common
// practice of metrology in incoming inspection. axe-core checks the page (WCAG 2.1 A/AA rules as it
// encodes them); at 390 px the document does not scroll sideways.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { as } from '../helpers/api';
import { benchFile, sampleOf } from '../helpers/bench';
import { TINY_PDF, uniqueTag } from '../helpers/purchasing';
import { receivedLot } from '../helpers/receivedLot';
import { seriousViolations } from './axe';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

const shots = process.env.SCREENSHOT_DIR ?? join(tmpdir(), 'phaselot-instruments');
mkdirSync(shots, { recursive: true });

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

async function screenshots(page: Page, name: string) {
  await page.screenshot({ path: join(shots, `${name}-1400.png`), fullPage: true });
  const desktop = page.viewportSize()!;
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: join(shots, `${name}-390.png`), fullPage: true });
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  await page.setViewportSize(desktop);
  return overflow;
}

/** A bench instrument calibrated last spring, with one lot's file measured on it. */
async function instrumentWithAFile() {
  const code = `T-UI-${uniqueTag()}`;
  const created = await (
    await as('quality')
  )
    .post('/api/instruments')
    .send({
      code,
      kind: 'stokes-polarimeter',
      description: 'Bench in the test room',
      uncertaintyWaves: 0.0008,
      uncertaintyDeg: 0.05,
      calibratedOn: '2026-04-15',
      calibrationDueOn: '2027-04-15',
    })
    .expect(201);
  const lot = await receivedLot({ quantity: 8 });
  const { sample } = await sampleOf(lot.lotId);
  await (
    await as('inspector')
  )
    .post(`/api/inspection/lots/${lot.lotId}/measurements`)
    .attach('files', Buffer.from(benchFile(sample, [], code)), { filename: 'room-bench.csv', contentType: 'text/csv' })
    .expect(201);
  return { id: created.body.id as number, code, lotId: lot.lotId };
}

describe('instruments and their calibrations in the browser', () => {
  it('records a calibration with its certificate and shows it at the head of the history', async () => {
    const instrument = await instrumentWithAFile();
    const page = await signedInPage(rig, 'quality');
    await page.setViewportSize({ width: 1400, height: 900 });
    await page.goto(`${rig.baseUrl}/instruments`);
    const lapsedRow = page.getByRole('row', { name: /BENCH-0/ });
    await expect.poll(() => lapsedRow.textContent()).toMatch(/Lapsed \d+ days ago \(due 2025-09-01\)/);
    expect(await screenshots(page, 'instruments-list')).toBe(0);

    await page.getByRole('link', { name: instrument.code }).click();
    await page.getByRole('heading', { name: `Instrument ${instrument.code}` }).waitFor();
    const files = page.getByRole('region', { name: 'Bench files measured with it' });
    await files.getByRole('link', { name: `L-${instrument.lotId}` }).waitFor();
    expect(await files.getByText('room-bench.csv').count()).toBe(1);

    await page.getByRole('button', { name: 'Record a calibration' }).click();
    const form = page.getByRole('form', { name: 'Record a calibration' });
    await form.getByLabel('Calibrated on').fill('2026-11-25');
    await form.getByLabel('Due on').fill('2027-11-25');
    await form.getByLabel('Certificate number').fill('OML-26-2210');
    await form.getByLabel('Performed by (laboratory or person)').fill('Oskarvale Metrology Laboratory');
    await form.getByLabel('Stated uncertainty, retardance').fill('0.0007');
    await form.getByLabel('Unit of the retardance uncertainty').selectOption('waves');
    await form.getByLabel('Stated uncertainty, fast axis (°)').fill('0.04');
    await form.getByLabel(/Note on the uncertainties/).fill('k = 2 at 632.8 nm');
    await form.getByLabel(/Calibration certificate/).setInputFiles({ name: 'OML-26-2210.pdf', mimeType: 'application/pdf', buffer: TINY_PDF });
    expect(await screenshots(page, 'instrument-recording')).toBe(0);
    await form.getByRole('button', { name: 'Record calibration' }).click();
    await form.waitFor({ state: 'detached' });

    const history = page.getByRole('region', { name: 'Calibration history' }).getByRole('table');
    const rows = history.getByRole('row');
    await expect.poll(() => rows.count()).toBe(3);
    const newest = rows.nth(1);
    expect(await newest.getAttribute('data-standing')).toBe('in-force');
    const newestText = (await newest.textContent()) ?? '';
    for (const text of ['2026-11-25', '2027-11-25', 'In force', 'Oskarvale Metrology Laboratory', 'OML-26-2210', '±0.0007 λ', '±0.04°', 'k = 2 at 632.8 nm']) {
      expect(newestText).toContain(text);
    }
    expect(await rows.nth(2).getAttribute('data-standing')).toBe('superseded');
    expect(await rows.nth(2).textContent()).toContain('2026-04-15');

    const link = newest.getByRole('link', { name: 'OML-26-2210.pdf' });
    const served = await page.evaluate(
      async (href) => {
        const response = await fetch(href);
        return { type: response.headers.get('content-type'), head: new TextDecoder().decode((await response.arrayBuffer()).slice(0, 8)) };
      },
      (await link.getAttribute('href'))!,
    );
    expect(served).toEqual({ type: 'application/pdf', head: '%PDF-1.4' });

    expect(await seriousViolations(page)).toEqual([]);
    expect(await screenshots(page, 'instrument-page')).toBe(0);
  });

  it('shows the inspector the history and files without the recording form', async () => {
    const page = await signedInPage(rig, 'inspector');
    await page.goto(`${rig.baseUrl}/instruments`);
    await page.getByRole('link', { name: 'BENCH-0' }).click();
    await page.getByRole('heading', { name: 'Instrument BENCH-0' }).waitFor();
    await page.getByRole('alert').filter({ hasText: 'Calibration lapsed' }).waitFor();
    await page.getByRole('region', { name: 'Calibration history' }).getByRole('row').nth(1).waitFor();
    expect(await page.getByRole('button', { name: 'Record a calibration' }).count()).toBe(0);
    expect(await page.getByText('Attach PDF').count()).toBe(0);
  });
});
