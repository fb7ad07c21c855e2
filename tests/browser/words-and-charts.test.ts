// Charts people can read and words instead of codes: the lot charts' ticks at 0 and the tolerance
// limits with units and serials, the OC curve's axes and AQL label, the export form's default range,
// and the audit trail's filters chosen from lists with each change shown field by field.
// Screenshots at 1400 and 390 px wide go to a temporary folder named in the test output.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { stokesBenchFile } from '../../db/seeders/benchFiles';
import { demoLogin } from '../../db/seeders/demo';
import { as } from '../helpers/api';
import { acceptedLot } from '../helpers/acceptedLot';
import { uniqueTag } from '../helpers/purchasing';
import { receivedLot } from '../helpers/receivedLot';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
const shots = mkdtempSync(join(tmpdir(), 'phaselot-words-charts-'));
beforeAll(async () => {
  rig = await startBrowserRig();
  console.info(`screenshots in ${shots}`);
});
afterAll(async () => rig?.close());

async function bothWidths(page: Page, name: string) {
  await page.setViewportSize({ width: 1400, height: 900 });
  await page.screenshot({ path: join(shots, `${name}-1400.png`), fullPage: true });
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: join(shots, `${name}-390.png`), fullPage: true });
  await page.setViewportSize({ width: 1400, height: 900 });
}

const tickTexts = (page: Page, chart: number, axis: 'xAxis' | 'yAxis') =>
  page
    .locator('[data-testid="result-charts"] figure')
    .nth(chart)
    .locator(`.recharts-${axis}-tick-labels .recharts-cartesian-axis-tick-value`)
    .allTextContents();

