import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { stokesBenchFile } from '../../db/seeders/benchFiles';
import { deliverDueMail } from '../../server/mail/outbox';
import { as } from '../helpers/api';
import { receivedLot } from '../helpers/receivedLot';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

const dir = mkdtempSync(join(tmpdir(), 'phaselot-bench-'));

function benchFile(name: string, serials: string[], failing: string[]) {
  const content = stokesBenchFile(
    serials.map((serial) => ({ serial, wavelengthNm: 632.8, retardanceWaves: failing.includes(serial) ? 0.2555 : 0.2501, fastAxisDeg: 0.05 })),
    { instrument: 'BENCH-2', date: new Date().toISOString().slice(0, 10), noise: 0.0004 },
  );
  const path = join(dir, name);
  return { path, content };
}

describe('inspection in the browser', () => {
  it('the inspector fixes a bad file and commits; the quality manager signs the rejection; the buyer gets the mail', async () => {
    const lot = await receivedLot({ quantity: 40, level: 'II', aql: 1 });
    const view = await (await as('inspector')).get(`/api/inspection/lots/${lot.lotId}`).expect(200);
    const sample: string[] = view.body.pieces.filter((p: { inSample: boolean }) => p.inSample).map((p: { serial: string }) => p.serial);
    const failing = sample.slice(0, 3);

    const good = benchFile('bench-fixed.csv', sample, failing);
    const lines = good.content.split('\n');
    lines[8] = lines[8].replace(/,(H|V|D|A|R|L),/, ',Q,'); // an unknown input code on line 9
    writeFileSync(join(dir, 'bench-broken.csv'), lines.join('\n'));
    writeFileSync(good.path, good.content);

    const inspector = await signedInPage(rig, 'inspector');
    await inspector.goto(`${rig.baseUrl}/inspection/lots/${lot.lotId}`);
    await inspector.getByLabel('Bench files (CSV)').setInputFiles(join(dir, 'bench-broken.csv'));
    await inspector.getByRole('button', { name: 'Check files' }).click();
    const errors = inspector.getByRole('list', { name: 'Errors' });
    await errors.waitFor();
    expect(await errors.textContent()).toMatch(/line 9/);
    expect(await inspector.getByRole('button', { name: 'Save readings' }).isDisabled()).toBe(true);

    await inspector.getByLabel('Bench files (CSV)').setInputFiles(good.path);
    await inspector.getByRole('button', { name: 'Check files' }).click();
    await inspector.getByText('ready to save').waitFor();
    await inspector.getByRole('button', { name: 'Save readings' }).click();
    await inspector.getByText(/Saved bench-fixed\.csv/).waitFor();
    await inspector.getByTestId('result-charts').waitFor();
    const table = inspector.getByRole('table', { name: 'Piece results' });
    expect(await table.getByText('fail', { exact: true }).count()).toBe(failing.length);
    await inspector.screenshot({ path: join(dir, 'inspector.png'), fullPage: true });
    await inspector.context().close();

    const quality = await signedInPage(rig, 'quality');
    await quality.goto(`${rig.baseUrl}/inspection/lots/${lot.lotId}`);
    const form = quality.getByRole('form', { name: 'Sign disposition' });
    await form.getByLabel('Reject to vendor').check();
    await form.getByLabel(/I have read the meaning/).check();
    await form.getByLabel(/Your password/).fill('phaselot-demo');
    await form.getByRole('button', { name: /^Sign: Reject/ }).click();
    await quality.getByText(/Signed\. Documents issued: PLR-/).waitFor();
    await quality.context().close();

    // The worker's pass, as npm start runs it, delivers to the test mail catcher.
    await deliverDueMail();
    const admin = await signedInPage(rig, 'admin');
    await admin.goto(`${rig.baseUrl}/admin/mail`);
    // The subject names the lot in its one form, L-<id>, everywhere (mails, pages, PDFs).
    const subject = admin.getByText(`Lot L-${lot.lotId} rejected: WP-T-`, { exact: false }).first();
    await subject.waitFor();
    expect(await admin.getByText(`supplier lot SL-`, { exact: false }).count()).toBeGreaterThan(0);
    await admin.context().close();
  });
});
