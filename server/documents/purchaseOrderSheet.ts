// The purchase order as a PDF to send to the supplier: who orders from whom, and per line the part,
// the ordered specification (copied onto the line when ordered), quantity, price, due date and how
// the lot will be inspected on arrival.
import { findPurchaseOrder } from '../purchasing/purchaseOrders';
import { specLines } from '../inspection/specText';
import { readSiteSettings } from '../settings/siteSettings';
import { MUTED, numberPages, openPdf } from './pdf';

const INK = '#1e2421';
const FRAME = '#234a41';
const LINE = '#dcd9cd';

export type PurchaseOrderSheet = {
  siteName: string;
  number: string;
  orderedOn: string;
  status: 'open' | 'closed';
  currency: string;
  notes: string;
  supplier: { name: string; contactEmail: string; qualityContactEmail: string | null };
  buyer: { name: string; email: string } | null;
  lines: {
    lineNumber: number;
    partNumber: string;
    description: string;
    spec: [string, string][];
    quantity: number;
    unitPrice: number;
    dueOn: string | null;
    inspection: string;
  }[];
};

export async function purchaseOrderSheet(id: number): Promise<PurchaseOrderSheet> {
  const { order } = await findPurchaseOrder(id);
  const { siteName } = await readSiteSettings();
  return {
    siteName,
    number: order.number,
    orderedOn: order.orderedOn,
    status: order.status,
    currency: order.currency,
    notes: order.notes,
    supplier: { name: order.supplier!.name, contactEmail: order.supplier!.contactEmail, qualityContactEmail: order.supplier!.qualityContactEmail },
    buyer: order.buyer ? { name: order.buyer.name, email: order.buyer.email } : null,
    lines: (order.lines ?? []).map((line) => ({
      lineNumber: line.lineNumber,
      partNumber: line.part!.number,
      description: line.part!.description,
      spec: specLines(line.spec),
      quantity: line.quantity,
      unitPrice: Number(line.unitPrice),
      dueOn: line.dueOn,
      inspection: line.hundredPercent
        ? '100 % inspection of every piece'
        : `ISO 2859-1 single sampling, inspection level ${line.inspectionLevel}, AQL ${line.aql}`,
    })),
  };
}

const money = (amount: number, currency: string) => `${amount.toLocaleString('en', { minimumFractionDigits: 2, maximumFractionDigits: 2 })} ${currency}`;

export async function purchaseOrderPdf(id: number) {
  const sheet = await purchaseOrderSheet(id);
  return { number: sheet.number, pdf: await renderPurchaseOrder(sheet) };
}

export async function renderPurchaseOrder(sheet: PurchaseOrderSheet): Promise<Buffer> {
  const { doc, bytes } = openPdf({
    size: 'A4',
    margins: { top: 50, bottom: 60, left: 50, right: 50 },
    bufferPages: true,
    info: { Title: `Purchase order ${sheet.number}`, Author: sheet.siteName, Creator: 'Phaselot' },
  });
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  const bottom = () => doc.page.height - doc.page.margins.bottom;

  doc.rect(0, 0, doc.page.width, 8).fill(FRAME);
  doc.fillColor(INK).font('bold').fontSize(18).text(`Purchase order ${sheet.number}`, left, 46, { width });
  doc
    .font('body')
    .fontSize(9)
    .fillColor(MUTED)
    .text(`${sheet.siteName} · ordered ${sheet.orderedOn}${sheet.status === 'closed' ? ' · closed' : ''}`, { width });
  doc.moveDown(1);

  // Two columns: the supplier we order from, and who orders.
  const top = doc.y;
  const half = width / 2 - 10;
  const block = (x: number, heading: string, rows: string[]) => {
    doc.font('bold').fontSize(8).fillColor(FRAME).text(heading.toUpperCase(), x, top, { width: half, characterSpacing: 0.6 });
    doc.moveDown(0.3);
    rows.forEach((row, index) =>
      doc
        .font(index === 0 ? 'bold' : 'body')
        .fontSize(9.5)
        .fillColor(INK)
        .text(row, x, doc.y, { width: half }),
    );
    return doc.y;
  };
  const supplierEnd = block(left, 'Supplier', [
    sheet.supplier.name,
    `Orders: ${sheet.supplier.contactEmail}`,
    ...(sheet.supplier.qualityContactEmail ? [`Quality: ${sheet.supplier.qualityContactEmail}`] : []),
  ]);
  const buyerEnd = block(left + width / 2 + 10, 'Ordered by', [sheet.siteName, ...(sheet.buyer ? [`Buyer: ${sheet.buyer.name}`, sheet.buyer.email] : [])]);
  doc.y = Math.max(supplierEnd, buyerEnd) + 14;

  let total = 0;
  for (const line of sheet.lines) {
    const amount = line.quantity * line.unitPrice;
    total += amount;
    // A line is kept on one page: its heading, figures and specification.
    const needed = 70 + line.spec.length * 12;
    if (doc.y + needed > bottom()) doc.addPage();
    const y = doc.y;
    doc.rect(left, y, width, 18).fill('#eceae2');
    doc
      .fillColor(INK)
      .font('bold')
      .fontSize(10)
      .text(`Line ${line.lineNumber}: ${line.partNumber}`, left + 6, y + 4, { width: width - 12, lineBreak: false });
    doc.y = y + 24;
    doc.font('body').fontSize(9).fillColor(INK).text(line.description, left, doc.y, { width });
    doc.moveDown(0.3);
    const figures: [string, string][] = [
      ['Quantity', `${line.quantity} pcs`],
      ['Unit price', money(line.unitPrice, sheet.currency)],
      ['Line amount', money(amount, sheet.currency)],
      ['Due', line.dueOn ?? 'not set'],
      ['Incoming inspection', line.inspection],
      ...line.spec,
    ];
    for (const [label, value] of figures) {
      const rowY = doc.y;
      doc.font('body').fontSize(8.5).fillColor(MUTED).text(label, left, rowY, { width: 150 });
      doc
        .font('body')
        .fillColor(INK)
        .text(value, left + 155, rowY, { width: width - 155 });
      doc.moveDown(0.15);
    }
    doc.moveDown(0.8);
  }
  doc
    .moveTo(left, doc.y)
    .lineTo(left + width, doc.y)
    .lineWidth(0.5)
    .strokeColor(LINE)
    .stroke();
  doc
    .moveDown(0.4)
    .font('bold')
    .fontSize(10)
    .fillColor(INK)
    .text(`Order total ${money(total, sheet.currency)}`, left, doc.y, { width, align: 'right' });
  if (sheet.notes) doc.moveDown(0.8).font('body').fontSize(9).text(`Notes: ${sheet.notes}`, left, doc.y, { width });
  doc
    .moveDown(1)
    .font('body')
    .fontSize(8)
    .fillColor(MUTED)
    .text(
      'Mark every piece with its serial number and its fast axis; list the serials and your lot number on the packing slip and send the certificate of ' +
        'your own tests with the shipment. Every lot is held in quarantine on arrival and inspected as stated per line before it is accepted. ' +
        'Pack plates so that nothing touches their faces.',
      left,
      doc.y,
      { width },
    );

  numberPages(doc, `Purchase order ${sheet.number}`, left, width);
  doc.end();
  return bytes;
}
