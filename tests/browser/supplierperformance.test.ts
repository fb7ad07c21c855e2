// The buyer's page of a supplier: the ranked list, the scorecard, the capability and drift charts
// of a part and the drift alarm of the demo's drifting marking jig.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

const shots = mkdtempSync(join(tmpdir(), 'phaselot-supplier-performance-'));

describe('supplier performance in the browser', () => {
  it('leads the buyer from the ranked list to a supplier’s scorecard, charts and drift alarm', async () => {
    const page = await signedInPage(rig, 'buyer');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Supplier performance' }).click();
    await page.getByRole('heading', { name: 'Supplier performance' }).waitFor();
    const row = page.getByRole('row').filter({ hasText: 'Corvane Polarisation Works' });
    await row.waitFor();
    await page.screenshot({ path: join(shots, 'ranking-desktop.png'), fullPage: true });
    await row.click();

    await page.getByRole('heading', { name: 'Corvane Polarisation Works' }).waitFor();
    const scorecard = page.getByLabel('Scorecard');
    for (const label of ['Lots received', 'Lot acceptance', 'Nonconforming', 'On time', 'Open NCRs', 'Open corrective actions'])
      await scorecard.getByText(label, { exact: true }).waitFor();
    const parts = page.getByRole('region', { name: 'Parts' });
    await parts.getByRole('row').filter({ hasText: 'VW-QWP-1064' }).waitFor();

    // The part measured is charted at once: both characteristics, each with its two charts.
    const charts = page.getByRole('region', { name: 'Capability and drift: VW-QWP-1064' });
    await charts.getByRole('region', { name: 'Fast-axis error' }).waitFor();
    await charts.getByRole('region', { name: 'Retardance error' }).waitFor();
    const axis = charts.getByRole('region', { name: 'Fast-axis error' });
    await axis.getByText('Lot means', { exact: true }).waitFor();
    await axis.getByText('Drift: EWMA of the lot means').waitFor();
    // Ticks at the ordered tolerance and at 0, with their unit.
    const meansChart = axis.locator('figure').first();
    for (const tick of ['+0.500°', '0°', '−0.500°']) await meansChart.locator('.recharts-cartesian-axis-tick-value', { hasText: tick }).first().waitFor();
    expect(await axis.locator('figure svg.recharts-surface').count()).toBe(2);

    // The alarm: raised on a lot while no piece of it failed, marked on the EWMA chart.
    const alarms = page.getByRole('region', { name: 'Drift alarms' });
    const alarm = alarms.getByRole('listitem').filter({ hasText: 'Fast-axis error drifting up' });
    await alarm.filter({ hasText: 'before any piece failed' }).waitFor();
    const lotName = (await alarm.locator('span.font-medium').first().textContent())!;
    expect(lotName).toMatch(/^L-\d+$/);

    // A point's tooltip names its lot in the L-n form, with the supplier's lot and the mean's unit.
    const point = meansChart.locator('.recharts-line-dots circle').last();
    await point.hover();
    const tooltip = meansChart.locator('.recharts-tooltip-wrapper');
    await tooltip.getByText(/^L-\d+/).waitFor();
    await tooltip.getByText(/supplier lot CPW-4/).waitFor();
    await tooltip.getByText(/lot mean [+−]\d\.\d{3}°/).waitFor();
    await page.screenshot({ path: join(shots, 'supplier-desktop.png'), fullPage: true });

    // A narrower period: only the lots received in it count.
    const from = page.getByLabel('Received from');
    const wholeYear = await scorecard.getByText('Lots received', { exact: true }).locator('..').locator('dd').first().textContent();
    const lastMonth = new Date(Date.now() - 30 * 86_400_000).toISOString().slice(0, 10);
    await from.fill(lastMonth);
    await page.waitForURL(/from=/);
    await expect.poll(async () => scorecard.getByText('Lots received', { exact: true }).locator('..').locator('dd').first().textContent()).not.toBe(wholeYear);
    await page.getByRole('button', { name: 'Last 12 months' }).click();
    await expect.poll(async () => scorecard.getByText('Lots received', { exact: true }).locator('..').locator('dd').first().textContent()).toBe(wholeYear);

    await page.setViewportSize({ width: 390, height: 844 });
    await axis.getByText('Lot means', { exact: true }).waitFor();
    await page.screenshot({ path: join(shots, 'supplier-390.png'), fullPage: true });
    console.log(`supplier-performance screenshots: ${shots}`);

    // The supplier list of purchasing leads there too.
    await page.setViewportSize({ width: 1400, height: 900 });
    await page.goto(`${rig.baseUrl}/purchasing/suppliers`);
    await page.getByRole('row').filter({ hasText: 'Corvane Polarisation Works' }).getByRole('link', { name: 'Scorecard and drift' }).click();
    await page.getByRole('heading', { name: 'Corvane Polarisation Works' }).waitFor();
  });
});
