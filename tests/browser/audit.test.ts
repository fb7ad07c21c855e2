import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { acceptedLot, rejectAfterAcceptance } from '../helpers/acceptedLot';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
let lot: Awaited<ReturnType<typeof acceptedLot>>;
beforeAll(async () => {
  rig = await startBrowserRig();
  // A certificate issued today, so this month's export and the certificate list both hold it.
  lot = await acceptedLot(15);
});
afterAll(async () => rig?.close());

describe('certificates, exports and verification in the browser', () => {
  it("the auditor exports this month's documents, watches the job reach ready, downloads it and opens a certificate's PDF", async () => {
    const page = await signedInPage(rig, 'auditor');
    const nav = page.getByRole('navigation', { name: 'Main' });

    await nav.getByRole('link', { name: 'Exports' }).click();
    const form = page.getByRole('form', { name: 'New export' });
    await form.getByRole('button', { name: 'This month' }).click();
    await form.getByRole('button', { name: 'Start export' }).click();
    const job = page.getByRole('listitem').filter({ hasText: 'Export' }).first();
    await job.getByText(/^Ready · \d+ of \d+ documents$/).waitFor({ timeout: 20_000 });
    const progress = job.getByRole('progressbar');
    expect(await progress.getAttribute('aria-valuenow')).toBe(await progress.getAttribute('aria-valuemax'));
    const download = job.getByRole('link', { name: /Download ZIP/ });
    const zip = await page.request.get(new URL((await download.getAttribute('href'))!, rig.baseUrl).href);
    expect(zip.status()).toBe(200);
    expect(zip.headers()['content-type']).toBe('application/zip');

    await nav.getByRole('link', { name: 'Certificates' }).click();
    const search = page.getByRole('form', { name: 'Filter documents' });
    await search.getByLabel('Search').fill(lot.certificate.number);
    await search.getByRole('button', { name: 'Apply' }).click();
    const row = page.getByRole('row').filter({ hasText: lot.certificate.number });
    await row.getByText('current', { exact: true }).waitFor();
    const [pdfTab] = await Promise.all([page.context().waitForEvent('page'), row.getByRole('link', { name: `Open PDF of ${lot.certificate.number}` }).click()]);
    await pdfTab.waitForURL(/\.pdf$/);
    expect(new URL(pdfTab.url()).pathname).toBe(`/api/documents/${lot.certificate.number}.pdf`);
    const pdf = await page.request.get(pdfTab.url());
    expect(pdf.headers()['content-type']).toBe('application/pdf');
    expect((await pdf.body()).subarray(0, 5).toString()).toBe('%PDF-');
    await page.context().close();
  });

  it('the public verification page, signed out, tells genuine from forged', async () => {
    const context = await rig.browser.newContext();
    const page = await context.newPage();
    await page.goto(`${rig.baseUrl}/verify?number=${lot.certificate.number}&hash=${lot.certificate.dataHash}`);
    const result = page.getByRole('region', { name: 'Verification result' });
    await result.getByRole('heading', { name: 'Genuine and current' }).waitFor();
    expect(await result.textContent()).toContain(lot.certificate.number);

    const form = page.getByRole('form', { name: 'Verify a document' });
    await form.getByLabel('Data SHA-256').fill('0'.repeat(64));
    await form.getByRole('button', { name: 'Check document' }).click();
    await result.getByRole('heading', { name: 'Not genuine' }).waitFor();
    expect(new URL(page.url()).searchParams.get('hash')).toBe('0'.repeat(64));

    await form.getByLabel('Data SHA-256').fill('not-a-hash');
    await form.getByRole('button', { name: 'Check document' }).click();
    await form.getByText('The hash is the 64-character SHA-256 printed on the document').waitFor();
    await context.close();
  });

  it('the public verification page shows a revoked certificate as genuine but revoked', async () => {
    const reversed = await acceptedLot(10);
    await rejectAfterAcceptance(reversed);
    const context = await rig.browser.newContext();
    const page = await context.newPage();
    await page.goto(`${rig.baseUrl}/verify?number=${reversed.certificate.number}&hash=${reversed.certificate.dataHash}`);
    const result = page.getByRole('region', { name: 'Verification result' });
    await result.getByRole('heading', { name: 'Genuine, but revoked' }).waitFor();
    expect(await result.textContent()).toMatch(/Revoked/);
    await context.close();
  });

  it('the quality manager reads the chain head, checks it as an anchor, and sees a wrong hash refused', async () => {
    const page = await signedInPage(rig, 'quality');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Audit trail' }).click();
    const head = page.getByRole('region', { name: 'Chain head' });
    const hash = (await head.getByTestId('chain-head-hash').textContent())!;
    const seq = (await head.getByTestId('chain-head-seq').textContent())!;
    expect(hash).toMatch(/^[0-9a-f]{64}$/);
    const form = page.getByRole('form', { name: 'Check an anchor' });
    await form.getByLabel('Anchored position').fill(seq);
    await form.getByLabel('Anchored hash').fill(hash.toUpperCase());
    await form.getByRole('button', { name: 'Check anchor' }).click();
    await head.getByText('Anchor matches').waitFor();
    await form.getByLabel('Anchored hash').fill('0'.repeat(64));
    await form.getByRole('button', { name: 'Check anchor' }).click();
    await head.getByText('Anchor does not match').waitFor();
    await form.getByLabel('Anchored hash').fill('not-a-hash');
    await form.getByRole('button', { name: 'Check anchor' }).click();
    await form.getByText('The hash is the 64-character SHA-256 printed with the chain head').waitFor();
    await page.getByRole('button', { name: 'Verify chain' }).click();
    await page.getByText('Chain intact').waitFor();
    await page.context().close();
  });
});
