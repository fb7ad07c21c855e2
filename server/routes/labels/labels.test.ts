// Labels read back as a scanner and a person would: the 2-D code on every page decoded with ZXing
// (@zxing/library, a general-purpose barcode reader) from the image pdfjs-dist takes out of the
// PDF, the text beside it read with pdfjs-dist's text extraction.
import { describe, expect, it } from 'vitest';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { as } from '../../../tests/helpers/api';
import { acceptedLot } from '../../../tests/helpers/acceptedLot';
import { pdfCodes } from '../../../tests/helpers/pdfCodes';
import { pdfPages } from '../../../tests/helpers/pdfText';
import { receivedLot } from '../../../tests/helpers/receivedLot';
import { binaryParser } from '../../../tests/helpers/zip';
import { sequelize } from '../../../db';
import { QueryTypes } from 'sequelize';

async function labelPdf(url: string, role: 'clerk' | 'auditor' = 'clerk') {
  const response = await (await as(role)).get(url).buffer(true).parse(binaryParser).expect(200);
  expect(response.headers['content-type']).toBe('application/pdf');
  return response.body as Buffer;
}

/** Width and height of each page in points. */
async function pageSizes(pdf: Buffer) {
  const document = await getDocument({ data: new Uint8Array(pdf), useSystemFonts: false, isEvalSupported: false }).promise;
  const sizes: [number, number][] = [];
  for (let n = 1; n <= document.numPages; n++) {
    const { width, height } = (await document.getPage(n)).getViewport({ scale: 1 });
    sizes.push([width, height]);
  }
  await document.destroy();
  return sizes;
}

const receivedOn = async (lotId: number) =>
  (
    await sequelize.query<{ day: string }>(
      `SELECT to_char(sh.received_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS day FROM lots l JOIN shipments sh ON sh.id = l.shipment_id WHERE l.id = :lotId`,
      {
        type: QueryTypes.SELECT,
        replacements: { lotId },
      },
    )
  )[0].day;

describe('labels', () => {
  it('prints one small label per serial whose Data Matrix code holds the serial, with part, lot, supplier lot and ISO date beside it', async () => {
    const lot = await receivedLot({ quantity: 3 });
    const pdf = await labelPdf(`/api/labels/lots/${lot.lotId}?kind=serials&stock=57x32mm`);
    expect(await pdfCodes(pdf)).toEqual(lot.serials.map((serial) => [serial]));
    // 57 × 32 mm small label stock (common practice), in points of 1/72 in: 161.57 × 90.71.
    for (const [width, height] of await pageSizes(pdf)) {
      expect(width).toBeCloseTo((57 / 25.4) * 72, 1);
      expect(height).toBeCloseTo((32 / 25.4) * 72, 1);
    }
    const day = await receivedOn(lot.lotId);
    // ISO 8601 calendar date, YYYY-MM-DD.
    expect(day).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    const pages = await pdfPages(pdf);
    pages.forEach((text, index) => {
      expect(text).toContain(lot.serials[index]);
      expect(text).toContain(`L-${lot.lotId}`);
      expect(text).toMatch(/WP-T-\w+/);
      expect(text).toMatch(/SL-\w+/);
      expect(text).toContain(day);
    });
  });

  it('prints the lot label on 4 × 6 in stock with the lot name in its code, and a piece label by the piece', async () => {
    const lot = await receivedLot({ quantity: 2 });
    const pdf = await labelPdf(`/api/labels/lots/${lot.lotId}?kind=lot&stock=4x6in`, 'auditor');
    expect(await pdfCodes(pdf)).toEqual([[`L-${lot.lotId}`]]);
    // 4 × 6 in shipping label stock (common practice): 288 × 432 pt.
    expect(await pageSizes(pdf)).toEqual([[288, 432]]);
    expect((await pdfPages(pdf))[0]).toContain('2 pcs');

    const [piece] = await sequelize.query<{ id: number }>('SELECT id FROM pieces WHERE lot_id = :lotId AND serial = :serial', {
      type: QueryTypes.SELECT,
      replacements: { lotId: lot.lotId, serial: lot.serials[1] },
    });
    const single = await labelPdf(`/api/labels/pieces/${piece.id}`);
    expect(await pdfCodes(single)).toEqual([[lot.serials[1]]]);
  });

  it('prints a status label only while pieces of the lot stand so', async () => {
    const waiting = await receivedLot({ quantity: 4 });
    const quarantine = await labelPdf(`/api/labels/lots/${waiting.lotId}?kind=quarantine`);
    expect(await pdfCodes(quarantine)).toEqual([[`L-${waiting.lotId}`]]);
    expect((await pdfPages(quarantine))[0]).toMatch(/QUARANTINE[\s\S]*4 of 4/);
    const refused = await (await as('clerk')).get(`/api/labels/lots/${waiting.lotId}?kind=accepted`).expect(409);
    expect(refused.body.error.message).toBe(`No piece of L-${waiting.lotId} is accepted into a stock bin; its accepted label would be wrong`);
    await (await as('clerk')).get(`/api/labels/lots/${waiting.lotId}?kind=material-review`).expect(409);

    const accepted = await acceptedLot(20);
    const label = await labelPdf(`/api/labels/lots/${accepted.lotId}?kind=accepted&stock=4x6in`);
    expect((await pdfPages(label))[0]).toMatch(/ACCEPTED[\s\S]*20 of 20/);
    await (await as('clerk')).get(`/api/labels/lots/${accepted.lotId}?kind=quarantine`).expect(409);
  });

  it('refuses unknown lots, pieces, kinds and stock with a clear answer', async () => {
    const clerk = await as('clerk');
    expect((await clerk.get('/api/labels/lots/999999999').expect(404)).body.error.message).toMatch(/Lot/);
    await clerk.get('/api/labels/pieces/999999999').expect(404);
    const lot = await receivedLot({ quantity: 1 });
    const bad = await clerk.get(`/api/labels/lots/${lot.lotId}?kind=sticker&stock=A7`).expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['kind', 'stock']);
  });
});
