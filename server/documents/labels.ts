// Printable labels: a lot label, one label per serial, and status labels (quarantine, accepted,
// material review) for the lot's pieces where they stand. Each label carries a Data Matrix code
// holding exactly what is printed as its name (the serial, or the lot's name L-8), so the header's
// scan box finds it, and the text a person reads beside it. One label per page, sized to the stock.
import bwipjs from 'bwip-js/node';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { LABEL_STOCK_LABELS, type LabelStock, type LotLabelKind } from '../../shared/schemas/labels';
import { lotName, type LocationKind } from '../../shared/schemas/stock';
import { conflict, notFound } from '../http/errors';
import { readSiteSettings } from '../settings/siteSettings';
import { openPdf } from './pdf';

const POINTS_PER_MM = 72 / 25.4;
/** Page size in points, width × height. */
const STOCK_SIZES: Record<LabelStock, [number, number]> = {
  '4x6in': [4 * 72, 6 * 72],
  '57x32mm': [57 * POINTS_PER_MM, 32 * POINTS_PER_MM],
};

export type Label = {
  /** What the 2-D code holds, printed as the label's name too. */
  code: string;
  /** A status word printed white on a black band (thermal printers print black only). */
  status?: string;
  lines: [string, string][];
};

type LotRow = {
  id: number;
  partNumber: string;
  supplierName: string;
  supplierLot: string;
  quantity: number;
  receivedAt: Date;
};
type PieceRow = { id: number; serial: string; lotId: number; locationKind: LocationKind | null };

const LOT_SQL = `SELECT l.id, pt.number AS "partNumber", s.name AS "supplierName", l.supplier_lot AS "supplierLot", l.quantity,
                        sh.received_at AS "receivedAt"
                   FROM lots l JOIN parts pt ON pt.id = l.part_id JOIN shipments sh ON sh.id = l.shipment_id
                   JOIN purchase_orders po ON po.id = sh.purchase_order_id JOIN suppliers s ON s.id = po.supplier_id
                  WHERE l.id = :lotId`;
const PIECE_SQL = `SELECT p.id, p.serial, p.lot_id AS "lotId", loc.kind AS "locationKind"
                     FROM pieces p LEFT JOIN piece_locations pl ON pl.piece_id = p.id LEFT JOIN locations loc ON loc.id = pl.location_id`;

const isoDate = (at: Date) => at.toISOString().slice(0, 10);

async function lotRow(lotId: number) {
  const [lot] = await sequelize.query<LotRow>(LOT_SQL, { type: QueryTypes.SELECT, replacements: { lotId } });
  if (!lot) throw notFound('Lot');
  return lot;
}

const serialLabel = (lot: LotRow, serial: string): Label => ({
  code: serial,
  lines: [
    ['Part', lot.partNumber],
    ['Lot', lotName(lot.id)],
    ['Supplier lot', lot.supplierLot],
    ['Received', isoDate(lot.receivedAt)],
  ],
});

/** Where the pieces a status label speaks for stand, and the status word it prints. */
const STATUS_OF: Record<Exclude<LotLabelKind, 'lot' | 'serials'>, { kind: LocationKind; word: string; none: string }> = {
  quarantine: { kind: 'quarantine', word: 'QUARANTINE', none: 'in quarantine' },
  accepted: { kind: 'stock', word: 'ACCEPTED', none: 'accepted into a stock bin' },
  'material-review': { kind: 'material-review', word: 'MATERIAL REVIEW', none: 'in material review' },
};

/** The labels of a lot of one kind. A status label is refused while no piece of the lot stands so. */
export async function lotLabels(lotId: number, kind: LotLabelKind): Promise<Label[]> {
  const lot = await lotRow(lotId);
  const name = lotName(lot.id);
  if (kind === 'lot')
    return [
      {
        code: name,
        lines: [
          ['Part', lot.partNumber],
          ['Supplier', lot.supplierName],
          ['Supplier lot', lot.supplierLot],
          ['Quantity', `${lot.quantity} pcs`],
          ['Received', isoDate(lot.receivedAt)],
        ],
      },
    ];
  const pieces = await sequelize.query<PieceRow>(`${PIECE_SQL} WHERE p.lot_id = :lotId ORDER BY p.serial`, {
    type: QueryTypes.SELECT,
    replacements: { lotId },
  });
  if (kind === 'serials') return pieces.map((piece) => serialLabel(lot, piece.serial));
  const status = STATUS_OF[kind];
  const count = pieces.filter((piece) => piece.locationKind === status.kind).length;
  if (count === 0) throw conflict(`No piece of ${name} is ${status.none}; its ${status.word.toLowerCase()} label would be wrong`);
  return [
    {
      code: name,
      status: status.word,
      lines: [
        ['Part', lot.partNumber],
        ['Supplier lot', lot.supplierLot],
        ['Pieces', `${count} of ${lot.quantity}`],
        ['Labelled', isoDate(new Date())],
      ],
    },
  ];
}

