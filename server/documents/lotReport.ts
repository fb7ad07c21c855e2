// The two documents a decided lot produces: the certificate of conformance (accepted lots) and the
// inspection report (every decided lot, and the attachment of a rejection mail). One layout of our
// own, rendered with pdfkit and the DejaVu fonts shipped in fonts/ so λ, °, ± and µ always print.
import PDFDocument from 'pdfkit';
import QRCode from 'qrcode';
import { join, resolve } from 'node:path';
import { fixed, MISSING, signedFixed } from '../../shared/format';
import { lotName } from '../../shared/schemas/stock';
import { MUTED, numberPages } from './pdf';

const FONTS = resolve(import.meta.dirname, '../../fonts');

export type ReportPiece = {
  serial: string;
  wavelengthNm: number | null;
  retardanceWaves: number | null;
  retardanceNm: number | null;
  retardanceErrorWaves: number | null;
  axisErrorDeg: number | null;
  /** A piece without a current result is 'not measured' on a report; on a certificate it is released
   * on the strength of the sample. */
  verdict: 'pass' | 'fail' | 'incomplete' | 'not measured' | 'released under the sampling plan';
  reasons: string[];
};

export type LotReportData = {
  kind: 'certificate' | 'inspection-report';
  number: string;
  issuedAt: string;
  siteName: string;
  supplier: string;
  purchaseOrder: string;
  part: { number: string; description: string };
  specLines: [string, string][];
  lot: { id: number; supplierLot: string; quantity: number; receivedAt: string };
  sampling: { summary: string; defectives: number; result: string };
  instruments: { code: string; calibratedOn: string; calibrationDueOn: string; uncertainty: string }[];
  decisionRule: string;
  disposition: { decision: string; signer: string; signedAt: string; meaning: string; deviation?: string; note?: string; outcome: string };
  pieces: ReportPiece[];
  dataHash: string;
  verifyUrl: string;
};

const INK = '#1e2421';
const FRAME = '#234a41';
const LINE = '#dcd9cd';

const COLUMNS: { header: string; width: number; align: 'left' | 'right'; cell: (p: ReportPiece) => string }[] = [
  { header: 'Serial', width: 78, align: 'left', cell: (p) => p.serial },
  { header: 'λ (nm)', width: 44, align: 'right', cell: (p) => fixed(p.wavelengthNm, 1) },
  { header: 'Ret. (λ)', width: 62, align: 'right', cell: (p) => fixed(p.retardanceWaves, 4) },
  { header: 'Ret. (nm)', width: 64, align: 'right', cell: (p) => fixed(p.retardanceNm, 2) },
  { header: 'Error (λ)', width: 58, align: 'right', cell: (p) => signedFixed(p.retardanceErrorWaves, 4) },
  { header: 'Axis error', width: 54, align: 'right', cell: (p) => (p.axisErrorDeg === null ? MISSING : `${signedFixed(p.axisErrorDeg, 2)}°`) },
  { header: 'Verdict', width: 135, align: 'left', cell: (p) => (p.reasons.length ? `${p.verdict}: ${p.reasons.join('; ')}` : p.verdict) },
];

