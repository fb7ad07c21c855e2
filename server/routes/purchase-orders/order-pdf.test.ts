// The PO PDF sent to the supplier, read back with pdfjs-dist's text extraction.
import { describe, expect, it } from 'vitest';
import { as } from '../../../tests/helpers/api';
import { pdfPages } from '../../../tests/helpers/pdfText';
import { uniqueTag } from '../../../tests/helpers/purchasing';
import { binaryParser } from '../../../tests/helpers/zip';
import { readSiteSettings } from '../../settings/siteSettings';

describe('GET /api/purchase-orders/:id/order.pdf', () => {
  it('lists each line with part, description, ordered tolerances, quantity, due date and inspection, the supplier contact and our site', async () => {
    const buyer = await as('buyer');
    const tag = uniqueTag();
    const supplier = await buyer
      .post('/api/suppliers')
      .send({
        name: `Sheet supplier ${tag}`,
        contactEmail: `orders-${tag.toLowerCase()}@example.test`,
        qualityContactEmail: `qa-${tag.toLowerCase()}@example.test`,
      })
      .expect(201);
    const spec = {
      nominalWaves: 0.5,
      designWavelengthNm: 1064,
      retardanceTolWaves: 0.004,
      axisTolDeg: 0.3,
      construction: 'zero-order',
      material: 'mgf2',
      clearApertureMm: 8,
      diameterMm: 10,
      decisionRule: 'simple',
    };
    const part = await buyer
      .post('/api/parts')
      .send({ number: `HW-${tag}`, description: 'Half-wave plate for the sheet test', spec })
      .expect(201);
    const order = await buyer
      .post('/api/purchase-orders')
      .send({
        number: `PO-S-${tag}`,
        supplierId: supplier.body.id,
        orderedOn: '2026-11-20',
        currency: 'EUR',
        status: 'open',
        notes: 'Deliver to dock 2',
        lines: [
          { partId: part.body.id, quantity: 40, unitPrice: 95.5, inspectionLevel: 'II', aql: 0.65, hundredPercent: false, dueOn: '2027-01-15' },
          { partId: part.body.id, quantity: 5, unitPrice: 100, inspectionLevel: 'II', aql: 1, hundredPercent: true },
        ],
      })
      .expect(201);
    const pdf = await (await as('auditor')).get(`/api/purchase-orders/${order.body.id}/order.pdf`).buffer(true).parse(binaryParser).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const text = (await pdfPages(pdf.body as Buffer)).join(' ').replace(/\s+/g, ' ');
    expect(text).toContain(`Purchase order PO-S-${tag}`);
    expect(text).toContain((await readSiteSettings()).siteName);
    expect(text).toContain(`Sheet supplier ${tag}`);
    expect(text).toContain(`Orders: orders-${tag.toLowerCase()}@example.test`);
    expect(text).toContain(`Quality: qa-${tag.toLowerCase()}@example.test`);
    expect(text).toContain(`Line 1: HW-${tag}`);
    expect(text).toContain('Half-wave plate for the sheet test');
    expect(text).toContain('40 pcs');
    expect(text).toContain('Due 2027-01-15');
    expect(text).toContain('ISO 2859-1 single sampling, inspection level II, AQL 0.65');
    expect(text).toContain('0.5 λ at 1064 nm');
    expect(text).toContain('±0.004 λ');
    expect(text).toContain('±0.3°');
    expect(text).toContain('Line 2:');
    expect(text).toContain('100 % inspection of every piece');
    expect(text).toContain('Due not set');
    // 40 × 95.50 + 5 × 100.00 = 4,320.00 (arithmetic).
    expect(text).toContain('Order total 4,320.00 EUR');
    expect(text).toContain('Deliver to dock 2');
  });

  it('answers 404 for a PO that does not exist', async () => {
    await (await as('clerk')).get('/api/purchase-orders/999999999/order.pdf').expect(404);
  });
});