/** The label of one piece (by id: a serial is unique only within its part). */
export async function pieceLabel(pieceId: number): Promise<Label> {
  const [piece] = await sequelize.query<PieceRow>(`${PIECE_SQL} WHERE p.id = :pieceId`, { type: QueryTypes.SELECT, replacements: { pieceId } });
  if (!piece) throw notFound('Piece');
  return serialLabel(await lotRow(piece.lotId), piece.serial);
}

/** The Data Matrix symbol as a PNG with a quiet zone of two modules, black on opaque white. */
function dataMatrix(text: string) {
  return bwipjs.toBuffer({ bcid: 'datamatrix', text, scale: 8, padding: 2, backgroundcolor: 'FFFFFF' });
}

/** A lot's labels of one kind as a PDF for the stock. */
export async function lotLabelsPdf(lotId: number, kind: LotLabelKind, stock: LabelStock) {
  const labels = await lotLabels(lotId, kind);
  return renderLabels(labels, stock, (await readSiteSettings()).siteName);
}

export async function pieceLabelPdf(pieceId: number, stock: LabelStock) {
  const label = await pieceLabel(pieceId);
  return { serial: label.code, pdf: await renderLabels([label], stock, (await readSiteSettings()).siteName) };
}

export async function renderLabels(labels: Label[], stock: LabelStock, siteName: string): Promise<Buffer> {
  const [pageWidth, pageHeight] = STOCK_SIZES[stock];
  const { doc, bytes } = openPdf({
    size: [pageWidth, pageHeight],
    margin: 0,
    autoFirstPage: false,
    info: { Title: `Labels ${labels[0]?.code ?? ''} (${LABEL_STOCK_LABELS[stock]})`, Author: siteName, Creator: 'Phaselot' },
  });
  for (const label of labels) {
    doc.addPage({ size: [pageWidth, pageHeight], margin: 0 });
    const symbol = await dataMatrix(label.code);
    if (stock === '4x6in') drawLarge(doc, label, symbol, pageWidth, siteName);
    else drawSmall(doc, label, symbol, pageWidth, pageHeight);
  }
  doc.end();
  return bytes;
}

type Doc = ReturnType<typeof openPdf>['doc'];

function statusBand(doc: Doc, word: string, x: number, y: number, width: number, height: number, size: number) {
  doc.rect(x, y, width, height).fill('#000000');
  doc
    .font('bold')
    .fontSize(size)
    .fillColor('#ffffff')
    .text(word, x, y + (height - size * 1.17) / 2, { width, align: 'center', lineBreak: false });
  doc.fillColor('#000000');
}

/** 4 × 6 in, portrait: status band, name, a 2 in code, the lines in 14 pt, the site at the foot. */
function drawLarge(doc: Doc, label: Label, symbol: Buffer, width: number, siteName: string) {
  const margin = 18;
  const inner = width - 2 * margin;
  let y = margin;
  if (label.status) {
    statusBand(doc, label.status, margin, y, inner, 54, label.status.length > 12 ? 24 : 30);
    y += 66;
  }
  doc.font('bold').fontSize(24).fillColor('#000000').text(label.code, margin, y, { width: inner, height: 58, ellipsis: true });
  y = Math.max(doc.y, y + 30) + 8;
  doc.image(symbol, margin, y, { fit: [144, 144] });
  y += 156;
  for (const [name, value] of label.lines) {
    doc.font('body').fontSize(11).text(name, margin, y, { width: 92, lineBreak: false });
    doc
      .font('bold')
      .fontSize(14)
      .text(value, margin + 96, y - 2, { width: inner - 96, height: 36, ellipsis: true });
    y = Math.max(doc.y, y + 18) + 6;
  }
  doc
    .font('body')
    .fontSize(8)
    .text(siteName, margin, 432 - margin - 10, { width: inner, lineBreak: false });
}

/** 57 × 32 mm, landscape: the code on the left, the name and lines on the right in 6–8 pt. */
function drawSmall(doc: Doc, label: Label, symbol: Buffer, width: number, height: number) {
  const margin = 5;
  let top = margin;
  if (label.status) {
    statusBand(doc, label.status, 0, 0, width, 17, 9);
    top = 20;
  }
  const side = Math.min(height - top - margin, 66);
  doc.image(symbol, margin - 2, top + (height - top - margin - side) / 2, { fit: [side, side] });
  const x = margin + side + 2;
  const textWidth = width - x - margin;
  doc.font('bold').fontSize(8).fillColor('#000000').text(label.code, x, top, { width: textWidth, height: 20, ellipsis: true });
  let y = doc.y + 1;
  // At most five lines (a status label four) fit under a name of two lines.
  for (const [name, value] of label.lines) {
    doc
      .font('body')
      .fontSize(5)
      .text(name, x, y + 0.6, { width: 32, lineBreak: false });
    doc
      .font('bold')
      .fontSize(6)
      .text(value, x + 32, y, { width: textWidth - 32, height: 7, ellipsis: true, lineBreak: false });
    y += 8;
  }
}
