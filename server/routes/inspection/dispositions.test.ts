// Pieces follow their verdict: where each decision sends a lot's pieces, what the stock ledger then
// refuses, the 100 % sort, and the documents that list what they certify. That a failed piece is
// segregated (material review) and never used without a signed deviation, and that a rejected lot
// may be screened 100 % with only the conforming pieces kept, is common practice of incoming
// inspection; ISO 2859-1 leaves the disposal of rejected lots to the responsible authority.
import { QueryTypes } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { sequelize } from '../../../db';
import { OutboxMail } from '../../../db/models';
import { as } from '../../../tests/helpers/api';
import { benchFile, documentText, sampleOf, signDecision, uploadBench } from '../../../tests/helpers/bench';
import { approvedDeviation } from '../../../tests/helpers/deviations';
import { receivedLot } from '../../../tests/helpers/receivedLot';

/** Where each serial of the lot is now: its location's kind and the piece's state. */
async function whereabouts(lotId: number) {
  const rows = await sequelize.query<{ serial: string; kind: string | null; state: string }>(
    `SELECT p.serial, loc.kind, p.state FROM pieces p JOIN piece_locations pl ON pl.piece_id = p.id LEFT JOIN locations loc ON loc.id = pl.location_id
      WHERE p.lot_id = :lotId ORDER BY p.serial`,
    { type: QueryTypes.SELECT, replacements: { lotId } },
  );
  return new Map(rows.map((r) => [r.serial, { kind: r.kind ?? 'issued', state: r.state }]));
}

const serialsAt = (where: Map<string, { kind: string }>, kind: string) => [...where].filter(([, w]) => w.kind === kind).map(([serial]) => serial);

async function locationId(code: string) {
  const [row] = await sequelize.query<{ id: number }>('SELECT id FROM locations WHERE code = :code', { type: QueryTypes.SELECT, replacements: { code } });
  return row.id;
}

async function quantitiesOf(lotId: number) {
  const auditor = await as('auditor');
  const lot = (await auditor.get(`/api/lots/${lotId}`).expect(200)).body;
  const listed = (await auditor.get(`/api/lots?purchaseOrderId=${lot.purchaseOrder.id}`).expect(200)).body;
  const order = (await auditor.get(`/api/purchase-orders/${lot.purchaseOrder.id}`).expect(200)).body;
  const orders = (await auditor.get(`/api/purchase-orders?q=${encodeURIComponent(lot.purchaseOrder.number)}`).expect(200)).body;
  const pick = (r: { accepted: number; nonconforming: number; returned: number }) => ({
    accepted: r.accepted,
    nonconforming: r.nonconforming,
    returned: r.returned,
  });
  return { lot: pick(lot), listed: pick(listed.data[0]), line: pick(order.lines[0]), order: pick(orders.data[0]) };
}

