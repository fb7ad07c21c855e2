import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { app, as } from '../../../tests/helpers/api';
import { orderedLine, receiveOk, receiveThroughApi, uniqueTag } from '../../../tests/helpers/purchasing';

describe('/api/lots', () => {
  it('lists lots filtered by state and found by one of their serials, with totals and CSV', async () => {
    const auditor = await as('auditor');
    const lot = await receiveThroughApi(7);
    const bySerial = await auditor.get(`/api/lots?q=${lot.serials[4]}`).expect(200);
    expect(bySerial.body).toMatchObject({ total: 1, totals: { quantity: 7 } });
    expect(bySerial.body.data[0]).toMatchObject({ id: lot.lotId, state: 'quarantine', quantity: 7, poNumber: lot.order.number, lineNumber: 1 });

    const quarantined = await auditor.get('/api/lots?state=quarantine&pageSize=500').expect(200);
    expect(quarantined.body.data.every((l: { state: string }) => l.state === 'quarantine')).toBe(true);
    expect(quarantined.body.data.some((l: { id: number }) => l.id === lot.lotId)).toBe(true);
    await auditor.get('/api/lots?state=lost').expect(400);

    const csv = await auditor.get(`/api/lots?q=${lot.serials[4]}&format=csv`).expect(200);
    expect(csv.text.replace(/^\uFEFF/, '').split('\n')[1]).toMatch(new RegExp(`^L-${lot.lotId},`));
  });

  it('finds a lot by its shipment’s packing slip and shows the shipment’s receipt time', async () => {
    const auditor = await as('auditor');
    const tag = uniqueTag();
    const slip = `PS-${tag}`;
    const line = await orderedLine(2);
    const { lotId } = await receiveOk(line.lineId, { quantity: 2, serials: `${tag}-1..${tag}-2`, packingSlipNumber: slip });
    const found = await auditor.get(`/api/lots?q=${slip}`).expect(200);
    expect(found.body.data.map((l: { id: number }) => l.id)).toEqual([lotId]);
    const opened = await auditor.get(`/api/lots/${lotId}`).expect(200);
    expect(opened.body.shipment.packingSlip).toBe(slip);
    expect(found.body.data[0].receivedAt).toBe(opened.body.shipment.receivedAt);
  });

  it('pages in order by the lot’s own columns and by what became of its pieces, without overlap', async () => {
    const auditor = await as('auditor');
    await receiveThroughApi(3);
    type Listed = { id: number; accepted: number; receivedAt: string };
    const orders: [string, (l: Listed) => number | string][] = [
      ['-accepted', (l) => l.accepted],
      ['accepted', (l) => l.accepted],
      ['-receivedAt', (l) => l.receivedAt],
      ['receivedAt', (l) => l.receivedAt],
    ];
    for (const [sort, value] of orders) {
      const page = async (n: number) => (await auditor.get('/api/lots').query({ sort, pageSize: 3, page: n }).expect(200)).body.data as Listed[];
      const lots = [...(await page(1)), ...(await page(2))];
      expect(lots).toHaveLength(6);
      expect(new Set(lots.map((l) => l.id)).size).toBe(6);
      const values = lots.map(value);
      const ordered = [...values].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
      expect(values).toEqual(sort.startsWith('-') ? ordered.reverse() : ordered);
    }
  });

  it('shows a lot with its PO line, frozen specification, pieces and attachments', async () => {
    const lot = await receiveThroughApi(2);
    const view = (await (await as('inspector')).get(`/api/lots/${lot.lotId}`).expect(200)).body;
    expect(view).toMatchObject({
      purchaseOrder: { number: lot.order.number },
      line: { lineNumber: 1, quantity: 2, inspectionLevel: 'II', aql: 1, spec: { nominalWaves: 0.25, designWavelengthNm: 632.8 } },
      part: { id: lot.partId },
    });
    expect(view.attachments).toEqual([
      expect.objectContaining({ kind: 'packing-slip', mediaType: 'application/pdf', sha256: expect.stringMatching(/^[0-9a-f]{64}$/) }),
    ]);
    await (await as('inspector')).get('/api/lots/999999').expect(404);
  });
});

describe('who may do what in purchasing, receiving and stock', () => {
  const reads = [
    '/api/suppliers',
    '/api/parts',
    '/api/purchase-orders',
    '/api/purchase-orders/open-lines',
    '/api/shipments',
    '/api/lots',
    '/api/stock',
    '/api/stock/moves',
    '/api/stock/locations',
  ];

  it('lets the auditor read everything and change nothing', async () => {
    const auditor = await as('auditor');
    for (const url of reads) await auditor.get(url).expect(200);
    const lot = await receiveThroughApi(1);
    const part = (await auditor.get(`/api/parts/${lot.partId}`).expect(200)).body;
    const order = (await auditor.get(`/api/purchase-orders/${lot.order.id}`).expect(200)).body;
    await auditor.get(`/api/lots/${lot.lotId}`).expect(200);
    await auditor.get(`/api/pieces/${lot.serials[0]}`).expect(200);

    await auditor.post('/api/suppliers').send({ name: 'Auditor supplier', contactEmail: 'a@a.example' }).expect(403);
    await auditor.put(`/api/suppliers/${lot.supplierId}`).send({ name: 'Renamed', contactEmail: 'a@a.example' }).expect(403);
    await auditor.post('/api/parts').send(part).expect(403);
    await auditor.put(`/api/parts/${lot.partId}`).send(part).expect(403);
    await auditor.post('/api/purchase-orders').send(order).expect(403);
    await auditor.put(`/api/purchase-orders/${lot.order.id}`).send(order).expect(403);
    await auditor.post('/api/shipments').field('poLineId', String(lot.lineId)).expect(403);
    await auditor.post('/api/stock/issue').send({ partId: lot.partId, serials: lot.serials[0], workOrder: 'WO-A' }).expect(403);
  });

  it('does not let the clerk change suppliers or orders', async () => {
    const clerk = await as('clerk');
    const lot = await receiveThroughApi(1);
    await clerk.put(`/api/suppliers/${lot.supplierId}`).send({ name: 'Renamed', contactEmail: 'a@a.example' }).expect(403);
    await clerk.post('/api/purchase-orders').send({}).expect(403);
  });

  it('answers 401 without sign-in', async () => {
    for (const url of reads) await request(app).get(url).expect(401);
    await request(app).get('/api/attachments/1').expect(401);
  });
});
