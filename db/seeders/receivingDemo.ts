// Purchasing, receiving and stock of the demo: invented suppliers of Veltrane Optics Works, its wave
// plates, purchase orders (open and closed) and shipments received through the real operations, with
// invented packing slips and certificates attached. The oldest lots are then inspected by the
// inspection seed; `seedStockDemo` afterwards spreads accepted pieces over the bins and issues some.
import PDFDocument from 'pdfkit';
import { Location, Lot, PurchaseOrderLine, type User } from '../models';
import type { Role } from '../../shared/schemas/roles';
import type { PartInput, PoLineInput } from '../../shared/schemas/purchasing';
import type { PartSpecInput } from '../../shared/schemas/spec';
import { actorFromUser } from '../../server/audit/record';
import { createPart } from '../../server/purchasing/parts';
import { createPurchaseOrder, updatePurchaseOrder } from '../../server/purchasing/purchaseOrders';
import { receiveShipment } from '../../server/receiving/receipts';
import { issueToWorkOrder, transferBetweenBins } from '../../server/stock/moves';
import { createSupplier } from '../../server/purchasing/suppliers';

const LOCATIONS = [
  { code: 'QUARANTINE', name: 'Quarantine shelf at the receiving dock', kind: 'quarantine' },
  { code: 'INSP-HOLD', name: 'Hold rack beside the inspection bench', kind: 'inspection-hold' },
  { code: 'MRB', name: 'Material review cabinet', kind: 'material-review' },
  { code: 'RTV', name: 'Return-to-vendor cage', kind: 'return-to-vendor' },
  { code: 'BIN-A1', name: 'Optics stores, aisle A, bin 1', kind: 'stock' },
  { code: 'BIN-A2', name: 'Optics stores, aisle A, bin 2', kind: 'stock' },
  { code: 'BIN-B1', name: 'Optics stores, aisle B, bin 1 (large apertures)', kind: 'stock' },
] as const;

const SUPPLIERS = [
  {
    key: 'quillmere',
    name: 'Quillmere Crystal Foundry',
    contactEmail: 'orders@quillmere-crystal.example',
    notes: 'Grows and polishes its own quartz; zero-order plates cemented in-house.',
  },
  { key: 'saltern', name: 'Saltern Birefringents', contactEmail: 'sales@saltern-biref.example', notes: 'Multi-order and large-aperture quartz.' },
  {
    key: 'orrisdale',
    name: 'Orrisdale Thin Films',
    contactEmail: 'po-desk@orrisdale-films.example',
    notes: 'Stretched polymer retarders, laminated between glass.',
  },
  {
    key: 'veylune',
    name: 'Vey & Lune Retarder Works',
    contactEmail: 'dispatch@veylune.example',
    notes: 'New supplier since 2026; first lots on 100 % inspection.',
  },
] as const;
type SupplierKey = (typeof SUPPLIERS)[number]['key'];

