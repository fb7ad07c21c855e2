// Supplier quality in the browser: the supplier answers a corrective-action request through the
// mailed link, with no account and under the content security policy; quality reviews the answer;
// a quality manager uses a rejected lot as is under a deviation picked from the register.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { approvedDeviation, rejectedSample } from '../helpers/deviations';
import { mailedToken, ncrOf, raiseRequest, supplierWithQualityContact } from '../helpers/correctiveActions';
import { app, as } from '../helpers/api';
import { decide, supplierPart } from '../helpers/switching';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

const TINY_PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==', 'base64');
const shots = process.env.SCREENSHOT_DIR ?? join(tmpdir(), 'phaselot-supplierquality');
mkdirSync(shots, { recursive: true });

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

/** Every content security policy violation, console error and page error of a page. */
async function watchPolicy(page: Page) {
  const problems: string[] = [];
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (event) => console.error(`CSP violation: ${event.violatedDirective} ${event.blockedURI}`));
  });
  page.on('console', (message) => {
    if (message.type() === 'error') problems.push(message.text());
  });
  page.on('pageerror', (error) => problems.push(error.message));
  return problems;
}

async function screenshots(page: Page, name: string) {
  await page.screenshot({ path: join(shots, `${name}-desktop.png`), fullPage: true });
  const desktop = page.viewportSize()!;
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: join(shots, `${name}-390.png`), fullPage: true });
  await page.setViewportSize(desktop);
}

