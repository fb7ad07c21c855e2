import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { stokesBenchFile } from '../../db/seeders/benchFiles';
import { as, freshUser } from '../helpers/api';
import { approvedDeviation } from '../helpers/deviations';
import { receivedLot } from '../helpers/receivedLot';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

const shots = mkdtempSync(join(tmpdir(), 'phaselot-signature-'));

/** Measures the given pieces of a lot on the bench (through the API): those in `failing` out of tolerance. */
async function measure(lotId: number, serials: string[], failing: string[] = []) {
  const file = stokesBenchFile(
    serials.map((serial) => ({ serial, wavelengthNm: 632.8, retardanceWaves: failing.includes(serial) ? 0.2555 : 0.2501, fastAxisDeg: 0.05 })),
    { instrument: 'BENCH-2', date: new Date().toISOString().slice(0, 10), noise: 0.0004, seed: serials.length },
  );
  await (
    await as('inspector')
  )
    .post(`/api/inspection/lots/${lotId}/measurements`)
    .attach('files', Buffer.from(file), { filename: 'bench.csv', contentType: 'text/csv' })
    .expect(201);
}

/** A lot whose measured sample proposes a rejection: its first two sample pieces are out of tolerance. */
async function lotProposingRejection() {
  const lot = await receivedLot({ quantity: 20, level: 'II', aql: 1 });
  const inspector = await as('inspector');
  const view = await inspector.get(`/api/inspection/lots/${lot.lotId}`).expect(200);
  const sample: string[] = view.body.pieces.filter((p: { inSample: boolean }) => p.inSample).map((p: { serial: string }) => p.serial);
  await measure(lot.lotId, sample, sample.slice(0, 2));
  const measured = await inspector.get(`/api/inspection/lots/${lot.lotId}`).expect(200);
  expect(measured.body.verdict.proposal).toBe('reject');
  return lot;
}

const currentDecision = async (lotId: number) => (await (await as('quality')).get(`/api/inspection/lots/${lotId}`).expect(200)).body.disposition;