const zeroOrderQuartz = { construction: 'zero-order', material: 'quartz' } as const;
const PARTS: (PartInput & { key: string; spec: PartSpecInput })[] = [
  {
    key: 'qwp633',
    number: 'VW-QWP-633',
    description: 'Quarter-wave plate, 632.8 nm, Ø12.7 mm, cemented zero-order',
    spec: {
      ...zeroOrderQuartz,
      nominalWaves: 0.25,
      designWavelengthNm: 632.8,
      retardanceTolWaves: 0.003,
      axisTolDeg: 0.5,
      clearApertureMm: 10,
      diameterMm: 12.7,
      decisionRule: 'simple',
    },
  },
  {
    key: 'hwp1064',
    number: 'VW-HWP-1064',
    description: 'Half-wave plate, 1064 nm, Ø25.4 mm, for the laser head',
    spec: {
      ...zeroOrderQuartz,
      nominalWaves: 0.5,
      designWavelengthNm: 1064,
      retardanceTolWaves: 0.004,
      axisTolDeg: 0.3,
      clearApertureMm: 20,
      diameterMm: 25.4,
      maxDiattenuation: 0.01,
      decisionRule: 'guarded',
    },
  },
  {
    key: 'hwp532',
    number: 'VW-HWP-532',
    description: 'Half-wave plate, 532 nm, Ø10 mm, MgF₂',
    spec: {
      construction: 'zero-order',
      material: 'mgf2',
      nominalWaves: 0.5,
      designWavelengthNm: 532,
      retardanceTolWaves: 0.003,
      axisTolDeg: 0.5,
      clearApertureMm: 8,
      diameterMm: 10,
      decisionRule: 'simple',
    },
  },
  {
    key: 'qwp1064',
    number: 'VW-QWP-1064',
    description: 'Quarter-wave plate, 1064 nm, Ø12.7 mm',
    spec: {
      ...zeroOrderQuartz,
      nominalWaves: 0.25,
      designWavelengthNm: 1064,
      retardanceTolWaves: 0.003,
      axisTolDeg: 0.5,
      clearApertureMm: 10,
      diameterMm: 12.7,
      decisionRule: 'guarded',
    },
  },
  {
    key: 'moq633',
    number: 'VW-MOQ-633-12',
    description: 'Multi-order quarter-wave, 632.8 nm, order 12, single quartz plate',
    spec: {
      construction: 'multi-order',
      multiOrder: 12,
      material: 'quartz',
      nominalWaves: 0.25,
      designWavelengthNm: 632.8,
      retardanceTolWaves: 0.005,
      axisTolDeg: 1,
      clearApertureMm: 10,
      diameterMm: 12.7,
      decisionRule: 'simple',
    },
  },
  {
    key: 'ach700',
    number: 'VW-ACH-QWP-700',
    description: 'Achromatic quarter-wave, 450–950 nm, polymer laminate, Ø20 mm',
    spec: {
      construction: 'achromatic',
      bandNm: [450, 950],
      material: 'polymer',
      nominalWaves: 0.25,
      designWavelengthNm: 700,
      retardanceTolWaves: 0.01,
      axisTolDeg: 1,
      clearApertureMm: 15,
      diameterMm: 20,
      maxDepolarization: 0.02,
      decisionRule: 'simple',
    },
  },
];
type PartKey = (typeof PARTS)[number]['key'];

// Lines still owed carry a due date counted from the day the seed runs (days after it; negative: late),
// so the clerk's dashboard always has lines due and late, whenever the demo is seeded.
type Line = {
  part: PartKey;
  quantity: number;
  unitPrice: number;
  inspectionLevel?: PoLineInput['inspectionLevel'];
  aql: number;
  hundredPercent?: boolean;
  dueInDays?: number;
};
type Receipt = { line: number; at: string; quantity: number; first: number; prefix: string; supplierLot: string; carrier: string; overReceiptReason?: string };
type Order = { number: string; supplier: SupplierKey; orderedOn: string; lines: Line[]; receipts: Receipt[]; closeAfterwards?: boolean; notes?: string };