describe('charts people can read', () => {
  it('ticks the lot charts at 0 and the tolerance limits, names the serial in the tooltip and orders pieces by serial on request', async () => {
    // Quarter-wave at 632.8 nm, ordered ±0.003 λ and ±0.5° (tests/helpers/receivedLot.ts).
    const lot = await receivedLot({ quantity: 40, level: 'II', aql: 1 });
    const inspector = await as('inspector');
    const view = await inspector.get(`/api/inspection/lots/${lot.lotId}`).expect(200);
    const sample: string[] = view.body.pieces.filter((p: { inSample: boolean }) => p.inSample).map((p: { serial: string }) => p.serial);
    const failing = sample.slice(0, 2);
    const file = stokesBenchFile(
      sample.map((serial) => ({ serial, wavelengthNm: 632.8, retardanceWaves: failing.includes(serial) ? 0.2555 : 0.2501, fastAxisDeg: 0.05 })),
      { instrument: 'BENCH-2', date: new Date().toISOString().slice(0, 10), noise: 0.0004, seed: 7 },
    );
    await inspector
      .post(`/api/inspection/lots/${lot.lotId}/measurements`)
      .attach('files', Buffer.from(file), { filename: 'bench.csv', contentType: 'text/csv' })
      .expect(201);

    const page = await signedInPage(rig, 'inspector');
    await page.goto(`${rig.baseUrl}/inspection/lots/${lot.lotId}`);
    await page.getByTestId('result-charts').locator('.recharts-scatter-symbol').first().waitFor({ state: 'attached' });
    // The centre line reads 0 and the limits read as ordered, not "0.001 λ" or "0.01°" picked by the library.
    expect(await tickTexts(page, 0, 'yAxis')).toEqual(['-0.003', '0', '0.003']);
    expect(await tickTexts(page, 1, 'yAxis')).toEqual(['-0.5', '0', '0.5']);
    expect(await tickTexts(page, 2, 'xAxis')).toEqual(['-0.003', '0', '0.003']);
    expect(await tickTexts(page, 2, 'yAxis')).toEqual(['-0.5', '0', '0.5']);
    // Units stand on the axes.
    const labels = await page.getByTestId('result-charts').locator('.recharts-label').allTextContents();
    expect(labels).toEqual(expect.arrayContaining(['error (λ)', 'error (°)', 'retardance error (λ)', 'axis error (°)', 'measured, in order']));

    // A failing piece under the pointer: its serial and its values in the table's units, no field names.
    await page.getByTestId('result-charts').locator('figure').first().locator('.recharts-scatter-symbol path[d]').last().hover({ force: true });
    const tooltip = page.getByTestId('chart-tooltip').first();
    await tooltip.waitFor();
    const tip = (await tooltip.textContent()) ?? '';
    expect(failing.some((serial) => tip.includes(serial))).toBe(true);
    expect(tip).toMatch(/Retardance error \+0\.00\d\d λ/);
    expect(tip).toMatch(/Axis error [+-]?0\.\d\d°/);
    expect(tip).not.toMatch(/retardanceError|axisError|index/);

    // By serial: the x axis names serials instead of positions.
    await page.getByLabel('by serial').check();
    await page
      .getByTestId('result-charts')
      .locator('figure')
      .first()
      .locator('.recharts-label', { hasText: /^serial$/ })
      .waitFor();
    const serialTicks = await tickTexts(page, 0, 'xAxis');
    expect(serialTicks.length).toBeGreaterThan(1);
    for (const text of serialTicks) expect(sample).toContain(text);

    // The OC curve: axes with units, the x range fitted to the plan, the AQL label inside the plot.
    const oc = page.getByTestId('oc-chart');
    const xTicks = await oc.locator('.recharts-xAxis-tick-labels .recharts-cartesian-axis-tick-value').allTextContents();
    expect(xTicks[0]).toBe('0 %');
    expect(xTicks.every((t) => t.endsWith(' %'))).toBe(true);
    expect(await oc.locator('.recharts-yAxis-tick-labels .recharts-cartesian-axis-tick-value').allTextContents()).toEqual([
      '0.00',
      '0.25',
      '0.50',
      '0.75',
      '1.00',
    ]);
    // The x axis ends at the first round tick past the curve's end, where the plan accepts about 1 % of lots.
    const curve = view.body.plan.oc as { percentDefective: number; pa: number }[];
    const end = curve[curve.length - 1];
    expect(end.pa).toBeLessThan(0.02);
    const lastTick = Number(xTicks[xTicks.length - 1].replace(' %', ''));
    const step = Number(xTicks[1].replace(' %', ''));
    expect(lastTick).toBeGreaterThanOrEqual(end.percentDefective);
    expect(lastTick - end.percentDefective).toBeLessThan(step);
    const grid = (await oc.locator('.recharts-cartesian-grid').boundingBox())!;
    const aql = (await oc.locator('.recharts-label', { hasText: /^AQL / }).boundingBox())!;
    expect(aql.y).toBeGreaterThanOrEqual(grid.y);
    expect(aql.x).toBeGreaterThanOrEqual(grid.x);
    expect(aql.x + aql.width).toBeLessThanOrEqual(grid.x + grid.width + 1);
    await bothWidths(page, 'lot-charts');
    await page.context().close();
  });
});