describe('signing a lot disposition in the browser', () => {
  it('keeps what was typed after a wrong password, shows the signed decision after the right one, and supersedes only on purpose', async () => {
    const lot = await lotProposingRejection();
    // Use as is needs a current, approved deviation of the register for the lot's supplier and part.
    const deviation = await approvedDeviation(lot.supplierId, lot.partId);
    const page = await signedInPage(rig, 'quality');
    const signer = (await page.getByTestId('signed-in-user').textContent())!.trim();
    await page.goto(`${rig.baseUrl}/inspection/lots/${lot.lotId}`);

    const form = page.getByRole('form', { name: 'Sign disposition' });
    await form.getByLabel('Use as is (deviation)').check();
    await form.getByLabel('Deviation', { exact: true }).selectOption(String(deviation.id));
    await form.getByLabel('Justification').fill('Retardance within the limit of the assembly drawing, rev. C');
    await form.getByLabel(/I have read the meaning/).check();
    await form.getByLabel(/Your password/).fill('not-my-password');
    await form.getByRole('button', { name: 'Sign: Use as is (deviation)' }).click();

    // The server's refusal is shown, everything typed but the password stays, and nothing was signed.
    await form.getByRole('alert').filter({ hasText: 'The password does not match' }).waitFor();
    expect(await form.getByLabel('Use as is (deviation)').isChecked()).toBe(true);
    expect(await form.getByLabel('Deviation', { exact: true }).inputValue()).toBe(String(deviation.id));
    expect(await form.getByLabel('Justification').inputValue()).toBe('Retardance within the limit of the assembly drawing, rev. C');
    expect(await form.getByLabel(/I have read the meaning/).isChecked()).toBe(true);
    expect(await form.getByLabel(/Your password/).inputValue()).toBe('');
    expect(await currentDecision(lot.lotId)).toBeNull();
    // Still signed in: no trip to the sign-in page, and another area opens.
    expect(new URL(page.url()).pathname).toBe(`/inspection/lots/${lot.lotId}`);
    expect(await page.getByTestId('signed-in-user').textContent()).toContain(signer);

    await form.getByLabel(/Your password/).fill('phaselot-demo');
    await form.getByRole('button', { name: 'Sign: Use as is (deviation)' }).click();
    const decision = page.getByRole('region', { name: 'Signed decision' });
    await decision.getByText(/^Signed\. Documents issued: PL/).waitFor();
    expect(await form.count()).toBe(0);
    const text = await decision.textContent();
    expect(text).toContain('Use as is (deviation)');
    expect(text).toContain(`signed by ${signer}`);
    expect(text).toContain('I release this nonconforming lot for use as is under the deviation stated');
    expect(text).toContain('Retardance within the limit of the assembly drawing, rev. C');
    expect(text).toContain(deviation.number);
    const signed = await currentDecision(lot.lotId);
    expect(signed.decision).toBe('use-as-is');
    const documents = (await (await as('quality')).get(`/api/inspection/lots/${lot.lotId}`).expect(200)).body.documents as {
      number: string;
      revokedAt: string | null;
    }[];
    expect(documents.length).toBeGreaterThan(0);
    for (const d of documents) expect(await decision.getByRole('link', { name: d.number }).count()).toBe(1);

    await page.screenshot({ path: join(shots, 'signed-desktop.png'), fullPage: true });
    await page.setViewportSize({ width: 390, height: 844 });
    await page.screenshot({ path: join(shots, 'signed-390.png'), fullPage: true });
    await decision.screenshot({ path: join(shots, 'signed-decision-390.png') });
    await page.setViewportSize({ width: 1400, height: 900 });

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Lots' }).click();
    await page.getByRole('heading', { name: 'Lots' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/lots');

    // Back on the lot: the decision stands and no form is armed until supersede is chosen.
    await page.goBack();
    await decision.waitFor();
    expect(await form.count()).toBe(0);
    await decision.getByRole('button', { name: /Supersede this decision/ }).click();
    await form.getByText('What superseding does').waitFor();
    expect(await form.textContent()).toContain(documents[0].number);
    for (const label of ['Accept', 'Reject to vendor', 'Use as is (deviation)']) expect(await form.getByLabel(label, { exact: true }).isChecked()).toBe(false);
    expect(await form.getByLabel('Note (optional)').inputValue()).toBe('');
    expect(await form.getByLabel(/I have read the meaning/).isChecked()).toBe(false);
    await form.screenshot({ path: join(shots, 'supersede-form.png') });
    await form.getByRole('button', { name: 'Keep the signed decision' }).click();
    expect(await form.count()).toBe(0);
    expect((await currentDecision(lot.lotId)).id).toBe(signed.id);
    await page.context().close();
  });

  it('shows the lock-out after repeated wrong passwords the same way, with the form kept and the session alive', async () => {
    const lot = await lotProposingRejection();
    // A quality manager of this test only: the lock-out must not reach the demo account other tests sign with.
    const manager = await freshUser(['quality']);
    const context = await rig.browser.newContext({ viewport: { width: 1400, height: 900 } });
    context.setDefaultTimeout(10_000);
    const page = await context.newPage();
    await page.goto(`${rig.baseUrl}/sign-in`);
    await page.getByLabel('E-mail').fill(manager.email);
    await page.getByLabel('Password').fill(manager.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByTestId('signed-in-user').waitFor();
    await page.goto(`${rig.baseUrl}/inspection/lots/${lot.lotId}`);

    const form = page.getByRole('form', { name: 'Sign disposition' });
    await form.getByLabel('Reject to vendor').check();
    await form.getByLabel('Note (optional)').fill('Two plates out of tolerance at 632.8 nm');
    await form.getByLabel(/I have read the meaning/).check();
    // Five wrong passwords in a row lock signing (a rule of the product); the fifth answer says so.
    for (let attempt = 1; attempt <= 5; attempt++) {
      await form.getByLabel(/Your password/).fill(`wrong-${attempt}`);
      await form.getByRole('button', { name: 'Sign: Reject to vendor' }).click();
      await form
        .getByRole('alert')
        .filter({ hasText: attempt < 5 ? `${5 - attempt} tr` : 'is locked until' })
        .waitFor();
    }
    expect(await form.getByLabel('Reject to vendor').isChecked()).toBe(true);
    expect(await form.getByLabel('Note (optional)').inputValue()).toBe('Two plates out of tolerance at 632.8 nm');
    // Even the right password is refused while locked, with the same message and nothing signed.
    await form.getByLabel(/Your password/).fill(manager.password);
    await form.getByRole('button', { name: 'Sign: Reject to vendor' }).click();
    await form
      .getByRole('alert')
      .filter({ hasText: /^Signing is locked until/ })
      .waitFor();
    expect(await currentDecision(lot.lotId)).toBeNull();
    expect(new URL(page.url()).pathname).toBe(`/inspection/lots/${lot.lotId}`);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Lots' }).click();
    await page.getByRole('heading', { name: 'Lots' }).waitFor();
    await context.close();
  });

  it('shows a 100 % sort under way, every piece to measure, and the sorted lot when the last piece is measured', async () => {
    const lot = await lotProposingRejection();
    const quality = await as('quality');
    await quality
      .post(`/api/inspection/lots/${lot.lotId}/dispositions`)
      .send({
        decision: 'sort',
        password: 'phaselot-demo',
        meaningAcknowledged: true,
        expectedDispositionId: null,
        justification: 'Sort at our bench; supplier informed',
      })
      .expect(201);
    const view = (await quality.get(`/api/inspection/lots/${lot.lotId}`).expect(200)).body;
    const unmeasured: string[] = view.pieces.filter((p: { results: unknown[] }) => p.results.length === 0).map((p: { serial: string }) => p.serial);
    expect(view.sort).toEqual({ remaining: unmeasured.length });
    expect(unmeasured.length).toBeGreaterThan(0);

    const page = await signedInPage(rig, 'inspector');
    await page.goto(`${rig.baseUrl}/inspection/lots/${lot.lotId}`);
    const decision = page.getByRole('region', { name: 'Signed decision' });
    await decision.getByText('100 % sort under way').waitFor();
    expect(await decision.textContent()).toContain(`${unmeasured.length} of 20 pieces still need a verdict`);
    expect(await decision.textContent()).toContain('Sort 100 %');
    expect(await page.locator('[data-state="sorting"]').textContent()).toBe('Sorting 100 %');
    // Every piece is up for measurement, not only the sample, and the bench upload is open.
    const results = page.getByRole('table', { name: 'Piece results' });
    expect(await results.getByText('not measured').count()).toBe(unmeasured.length);
    await page.getByLabel('Bench files (CSV)').waitFor();
    await page.screenshot({ path: join(shots, 'sorting-desktop.png'), fullPage: true });
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Inspection' }).click();
    // The queue pages oldest first; the lot is found by its name.
    await page.getByRole('searchbox').fill(`L-${lot.lotId}`);
    const queued = page.getByRole('row').filter({ hasText: `L-${lot.lotId}` });
    expect(await queued.textContent()).toContain(`${20 - unmeasured.length}/20`);

    await measure(lot.lotId, unmeasured);
    await page.goto(`${rig.baseUrl}/inspection/lots/${lot.lotId}`);
    await page.locator('[data-state="sorted"]').waitFor();
    expect(await decision.getByText('100 % sort under way').count()).toBe(0);
    const documents = (await quality.get(`/api/inspection/lots/${lot.lotId}`).expect(200)).body.documents as {
      number: string;
      kind: string;
      revokedAt: string | null;
    }[];
    const certificate = documents.find((d) => d.kind === 'certificate' && !d.revokedAt);
    expect(certificate).toBeDefined();
    await decision.getByRole('link', { name: certificate!.number }).waitFor();
    await page.context().close();
  });

  it('shows what became of the pieces of a rejected lot on the lot list, the lot page and the PO page', async () => {
    const lot = await lotProposingRejection();
    const quality = await as('quality');
    await quality
      .post(`/api/inspection/lots/${lot.lotId}/dispositions`)
      .send({ decision: 'reject', password: 'phaselot-demo', meaningAcknowledged: true, expectedDispositionId: null })
      .expect(201);
    // A plain rejection sends every piece back; the two measured out of tolerance are the nonconforming ones.
    const figures = (await quality.get(`/api/lots/${lot.lotId}`).expect(200)).body;
    expect({ accepted: figures.accepted, nonconforming: figures.nonconforming, returned: figures.returned }).toEqual({
      accepted: 0,
      nonconforming: 2,
      returned: 20,
    });
    const shown = '0 accepted2 nonconforming20 returned';

    const page = await signedInPage(rig, 'buyer');
    await page.goto(`${rig.baseUrl}/lots/${lot.lotId}`);
    await page.getByRole('heading', { name: `Lot L-${lot.lotId}` }).waitFor();
    expect(await page.getByLabel('Piece outcomes').textContent()).toBe(shown);
    await page.screenshot({ path: join(shots, 'lot-desktop.png'), fullPage: true });

    await page.goto(`${rig.baseUrl}/lots?q=L-${lot.lotId}`);
    const row = page.getByRole('row').filter({ hasText: `L-${lot.lotId}` });
    await row.waitFor();
    const headers = (await page.getByRole('columnheader').allTextContents()).map((h) => h.trim());
    const cells = (await row.getByRole('cell').allTextContents()).map((c) => c.trim());
    for (const [header, value] of [
      ['Accepted', '0'],
      ['Nonconforming', '2'],
      ['Returned', '20'],
    ])
      expect(cells[headers.indexOf(header)]).toBe(value);
    await page.screenshot({ path: join(shots, 'lots-desktop.png'), fullPage: true });

    const po = (await quality.get('/api/purchase-orders').query({ q: lot.poNumber }).expect(200)).body.data[0];
    await page.goto(`${rig.baseUrl}/purchasing/orders/${po.id}`);
    const line = page.getByRole('region', { name: /^Line 1:/ });
    await line.waitFor();
    expect(await line.getByLabel('Piece outcomes').textContent()).toBe(shown);
    expect(await page.getByRole('region', { name: 'Order' }).getByLabel('Piece outcomes').textContent()).toBe(shown);
    await page.screenshot({ path: join(shots, 'po-desktop.png'), fullPage: true });
    await page.setViewportSize({ width: 390, height: 844 });
    await page.screenshot({ path: join(shots, 'po-390.png'), fullPage: true });
    await page.goto(`${rig.baseUrl}/lots/${lot.lotId}`);
    await page.getByLabel('Piece outcomes').waitFor();
    await page.screenshot({ path: join(shots, 'lot-390.png'), fullPage: true });
    await page.context().close();
  });
});