export async function renderLotReport(data: LotReportData): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: 50, bottom: 60, left: 50, right: 50 },
    bufferPages: true,
    info: { Title: `${data.number}`, Author: data.siteName, Creator: 'Phaselot' },
  });
  doc.registerFont('body', join(FONTS, 'DejaVuSans.ttf'));
  doc.registerFont('bold', join(FONTS, 'DejaVuSans-Bold.ttf'));
  doc.registerFont('mono', join(FONTS, 'DejaVuSansMono.ttf'));
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolveDone) => doc.on('end', () => resolveDone(Buffer.concat(chunks))));

  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  const title = data.kind === 'certificate' ? 'Certificate of conformance' : 'Inspection report';

  // Header band: title, number and the verification QR code.
  doc.rect(0, 0, doc.page.width, 8).fill(FRAME);
  const qr = await QRCode.toBuffer(data.verifyUrl, { margin: 1, width: 180 });
  doc.image(qr, left + width - 78, 40, { width: 78 });
  doc
    .fillColor(INK)
    .font('bold')
    .fontSize(18)
    .text(title, left, 46, { width: width - 90 });
  doc
    .font('body')
    .fontSize(9)
    .fillColor(MUTED)
    .text(`${data.siteName} · incoming inspection of wave plates`, { width: width - 90 });
  doc.moveDown(0.6).font('bold').fontSize(11).fillColor(INK).text(`No. ${data.number}`);
  doc.font('body').fontSize(8.5).fillColor(MUTED).text(`Issued ${data.issuedAt}`);
  doc.text(`Verify: ${data.verifyUrl}`, { width: width - 90 });
  doc.moveDown(1);

  const section = (heading: string) => {
    doc.moveDown(0.5).font('bold').fontSize(10).fillColor(FRAME).text(heading.toUpperCase(), left, doc.y, { characterSpacing: 0.6 });
    doc
      .moveTo(left, doc.y + 2)
      .lineTo(left + width, doc.y + 2)
      .lineWidth(0.5)
      .strokeColor(LINE)
      .stroke();
    doc.moveDown(0.4);
  };
  const pairs = (rows: [string, string][]) => {
    for (const [label, value] of rows) {
      const y = doc.y;
      doc.font('body').fontSize(8.5).fillColor(MUTED).text(label, left, y, { width: 150 });
      doc
        .font('body')
        .fillColor(INK)
        .text(value, left + 155, y, { width: width - 155 });
      doc.moveDown(0.15);
    }
  };

  section('Order and lot');
  pairs([
    ['Supplier', data.supplier],
    ['Purchase order', data.purchaseOrder],
    ['Part', `${data.part.number} — ${data.part.description}`],
    ['Lot', `${lotName(data.lot.id)}: supplier lot ${data.lot.supplierLot}, ${data.lot.quantity} pieces received ${data.lot.receivedAt}`],
  ]);
  section('Ordered specification');
  pairs(data.specLines);
  section('Sampling and result');
  pairs([
    ['Plan', data.sampling.summary],
    ['Defectives in sample', String(data.sampling.defectives)],
    ['Result', data.sampling.result],
    ['Decision rule', data.decisionRule],
  ]);
  section('Instruments');
  pairs(data.instruments.map((i) => [i.code, `calibrated ${i.calibratedOn}, due ${i.calibrationDueOn}; expanded uncertainty ${i.uncertainty}`]));
  section('Disposition');
  pairs([
    ['Decision', data.disposition.decision],
    ...(data.disposition.deviation ? ([['Deviation', data.disposition.deviation]] as [string, string][]) : []),
    ...(data.disposition.note ? ([['Note', data.disposition.note]] as [string, string][]) : []),
    ['Signed by', `${data.disposition.signer}, ${data.disposition.signedAt}`],
    ['Meaning of the signature', data.disposition.meaning],
    ['Pieces', data.disposition.outcome],
  ]);

  const serials = new Set(data.pieces.map((p) => p.serial)).size;
  section(data.kind === 'certificate' ? `Serials released (${serials})` : `Pieces (${serials})`);
  const drawHeader = () => {
    let x = left;
    const y = doc.y;
    doc.rect(left, y - 2, width, 14).fill('#eceae2');
    doc.font('bold').fontSize(7.5).fillColor(INK);
    for (const column of COLUMNS) {
      doc.text(column.header, x + 2, y + 1, { width: column.width - 4, align: column.align, lineBreak: false });
      x += column.width;
    }
    doc.y = y + 15;
  };
  drawHeader();
  const bottom = doc.page.height - doc.page.margins.bottom;
  for (const piece of data.pieces) {
    doc.font('body').fontSize(7.5);
    const verdictHeight = doc.heightOfString(COLUMNS[6].cell(piece), { width: COLUMNS[6].width - 4 });
    const rowHeight = Math.max(11, verdictHeight + 2);
    if (doc.y + rowHeight > bottom) {
      doc.addPage();
      doc.y = doc.page.margins.top;
      drawHeader();
    }
    const y = doc.y;
    let x = left;
    for (const column of COLUMNS) {
      const failing = column.header === 'Verdict' && (piece.verdict === 'fail' || piece.verdict === 'incomplete');
      doc.font(column.header === 'Serial' ? 'mono' : 'body').fillColor(failing ? '#b3372f' : INK);
      doc.text(column.cell(piece), x + 2, y, { width: column.width - 4, align: column.align });
      x += column.width;
    }
    doc.y = y + rowHeight;
    doc
      .moveTo(left, doc.y - 1)
      .lineTo(left + width, doc.y - 1)
      .lineWidth(0.3)
      .strokeColor(LINE)
      .stroke();
  }

  doc.moveDown(1).font('body').fontSize(7.5).fillColor(MUTED);
  doc.text(`SHA-256 of the certified data: `, left, doc.y, { continued: true }).font('mono').text(data.dataHash);
  doc
    .font('body')
    .moveDown(0.4)
    .text(
      'Acceptance of this lot was decided under the site quality system and its procedures; Phaselot records the measurements, the rule applied and the signature. ' +
        'Handle plates by the rim; cemented plates have damage thresholds.',
      { width },
    );

  numberPages(doc, `${title} ${data.number}`, left, width);
  doc.end();
  return done;
}
