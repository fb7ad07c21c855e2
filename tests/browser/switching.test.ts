import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { lotName } from '../../shared/schemas/stock';
import { as } from '../helpers/api';
import { DEMO_PASSWORD, decide, supplierPart } from '../helpers/switching';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

const shots = mkdtempSync(join(tmpdir(), 'phaselot-switching-'));

describe('the switching page in the browser', () => {
  it('shows a discontinued supplier and part with its waiting lot, and resumes inspection on tightened under a signature', async () => {
    // Put on tightened by a signed override, then 5 lots not accepted: acceptance is discontinued
    // (ISO 2859-1, 9.4, from memory); a lot received afterwards waits without a plan.
    const pair = await supplierPart();
    const quality = await as('quality');
    await quality
      .post(`/api/switching/${pair.supplierId}/${pair.partId}/override`)
      .send({ severity: 'tightened', reason: 'Field returns with chipped edges from this supplier', password: DEMO_PASSWORD, meaningAcknowledged: true })
      .expect(201);
    for (let i = 0; i < 5; i++) await decide((await pair.receive(5)).lotId, 'reject');
    const waiting = await pair.receive(30);
    const state = async () => (await quality.get(`/api/switching/${pair.supplierId}/${pair.partId}`).expect(200)).body;

    const page = await signedInPage(rig, 'quality');
    // From the lot page, marked, to the switching page.
    await page.goto(`${rig.baseUrl}/lots/${waiting.lotId}`);
    await page.getByRole('note').filter({ hasText: 'Acceptance discontinued' }).waitFor();
    await page.screenshot({ path: join(shots, 'lot-discontinued-desktop.png'), fullPage: true });
    await page.getByRole('link', { name: 'switching page' }).click();
    await page.getByTestId('switching-phase').filter({ hasText: 'Acceptance discontinued' }).waitFor();
    const lots = page.getByRole('region', { name: 'Lots not yet decided' });
    expect(await lots.getByRole('link', { name: lotName(waiting.lotId) }).count()).toBe(1);
    const history = page.getByRole('region', { name: 'History' });
    expect(await history.getByText('Severity set to tightened', { exact: true }).count()).toBe(1);
    expect(await history.getByText(/so acceptance is discontinued/).count()).toBe(1);

    const form = page.getByRole('form', { name: 'Resume inspection' });
    const action = 'Supplier replaced the worn polishing pitch and checks every plate on its own bench.';
    await form.getByLabel("Supplier's corrective action").fill(action);
    await form.getByLabel('Reference of the corrective action').fill('SCAR-2026-044');
    await form.getByLabel(/I have read the meaning/).check();
    await page.screenshot({ path: join(shots, 'resume-form-desktop.png'), fullPage: true });

    // A wrong password: the server's message, what was typed kept, nothing signed.
    await form.getByLabel('Your password (re-entered to sign)').fill('not-the-password');
    await form.getByRole('button', { name: /Sign: resume/ }).click();
    await form.getByRole('alert').filter({ hasText: 'The password does not match' }).waitFor();
    expect(await form.getByLabel("Supplier's corrective action").inputValue()).toBe(action);
    expect(await form.getByLabel('Reference of the corrective action').inputValue()).toBe('SCAR-2026-044');
    expect((await state()).phase).toBe('stopped');

    await form.getByLabel('Your password (re-entered to sign)').fill(DEMO_PASSWORD);
    await form.getByRole('button', { name: /Sign: resume/ }).click();
    await page.getByText('Inspection resumed on tightened inspection').waitFor();
    expect(await page.getByText(`Sampling plans drawn for ${lotName(waiting.lotId)}.`).count()).toBe(1);
    await page.getByTestId('switching-phase').filter({ hasText: 'Tightened inspection' }).waitFor();
    expect(await history.getByText('Inspection resumed', { exact: true }).count()).toBe(1);
    expect(await history.getByText(`Corrective action: ${action}`).count()).toBe(1);
    expect((await state()).phase).toBe('tightened');
    const plan = (await (await as('inspector')).get(`/api/inspection/lots/${waiting.lotId}`).expect(200)).body.plan;
    expect(plan.severity).toBe('tightened');

    await page.screenshot({ path: join(shots, 'resumed-desktop.png'), fullPage: true });
    await page.setViewportSize({ width: 390, height: 844 });
    await page.screenshot({ path: join(shots, 'resumed-390.png'), fullPage: true });
    await page.setViewportSize({ width: 1400, height: 900 });

    // The list of every supplier and part, from the main navigation.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Switching' }).click();
    await page.getByRole('heading', { name: 'Switching' }).waitFor();
    await page.screenshot({ path: join(shots, 'list-desktop.png'), fullPage: true });
    await page.context().close();
  });
});