// Received oldest first; the inspection seed takes the four oldest lots (accept, reject, measured, partly measured).
const ORDERS: Order[] = [
  {
    number: 'VW-PO-26-0141',
    supplier: 'quillmere',
    orderedOn: '2026-10-06',
    closeAfterwards: true,
    notes: 'Blanket order for the 2026 Q4 interferometer build.',
    lines: [{ part: 'qwp633', quantity: 120, unitPrice: 86.5, aql: 1 }],
    receipts: [{ line: 1, at: '2026-10-20T09:40:00Z', quantity: 120, first: 1, prefix: 'QW-', supplierLot: 'QCF-2610-A', carrier: 'Larchway Freight' }],
  },
  {
    number: 'VW-PO-26-0152',
    supplier: 'saltern',
    orderedOn: '2026-10-14',
    lines: [
      { part: 'hwp1064', quantity: 80, unitPrice: 212, aql: 0.65 },
      { part: 'moq633', quantity: 40, unitPrice: 48, inspectionLevel: 'S-4', aql: 2.5 },
    ],
    receipts: [
      { line: 1, at: '2026-10-29T14:05:00Z', quantity: 80, first: 1, prefix: 'HW1-', supplierLot: 'SB-7731', carrier: 'Larchway Freight' },
      { line: 2, at: '2026-11-12T10:20:00Z', quantity: 40, first: 1, prefix: 'MQ-', supplierLot: 'SB-7790', carrier: 'Pellow Couriers' },
    ],
  },
  {
    number: 'VW-PO-26-0167',
    supplier: 'quillmere',
    orderedOn: '2026-10-28',
    lines: [
      { part: 'hwp532', quantity: 60, unitPrice: 138, aql: 1 },
      { part: 'qwp633', quantity: 100, unitPrice: 84, aql: 1, dueInDays: -2 },
    ],
    receipts: [
      { line: 1, at: '2026-11-09T08:55:00Z', quantity: 60, first: 1, prefix: 'HG-', supplierLot: 'QCF-2611-C', carrier: 'Pellow Couriers' },
      { line: 2, at: '2026-11-23T11:30:00Z', quantity: 50, first: 121, prefix: 'QW-', supplierLot: 'QCF-2611-D', carrier: 'Larchway Freight' },
    ],
  },
  {
    number: 'VW-PO-26-0173',
    supplier: 'orrisdale',
    orderedOn: '2026-11-03',
    lines: [{ part: 'ach700', quantity: 120, unitPrice: 64, aql: 1.5 }],
    receipts: [{ line: 1, at: '2026-11-26T15:10:00Z', quantity: 120, first: 1, prefix: 'AQ-', supplierLot: 'OTF-26-118', carrier: 'Brindle Air Parcel' }],
  },
  {
    number: 'VW-PO-26-0180',
    supplier: 'veylune',
    orderedOn: '2026-11-10',
    notes: 'First order with Vey & Lune: every plate is measured.',
    lines: [
      { part: 'qwp1064', quantity: 300, unitPrice: 72, aql: 0.65, hundredPercent: true },
      { part: 'hwp1064', quantity: 50, unitPrice: 205, aql: 0.65, hundredPercent: true, dueInDays: 5 },
    ],
    receipts: [{ line: 1, at: '2026-11-30T13:45:00Z', quantity: 300, first: 1, prefix: 'Q1-', supplierLot: 'VL-0042', carrier: 'Brindle Air Parcel' }],
  },
  {
    number: 'VW-PO-26-0188',
    supplier: 'orrisdale',
    orderedOn: '2026-11-20',
    lines: [{ part: 'ach700', quantity: 40, unitPrice: 66, aql: 1.5, dueInDays: 11 }],
    receipts: [],
  },
];

/** An invented supplier's document (packing slip or certificate of conformance) as a small PDF. It
 * stands for the supplier's own paperwork, so PDF's standard fonts do (and keep the seed fast). */
export function demoDocument(title: string, lines: string[]): Promise<Buffer> {
  const doc = new PDFDocument({ size: 'A5', margin: 40, info: { Title: title, Creator: 'Phaselot demo data' } });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolveDone) => doc.on('end', () => resolveDone(Buffer.concat(chunks))));
  doc.font('Helvetica-Bold').fontSize(14).text(title).moveDown(0.6);
  doc.font('Helvetica').fontSize(9);
  for (const line of lines) doc.text(line);
  doc.moveDown().fontSize(7).fillColor('#777').text('Invented document of the Phaselot demonstration. No real company or product.');
  doc.end();
  return done;
}

export const pdfFile = (name: string, buffer: Buffer) => ({ originalname: name, buffer, size: buffer.length });

