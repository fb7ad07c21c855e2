// The serial history of a piece that failed inspection and is in use as is under a signed deviation.
import { afterAll, beforeAll, describe, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { benchFile, sampleOf, signDecision, uploadBench } from '../helpers/bench';
import { approvedDeviation } from '../helpers/deviations';
import { receivedLot } from '../helpers/receivedLot';
import { signedInPage, startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

const shots = mkdtempSync(join(tmpdir(), 'phaselot-pieces-'));

describe('serial history in the browser', () => {
  it('says when a failed piece is in use as is, and under which deviation', async () => {
    const lot = await receivedLot({ quantity: 20, level: 'II', aql: 1 });
    const { sample } = await sampleOf(lot.lotId);
    const failed = sample[0];
    await uploadBench(lot.lotId, 'bench.csv', benchFile(sample, [failed]));
    const deviation = await approvedDeviation(lot.supplierId, lot.partId);
    await signDecision(lot.lotId, 'use-as-is', null, { deviationId: deviation.id, justification: 'Error harmless in the test fixture build' });

    const page = await signedInPage(rig, 'auditor');
    await page.goto(`${rig.baseUrl}/pieces/${failed}`);
    const notice = page.getByRole('note').filter({ hasText: `Failed inspection: in use as is under deviation ${deviation.number}` });
    await notice.waitFor();
    await notice.filter({ hasText: 'Error harmless in the test fixture build' }).waitFor();
    await page.getByText(`Released as is under deviation ${deviation.number} (lot L-${lot.lotId}): this piece failed inspection`).waitFor();
    await page.screenshot({ path: join(shots, 'piece-as-is-desktop.png'), fullPage: true });
    await page.setViewportSize({ width: 390, height: 844 });
    await notice.waitFor();
    await page.screenshot({ path: join(shots, 'piece-as-is-390.png'), fullPage: true });

    // A conforming piece of the same lot carries no such notice.
    await page.goto(`${rig.baseUrl}/pieces/${sample[1]}`);
    await page.getByRole('heading', { name: `Serial ${sample[1]}` }).waitFor();
    if ((await page.getByText('in use as is under deviation').count()) !== 0) throw new Error('a conforming piece is marked as used under a deviation');
  });
});