describe('words and numbers on the audit pages', () => {
  it('offers the export range of the documents on record and answers an empty range plainly', async () => {
    await acceptedLot(20);
    const span = (await (await as('auditor')).get('/api/exports/span').expect(200)).body as { documents: number; first: string; last: string };
    const page = await signedInPage(rig, 'auditor');
    await page.goto(`${rig.baseUrl}/exports`);
    const form = page.getByRole('form', { name: 'New export' });
    await form.getByTestId('export-count').waitFor();
    expect(await form.getByLabel('Issued from').inputValue()).toBe(span.first);
    expect(await form.getByLabel('Issued to').inputValue()).toBe(span.last);
    expect(await form.getByTestId('export-count').textContent()).toMatch(new RegExp(`^${span.documents} documents? issued from ${span.first} to ${span.last}`));
    expect(await form.getByRole('button', { name: 'Start export' }).isEnabled()).toBe(true);
    await bothWidths(page, 'exports');

    await form.getByLabel('Issued from').fill('2020-01-01');
    await form.getByLabel('Issued to').fill('2020-01-31');
    await form.getByText('No certificate or inspection report was issued from 2020-01-01 to 2020-01-31 for this choice').waitFor();
    expect(await form.getByRole('alert').count()).toBe(0);
    expect(await form.getByRole('button', { name: 'Start export' }).isDisabled()).toBe(true);
    await page.context().close();
  });

  it('filters the audit trail by choosing from lists and shows a change field by field', async () => {
    const buyer = await as('buyer');
    const name = `Brindlemoor Optics ${uniqueTag()}`;
    const created = await buyer.post('/api/suppliers').send({ name, contactEmail: 'orders@brindlemoor.example' }).expect(201);
    await buyer
      .put(`/api/suppliers/${created.body.id}`)
      .send({ name, contactEmail: 'po@brindlemoor.example', notes: 'New purchasing desk', active: false })
      .expect(200);

    const page = await signedInPage(rig, 'auditor');
    await page.goto(`${rig.baseUrl}/audit`);
    const filters = page.getByRole('form', { name: 'Filter events' });
    // Lists in words, not codes to type, filled from the trail once it has answered.
    await filters.getByLabel('Record type').locator('option', { hasText: 'Supplier' }).first().waitFor({ state: 'attached' });
    const typeOptions = await filters.getByLabel('Record type').locator('option').allTextContents();
    expect(typeOptions).toContain('Supplier');
    expect(typeOptions).not.toContain('supplier');
    await filters.getByLabel('Record type').selectOption({ label: 'Supplier' });
    await filters.getByLabel('Action').selectOption({ label: 'Supplier changed' });
    await filters.getByLabel('User').selectOption({ value: demoLogin('buyer').email });
    await filters.getByLabel('Record number').fill(String(created.body.id));
    await filters.getByRole('button', { name: 'Apply' }).click();
    await page.waitForURL(/entityType=supplier/);
    expect(page.url()).toMatch(/action=supplier\.update/);

    // The rows of before the filter stay on screen until the filtered page has answered.
    const changes = page.getByRole('table', { name: 'Changed fields' });
    await expect.poll(() => page.locator('tbody tr', { has: changes }).count(), { timeout: 10_000 }).toBe(1);
    const rows = (await changes.locator('tr').allInnerTexts()).map((t) => t.replace(/\s+/g, ' ').trim());
    // In the order the trail stored the fields.
    expect(rows.sort()).toEqual(['Active yes → no', 'Contact email orders@brindlemoor.example → po@brindlemoor.example', 'Notes — → New purchasing desk']);
    const row = page.locator('tbody tr', { has: changes });
    expect(await row.textContent()).toContain('Supplier changed');
    expect(await row.textContent()).not.toContain('supplier.update');
    expect(await row.textContent()).not.toContain('{');
    // The time in the one form: ISO 8601 date, 24-hour time, zone.
    expect(await row.locator('td').first().textContent()).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC$/);
    await bothWidths(page, 'audit-trail');

    // A lot is looked up by the name every page gives it.
    const lot = await acceptedLot(20);
    const again = page.getByRole('form', { name: 'Filter events' });
    await again.getByLabel('Record type').selectOption({ label: 'Lot' });
    await again.getByLabel('Action').selectOption({ label: 'Any lot decision' });
    await again.getByLabel('User').selectOption({ label: 'Anyone' });
    await again.getByLabel('Record number').fill(`L-${lot.lotId}`);
    await again.getByRole('button', { name: 'Apply' }).click();
    await page.waitForURL(new RegExp(`entityId=${lot.lotId}(&|$)`));
    const decision = page.locator('tbody tr', { hasText: 'Lot decision signed: accept' });
    await decision.waitFor();
    expect(await decision.textContent()).toContain(`Lot L-${lot.lotId}`);
    await page.context().close();
  });
});