export async function seedReceivingDemo(users: Record<Role, User>) {
  const locations = await Location.bulkCreate(LOCATIONS.map((l) => ({ ...l })));
  const buyer = actorFromUser(users.buyer);
  const clerk = actorFromUser(users.clerk);

  const suppliers: Record<string, Awaited<ReturnType<typeof createSupplier>>> = {};
  for (const { key, ...input } of SUPPLIERS) suppliers[key] = await createSupplier(buyer, input);
  const parts: Record<string, Awaited<ReturnType<typeof createPart>>> = {};
  for (const { key, ...input } of PARTS) parts[key] = await createPart(buyer, input);

  const purchaseOrders = [];
  const lots = [];
  for (const order of ORDERS) {
    const input = {
      number: order.number,
      supplierId: suppliers[order.supplier].id,
      orderedOn: order.orderedOn,
      currency: 'EUR',
      notes: order.notes ?? '',
      lines: order.lines.map((line) => ({
        partId: parts[line.part].id,
        quantity: line.quantity,
        unitPrice: line.unitPrice,
        inspectionLevel: line.inspectionLevel ?? 'II',
        aql: line.aql,
        hundredPercent: line.hundredPercent ?? false,
        dueOn: line.dueInDays === undefined ? undefined : new Date(Date.now() + line.dueInDays * 86_400_000).toISOString().slice(0, 10),
      })),
    };
    const created = await createPurchaseOrder(buyer, input);
    const lines = await PurchaseOrderLine.findAll({ where: { purchaseOrderId: created.id }, order: [['lineNumber', 'ASC']] });
    for (const receipt of order.receipts) {
      const line = lines.find((l) => l.lineNumber === receipt.line)!;
      const last = receipt.first + receipt.quantity - 1;
      const pad = (n: number) => String(n).padStart(4, '0');
      const slip = `PS-${receipt.supplierLot}`;
      const packingSlip = await demoDocument(`Packing slip ${slip}`, [
        `From: ${SUPPLIERS.find((s) => s.key === order.supplier)!.name}`,
        'To: Veltrane Optics Works, goods in',
        `Your order: ${order.number}, line ${receipt.line}`,
        `Lot ${receipt.supplierLot}: ${receipt.quantity} pieces, serials ${receipt.prefix}${pad(receipt.first)} to ${receipt.prefix}${pad(last)}`,
        `Carrier: ${receipt.carrier}`,
      ]);
      const certificate = await demoDocument(`Certificate of conformance, lot ${receipt.supplierLot}`, [
        `We certify that the ${receipt.quantity} retarders of lot ${receipt.supplierLot} were made and tested to the specification of order ${order.number}.`,
        `Part: ${PARTS.find((p) => p.key === order.lines[receipt.line - 1].part)!.number}`,
      ]);
      const { lot } = await receiveShipment(
        clerk,
        {
          poLineId: line.id,
          packingSlipNumber: slip,
          carrier: receipt.carrier,
          supplierLot: receipt.supplierLot,
          quantity: receipt.quantity,
          serials: `${receipt.prefix}${pad(receipt.first)}..${receipt.prefix}${pad(last)}`,
          overReceiptReason: receipt.overReceiptReason ?? '',
          receivedAt: receipt.at,
        },
        { packingSlip: [pdfFile(`${slip}.pdf`, packingSlip)], certificate: [pdfFile(`CoC-${receipt.supplierLot}.pdf`, certificate)] },
      );
      lots.push(lot);
    }
    if (order.closeAfterwards)
      await updatePurchaseOrder(buyer, created.id, { ...input, status: 'closed', lines: input.lines.map((l, i) => ({ ...l, id: lines[i].id })) });
    purchaseOrders.push(created);
  }
  return { locations, suppliers: Object.values(suppliers), parts: Object.values(parts), purchaseOrders, lots };
}

/** After inspection: accepted pieces are spread over the bins and some issued to a work order. */
export async function seedStockDemo(users: Record<Role, User>, lots: Lot[]) {
  const clerk = actorFromUser(users.clerk);
  const binA2 = await Location.findOne({ where: { code: 'BIN-A2' } });
  const accepted = await Lot.findAll({ where: { id: lots.map((l) => l.id), state: 'accepted' }, include: [{ association: 'pieces' }], order: [['id', 'ASC']] });
  for (const [index, lot] of accepted.entries()) {
    const serials = (lot.pieces ?? [])
      .filter((p) => p.state === 'in-stock')
      .map((p) => p.serial)
      .sort();
    if (binA2 && serials.length >= 30)
      await transferBetweenBins(clerk, { partId: lot.partId, toLocationId: binA2.id, serials: serials.slice(0, 20).join('\n') });
    if (serials.length >= 40)
      await issueToWorkOrder(clerk, { partId: lot.partId, workOrder: `WO-26-${3318 + index}`, serials: serials.slice(20, 32).join('\n') });
  }
}