describe('pieces follow their verdict', () => {
  it('accept: conforming and unmeasured pieces go to stock, a failed sample piece to material review, where it cannot be issued, transferred or put away', async () => {
    const lot = await receivedLot({ quantity: 60, level: 'II', aql: 2.5 });
    const { view, sample } = await sampleOf(lot.lotId);
    // ISO 2859-1:1999 Table 1: 51-90 at level II is code letter E; Table 2-A at AQL 2.5 leads to the plan
    // of letter F, n = 20, Ac 1, Re 2 (every cell is checked in shared/sampling/tables.test.ts). With
    // Ac 1 the lot is accepted with one failed piece in its sample.
    expect(view.plan).toMatchObject({ codeLetter: 'E', sampleSize: 20, accept: 1, reject: 2 });
    const failed = sample[0];
    await uploadBench(lot.lotId, 'bench.csv', benchFile(sample, [failed]));
    expect((await sampleOf(lot.lotId)).view.verdict).toMatchObject({ proposal: 'accept', defectives: 1 });

    const note = 'One plate out of tolerance; lot released on the sample';
    const signed = await signDecision(lot.lotId, 'accept', null, { justification: note });

    const where = await whereabouts(lot.lotId);
    expect(serialsAt(where, 'material-review')).toEqual([failed]);
    expect(where.get(failed)!.state).toBe('held');
    expect(serialsAt(where, 'stock')).toHaveLength(59);

    // The ledger refuses the failed piece everywhere it could reach stock or a work order.
    const clerk = await as('clerk');
    const issued = await clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: failed, workOrder: 'WO-NC-1' }).expect(409);
    expect(issued.body.error).toMatchObject({
      message: `Nonconforming pieces cannot be issued: ${failed} (failed inspection)`,
      details: { serials: [failed] },
    });
    const moved = await clerk
      .post('/api/stock/transfer')
      .send({ partId: lot.partId, serials: failed, toLocationId: await locationId('BIN-B1') })
      .expect(409);
    expect(moved.body.error.message).toBe(`Nonconforming pieces cannot go to stock: ${failed} (failed inspection)`);
    const putAway = await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('BIN-B1'), serials: failed })
      .expect(409);
    expect(putAway.body.error.message).toBe(`Nonconforming pieces cannot go to stock: ${failed} (failed inspection)`);
    // Putting away "whatever is waiting" leaves the piece under review where it is.
    const nothing = await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('BIN-B1') })
      .expect(400);
    expect(nothing.body.error.message).toBe(`Lot L-${lot.lotId} has no pieces waiting to be put away`);
    const good = sample[1];
    await clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: good, workOrder: 'WO-NC-1' }).expect(201);

    // The certificate lists every serial it releases: the measured ones with their readings, the
    // others as released under the sampling plan; the failed one is not among them.
    const certificate = signed.body.documents.find((d: { kind: string }) => d.kind === 'certificate');
    const text = await documentText(certificate.number);
    const released = lot.serials.filter((s) => s !== failed);
    for (const serial of released) expect(text).toContain(serial);
    expect(text).not.toContain(failed);
    expect(text).toMatch(/Serials released \(59\)/i);
    expect(text.match(/released under the sampling plan/g)).toHaveLength(60 - 20);
    expect(text).toContain(note);
    expect(text).toContain(`L-${lot.lotId}`);
    const report = await documentText(signed.body.documents.find((d: { kind: string }) => d.kind === 'inspection-report').number);
    expect(report).toContain(note);
    expect(report).toContain(failed);

    expect(await quantitiesOf(lot.lotId)).toEqual({
      lot: { accepted: 59, nonconforming: 1, returned: 0 },
      listed: { accepted: 59, nonconforming: 1, returned: 0 },
      line: { accepted: 59, nonconforming: 1, returned: 0 },
      order: { accepted: 59, nonconforming: 1, returned: 0 },
    });
  });

  it('sort: the lot reopens for every piece, the commit that measures the last one routes each by its verdict and certifies the released serials', async () => {
    const lot = await receivedLot({ quantity: 30, level: 'II', aql: 1 });
    const { sample } = await sampleOf(lot.lotId);
    await uploadBench(lot.lotId, 'sample.csv', benchFile(sample, [sample[0]]));
    expect((await sampleOf(lot.lotId)).view.verdict.proposal).toBe('reject');

    const note = 'Supplier agreed to a full sort at our bench';
    const signed = await signDecision(lot.lotId, 'sort', null, { justification: note });
    expect(signed.body.documents.map((d: { kind: string }) => d.kind)).toEqual(['inspection-report']);
    const mail = await OutboxMail.findOne({ where: { relatedType: 'lot', relatedId: String(lot.lotId) } });
    expect(mail!.subject).toMatch(new RegExp(`^Lot L-${lot.lotId} rejected, 100 % sort ordered: `));
    expect(mail!.bodyText).toContain(note);

    // Every piece is up for measurement now, not only the sample.
    const sorting = await sampleOf(lot.lotId);
    expect(sorting.view.lot.state).toBe('sorting');
    expect(sorting.pieces.every((p) => p.toMeasure)).toBe(true);
    const rest = sorting.pieces.filter((p) => !p.inSample).map((p) => p.serial);
    expect(sorting.view.sort).toEqual({ remaining: rest.length });
    const queued = (
      await (
        await as('inspector')
      )
        .get('/api/inspection/queue')
        .query({ q: `L-${lot.lotId}` })
        .expect(200)
    ).body.data.find((r: { lotId: number }) => r.lotId === lot.lotId);
    expect(queued).toMatchObject({ state: 'sorting', sortRemaining: rest.length });
    const early = await (
      await as('clerk')
    )
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('BIN-A1') })
      .expect(409);
    expect(early.body.error.message).toMatch(`Only pieces of accepted lots go to stock; lot L-${lot.lotId} is sorting 100 %`);

    const firstHalf = rest.slice(0, 8);
    const secondHalf = rest.slice(8);
    const partly = await uploadBench(lot.lotId, 'sort-1.csv', benchFile(firstHalf, [firstHalf[0]]));
    expect(partly.body.sortCompleted).toBeNull();
    expect((await sampleOf(lot.lotId)).view.sort).toEqual({ remaining: secondHalf.length });

    const last = await uploadBench(lot.lotId, 'sort-2.csv', benchFile(secondHalf, [secondHalf[0]]));
    const failing = [sample[0], firstHalf[0], secondHalf[0]];
    expect(last.body.sortCompleted).toMatchObject({ released: 27, returned: 3 });
    expect(last.body.sortCompleted.documents.map((d: { kind: string }) => d.kind)).toEqual(['certificate', 'inspection-report']);

    const where = await whereabouts(lot.lotId);
    expect(serialsAt(where, 'return-to-vendor').sort()).toEqual([...failing].sort());
    expect(serialsAt(where, 'stock')).toHaveLength(27);
    expect((await sampleOf(lot.lotId)).view.lot.state).toBe('sorted');
    await uploadBench(lot.lotId, 'late.csv', benchFile([rest[1]]), 409);

    const certificate = last.body.sortCompleted.documents.find((d: { kind: string }) => d.kind === 'certificate');
    const text = await documentText(certificate.number);
    for (const serial of lot.serials.filter((s) => !failing.includes(s))) expect(text).toContain(serial);
    for (const serial of failing) expect(text).not.toContain(serial);
    expect(text).toMatch(/Serials released \(27\)/i);
    expect(text).toContain('Sort 100 %');
    expect(text).toContain(note);
    expect(text).not.toContain('released under the sampling plan');
    const verified = await (await as('auditor')).get('/api/certificates/verify').query({ number: certificate.number, hash: certificate.dataHash }).expect(200);
    expect(verified.body).toMatchObject({ genuine: true, current: true });

    const clerk = await as('clerk');
    const refused = await clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: secondHalf[0], workOrder: 'WO-SORT-1' }).expect(409);
    expect(refused.body.error.message).toBe(`Nonconforming pieces cannot be issued: ${secondHalf[0]} (failed inspection)`);
    await clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: secondHalf[1], workOrder: 'WO-SORT-1' }).expect(201);
    expect((await quantitiesOf(lot.lotId)).lot).toEqual({ accepted: 27, nonconforming: 3, returned: 3 });
  });

  it('sort of a lot whose every piece is measured already completes at the signature', async () => {
    const lot = await receivedLot({ quantity: 8, level: 'II', aql: 1, hundredPercent: true });
    const { sample } = await sampleOf(lot.lotId);
    expect(sample).toHaveLength(8);
    await uploadBench(lot.lotId, 'all.csv', benchFile(sample, [sample[2]]));
    const signed = await signDecision(lot.lotId, 'sort', null);
    expect(signed.body.documents.map((d: { kind: string }) => d.kind)).toEqual(['inspection-report', 'certificate', 'inspection-report']);
    const where = await whereabouts(lot.lotId);
    expect(serialsAt(where, 'return-to-vendor')).toEqual([sample[2]]);
    expect(serialsAt(where, 'stock')).toHaveLength(7);
    expect((await sampleOf(lot.lotId)).view.lot.state).toBe('sorted');
  });

  it('use as is: failed pieces go to stock only under the signed deviation, can be issued, and their history says so', async () => {
    const lot = await receivedLot({ quantity: 20, level: 'II', aql: 1 });
    const { sample } = await sampleOf(lot.lotId);
    const failed = sample[0];
    await uploadBench(lot.lotId, 'bench.csv', benchFile(sample, [failed]));
    const justification = 'Retardance error harmless in the alignment jig build';
    const deviation = await approvedDeviation(lot.supplierId, lot.partId);
    const signed = await signDecision(lot.lotId, 'use-as-is', null, { deviationId: deviation.id, justification });
    expect(serialsAt(await whereabouts(lot.lotId), 'stock')).toHaveLength(20);

    await (await as('clerk')).post('/api/stock/issue').send({ partId: lot.partId, serials: failed, workOrder: 'WO-DEV-9' }).expect(201);
    const history = (await (await as('auditor')).get(`/api/pieces/${failed}`).expect(200)).body.data[0];
    expect(history.releasedAsIs).toMatchObject({ deviationNumber: deviation.number, justification });
    expect(history.moves.map((m: { note: string | null }) => m.note)).toContain(
      `Released as is under deviation ${deviation.number} (lot L-${lot.lotId}): this piece failed inspection`,
    );
    const conforming = (await (await as('auditor')).get(`/api/pieces/${sample[1]}`).expect(200)).body.data[0];
    expect(conforming.releasedAsIs).toBeNull();

    const report = await documentText(signed.body.documents[0].number);
    expect(report).toContain(deviation.number);
    expect(report).toContain(justification);

    // Superseded by a rejection, the lot's pieces still on site go back to the vendor, and the
    // exception ends with the decision that made it.
    await signDecision(lot.lotId, 'reject', signed.body.dispositionId, { justification: 'Deviation withdrawn by design' });
    const where = await whereabouts(lot.lotId);
    expect(where.get(failed)!.kind).toBe('issued');
    expect(serialsAt(where, 'return-to-vendor')).toHaveLength(19);
    expect((await (await as('auditor')).get(`/api/pieces/${failed}`).expect(200)).body.data[0].releasedAsIs).toBeNull();
  });
});