describe('supplier quality in the browser', () => {
  it("takes the supplier's answer through the mailed link, without an account, and shows it to quality", async () => {
    const pair = await supplierWithQualityContact();
    const ncr = await ncrOf(pair);
    const car = await raiseRequest([ncr.id], 'Quarter-wave plates of two lots run 0.006 λ long: find the cause and stop it.');
    const { token } = await mailedToken(car.id);

    const context = await rig.browser.newContext({ viewport: { width: 1280, height: 900 } });
    context.setDefaultTimeout(10_000);
    const supplier = await context.newPage();
    const problems = await watchPolicy(supplier);
    // The address the server rejects: the supplier must open the link as mailed.
    const refused = await supplier.goto(`${rig.baseUrl}/respond`);
    expect(refused?.status()).toBe(200);
    await supplier.getByText('This page needs the link from the request mail').waitFor();

    await supplier.goto(`${rig.baseUrl}/respond#token=${token}`);
    await supplier.getByRole('heading', { name: `Corrective action ${car.number}` }).waitFor();
    await supplier.getByText(ncr.serials.join(', ')).waitFor();
    const form = supplier.getByRole('form', { name: 'Your answer' });
    // The form's own checks: nothing is sent while a required field is empty.
    await form.getByRole('button', { name: 'Send the answer' }).click();
    await form.getByText('Give your name').waitFor();
    await form.getByLabel('Your name').fill('Ilse Varga');
    await form.getByLabel('Root cause').fill('The polishing pitch of line 2 was worn past its service life.');
    await form.getByLabel('Containment', { exact: true }).fill('Stock at our site sorted 100 %; long plates quarantined.');
    await form.getByLabel('Corrective actions', { exact: true }).fill('Pitch replaced; service life set to 400 hours.');
    await form.getByLabel('Preventive actions', { exact: true }).fill('Retardance of every plate measured before packing.');
    await form.getByLabel('Corrective actions in effect by').fill('2026-12-15');
    await form.getByLabel(/^Files/).setInputFiles({ name: 'pitch-log.png', mimeType: 'image/png', buffer: TINY_PNG });
    await screenshots(supplier, 'supplier-answer-form');
    await form.getByRole('button', { name: 'Send the answer' }).click();
    await supplier.getByText('Thank you: your answer was received').waitFor();
    await screenshots(supplier, 'supplier-answer-sent');

    expect(problems).toEqual([]);
    // The link takes one answer: opened again, it says so (the browser logs the refusal, a 410).
    await supplier.reload();
    await supplier.getByText(/An answer was already sent through this link on \d{4}-\d{2}-\d{2}/).waitFor();
    expect(problems).toEqual(['Failed to load resource: the server responded with a status of 410 (Gone)']);
    await context.close();

    // Quality sees the answer on the request, with its file, and accepts it with a signature.
    const quality = await signedInPage(rig, 'quality');
    await quality.goto(`${rig.baseUrl}/corrective-actions/${car.id}`);
    await quality.getByRole('heading', { name: `Corrective action ${car.number}` }).waitFor();
    const answers = quality.getByRole('region', { name: 'Answers' });
    await answers.getByText('The polishing pitch of line 2 was worn past its service life.').waitFor();
    await answers.getByRole('link', { name: 'pitch-log.png' }).waitFor();
    const review = quality.getByRole('form', { name: 'Review the answer' });
    await review.getByLabel(/I have read the meaning/).check();
    await review.getByLabel(/Your password/).fill('phaselot-demo');
    await screenshots(quality, 'request-review');
    await review.getByRole('button', { name: 'Sign: accept the answer' }).click();
    await quality
      .getByRole('note')
      .getByText(/^Accepted by .*, /)
      .waitFor();
    await quality.getByRole('form', { name: 'Close the request' }).waitFor();
    await screenshots(quality, 'request-accepted');
    await quality.context().close();
  });

  it("lets the buyer raise a request from NCRs and write a deviation for a supplier's part", async () => {
    const pair = await supplierWithQualityContact();
    const first = await ncrOf(pair);
    const second = await ncrOf(pair, 'Fast-axis mark 1.2° off on two plates');
    const buyer = await signedInPage(rig, 'buyer');
    const problems = await watchPolicy(buyer);

    // The supplier's quality contact, where requests go, is on the supplier form.
    await buyer.goto(`${rig.baseUrl}/purchasing/suppliers?q=${pair.tag}`);
    await buyer.getByRole('cell', { name: `Test supplier ${pair.tag}` }).click();
    const supplierForm = buyer.getByRole('form', { name: `Edit Test supplier ${pair.tag}` });
    expect(await supplierForm.getByLabel('Quality contact e-mail').inputValue()).toBe(pair.qualityContactEmail);
    await screenshots(buyer, 'supplier-form');

    // From the NCR's page, the form offers only NCRs of its supplier and part, that one ticked.
    await buyer.goto(`${rig.baseUrl}/nonconformances/${first.id}`);
    await buyer.getByRole('link', { name: 'ask the supplier for a corrective action' }).click();
    const form = buyer.getByRole('form', { name: 'New corrective-action request' });
    await form.getByText(`NCRs it answers (Test supplier ${pair.tag}, T-${pair.tag})`).waitFor();
    const boxes = form.getByRole('checkbox');
    expect(await boxes.count()).toBe(2);
    expect(await form.getByRole('listitem').filter({ hasText: first.number }).getByRole('checkbox').isChecked()).toBe(true);
    await form.getByRole('listitem').filter({ hasText: second.number }).getByRole('checkbox').check();
    await form.getByLabel('What the supplier is asked to correct').fill('Retardance and axis marks of two lots are out: find the cause and stop it.');
    await screenshots(buyer, 'request-new');
    await form.getByRole('button', { name: 'Send the request' }).click();
    await buyer.getByRole('heading', { name: /^Corrective action CAR-\d{4}-\d{4}$/ }).waitFor();
    await buyer.getByRole('region', { name: 'Links to answer' }).getByText('Live', { exact: true }).waitFor();
    const number = (await buyer.getByRole('heading', { level: 1 }).textContent())!.replace('Corrective action ', '');
    await buyer.goto(`${rig.baseUrl}/corrective-actions?status=awaiting-response`);
    await buyer.getByRole('cell', { name: number }).waitFor();
    await screenshots(buyer, 'requests-list');

    // A deviation written from the register's form, for the same supplier's part.
    await buyer.goto(`${rig.baseUrl}/deviations/new?supplierId=${pair.supplierId}&partId=${pair.partId}`);
    const deviation = buyer.getByRole('form', { name: 'New deviation' });
    await deviation.getByLabel('Supplier').locator(`option[value="${pair.supplierId}"]`).waitFor({ state: 'attached' });
    await deviation.getByLabel('Part').locator(`option[value="${pair.partId}"]`).waitFor({ state: 'attached' });
    expect(await deviation.getByLabel('Supplier').inputValue()).toBe(String(pair.supplierId));
    await deviation.getByLabel('What it allows').fill('Fast-axis mark tolerance widened to ±1° for the test-bench build');
    await deviation.getByLabel('Fast-axis tolerance (± degrees)').fill('1');
    await deviation.getByLabel('Pieces it may cover').fill('25');
    await screenshots(buyer, 'deviation-new');
    await deviation.getByRole('button', { name: 'Write to the register' }).click();
    await buyer.getByRole('heading', { name: /^Deviation DEV-\d{4}-\d{4}$/ }).waitFor();
    await buyer.getByText('Awaiting approval').waitFor();
    await buyer.getByText('0 used, 25 of 25 left').waitFor();
    expect(problems).toEqual([]);
    await buyer.context().close();
  });

  it('uses a rejected lot as is under a current deviation picked from the register, which then shows the use', async () => {
    const pair = await supplierPart();
    const lotId = await rejectedSample(pair);
    const deviation = await approvedDeviation(pair.supplierId, pair.partId, {
      quantityLimit: 50,
      allowed: 'Retardance tolerance widened to ±0.01 λ for the alignment jig build',
    });
    // Too small for the lot's 20 pieces: listed, not choosable.
    const small = await approvedDeviation(pair.supplierId, pair.partId, { quantityLimit: 5 });

    const quality = await signedInPage(rig, 'quality');
    const problems = await watchPolicy(quality);
    await quality.goto(`${rig.baseUrl}/inspection/lots/${lotId}`);
    const form = quality.getByRole('form', { name: 'Sign disposition' });
    await form.getByLabel('Use as is (deviation)').check();
    const picker = form.getByLabel('Deviation', { exact: true });
    await picker.waitFor();
    expect(await picker.locator('option', { hasText: small.number }).isDisabled()).toBe(true);
    await picker.selectOption({
      label: `${deviation.number}: 50 of 50 pieces left, until ${new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10)}`,
    });
    await form.getByTestId('deviation-allowed').getByText('Retardance tolerance widened to ±0.01 λ for the alignment jig build').waitFor();
    await form.getByLabel('Justification').fill('Plates go into the alignment jig, which tolerates ±0.01 λ');
    await form.getByLabel(/I have read the meaning/).check();
    await form.getByLabel(/Your password/).fill('phaselot-demo');
    await screenshots(quality, 'use-as-is-deviation');
    await form.getByRole('button', { name: 'Sign: Use as is (deviation)' }).click();
    await quality.getByText(/^Signed\./).waitFor();
    await quality.getByText(deviation.number).first().waitFor();

    await quality.goto(`${rig.baseUrl}/deviations/${deviation.id}`);
    await quality.getByRole('heading', { name: `Deviation ${deviation.number}` }).waitFor();
    await quality.getByText('20 used, 30 of 50 left').waitFor();
    await quality
      .getByRole('region', { name: 'Uses' })
      .getByRole('link', { name: `L-${lotId}` })
      .waitFor();
    await screenshots(quality, 'deviation-page');
    await quality.goto(`${rig.baseUrl}/deviations?status=current`);
    await quality.getByRole('cell', { name: deviation.number }).waitFor();
    await screenshots(quality, 'deviations-list');
    expect(problems).toEqual([]);
    await quality.context().close();
  });

  it('resumes inspection after discontinuation on an accepted request picked in the form, and the history links to it', async () => {
    const pair = await supplierWithQualityContact();
    // ISO 2859-1, 9.3: five lots not accepted on tightened inspection discontinue acceptance.
    for (let i = 0; i < 7; i++) await decide((await pair.receive(5)).lotId, 'reject');
    const car = await raiseRequest([(await ncrOf(pair)).id]);
    const { token } = await mailedToken(car.id);
    await request(app)
      .post('/api/corrective-actions/respond')
      .set('X-Response-Link', token)
      .field('responderName', 'Ilse Varga')
      .field('rootCause', 'Worn polishing pitch on line 2.')
      .field('containment', 'Stock sorted 100 % at our site.')
      .field('correctiveActions', 'Pitch replaced; service life set.')
      .field('preventiveActions', 'Every plate measured before packing.')
      .field('correctiveDueOn', '2026-12-15')
      .expect(201);
    await (
      await as('quality')
    )
      .post(`/api/corrective-actions/${car.id}/review`)
      .send({ decision: 'accept', password: 'phaselot-demo', meaningAcknowledged: true })
      .expect(200);

    const quality = await signedInPage(rig, 'quality');
    const problems = await watchPolicy(quality);
    await quality.goto(`${rig.baseUrl}/switching/${pair.supplierId}/${pair.partId}`);
    const form = quality.getByRole('form', { name: 'Resume inspection' });
    const picker = form.getByLabel('Accepted corrective-action request');
    await picker.locator(`option[value="${car.id}"]`).waitFor({ state: 'attached' });
    await picker.selectOption(String(car.id));
    // The request names itself: no free-text reference is asked for.
    expect(await form.getByLabel('Reference of the corrective action').count()).toBe(0);
    await form.getByLabel("Supplier's corrective action").fill('Polishing pitch replaced; every plate measured before packing.');
    await form.getByLabel(/I have read the meaning/).check();
    await form.getByLabel('Your password (re-entered to sign)').fill('phaselot-demo');
    await screenshots(quality, 'resume-on-request');
    await form.getByRole('button', { name: /Sign: resume/ }).click();
    await quality.getByTestId('switching-phase').filter({ hasText: 'Tightened inspection' }).waitFor();
    await quality.getByRole('region', { name: 'History' }).getByRole('link', { name: car.number }).click();
    await quality.getByRole('heading', { name: `Corrective action ${car.number}` }).waitFor();
    expect(problems).toEqual([]);
    await quality.context().close();
  });
});
