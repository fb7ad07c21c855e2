// A few months of deliveries before the demo's current orders, so the supplier-performance pages
// have something to chart: each lot ordered on its own PO line with a due date, received on a past
// day, its sample read on the direct-reading meter and decided, through the real operations.
// Quillmere's quarter-wave plates are steady; Saltern's multi-order plates run a little long and
// often late; Corvane, a second source of the 1064 nm quarter-wave plates, has a marking jig that drifts, so the mean fast-axis error walks away from zero over the
// months until its last lots fail. The drift check runs after each lot, as the scheduled job would
// have between deliveries, and raises its alarm while the lots still pass.
import { Instrument, Part, PurchaseOrderLine, Supplier, User } from '../models';
import { DIRECT_HEADER, directRow, gaussian } from '../../shared/optics/synthetic';
import type { DispositionInput } from '../../shared/inspection/lotVerdict';
import { actorFromUser, type AuditActor } from '../../server/audit/record';
import { signDisposition } from '../../server/inspection/disposition';
import { evaluateLot } from '../../server/inspection/evaluation';
import { lotForInspection } from '../../server/inspection/lotAccess';
import { commitMeasurements } from '../../server/inspection/measurements';
import { createPurchaseOrder } from '../../server/purchasing/purchaseOrders';
import { createSupplier } from '../../server/purchasing/suppliers';
import { receiveShipment } from '../../server/receiving/receipts';
import { checkDriftSinceLastRun } from '../../server/supplierperformance/drift';
import { seededUniform } from './benchFiles';

const DAY_MS = 86_400_000;
const isoDay = (time: number) => new Date(time).toISOString().slice(0, 10);

export type HistoryPeople = { buyer: User; clerk: User; inspector: User; quality: User; password: string };

/** One piece's errors: retardance (waves) and fast axis (degrees, the mark at 0°). */
export type PieceErrors = { retardanceWaves: number; axisDeg: number };

export type HistoryLot = {
  supplierId: number;
  partId: number;
  poNumber: string;
  orderedOn: string;
  /** The line's due date; none agreed when absent. */
  dueOn?: string;
  receivedAt: string;
  quantity: number;
  serialPrefix: string;
  supplierLot: string;
  /** The errors of the n-th measured piece. */
  errors: (index: number) => PieceErrors;
  /** Pieces read on the bench: the lot's sample (default) or the first n of it. */
  measure?: number;
  /** The signed decision: by the verdict (accept, else reject), a sort, a rejection later superseded by the verdict's, or none yet. */
  decision?: 'verdict' | 'sort' | 'reject-then-verdict' | 'none';
};

const pad = (n: number) => String(n).padStart(4, '0');

export type MeterReading = { serial: string; wavelengthNm: number; retardanceWaves: number; fastAxisDeg: number };

/** The file the direct-reading meter RM-3 exports for these plates, in its own conventions (its
 * register entry's angle direction and handedness: with the other handedness it reports the slow axis). */
export async function meterFile(readings: MeterReading[]) {
  const meter = await Instrument.findOne({ where: { code: 'RM-3' }, rejectOnEmpty: true });
  const rows = readings.map((r) => directRow({ ...r, fastAxisDeg: (r.fastAxisDeg - (meter.s3Sign === -1 ? 90 : 0)) * meter.angleSign }, 'waves'));
  return Buffer.from(
    ['# Invented readings (Phaselot demo data)', '# instrument: RM-3', '# operator: QC-07', `# date: ${isoDay(Date.now())}`, DIRECT_HEADER, ...rows, ''].join(
      '\n',
    ),
  );
}

/** The meter's file of pieces of a lot's part (zero-order or multi-order) at its design wavelength. */
function lotMeterFile(lot: Awaited<ReturnType<typeof lotForInspection>>, serials: string[], errors: HistoryLot['errors']) {
  const whole = lot.spec.construction === 'multi-order' ? (lot.spec.multiOrder ?? 0) : 0;
  return meterFile(
    serials.map((serial, i) => {
      const e = errors(i);
      return { serial, wavelengthNm: lot.spec.designWavelengthNm, retardanceWaves: whole + lot.spec.nominalWaves + e.retardanceWaves, fastAxisDeg: e.axisDeg };
    }),
  );
}

/** Orders, receives, measures and decides one lot; answers its id. */
export async function recordHistoryLot(people: HistoryPeople, spec: HistoryLot) {
  const buyer = actorFromUser(people.buyer);
  const order = await createPurchaseOrder(buyer, {
    number: spec.poNumber,
    supplierId: spec.supplierId,
    orderedOn: spec.orderedOn,
    currency: 'EUR',
    lines: [{ partId: spec.partId, quantity: spec.quantity, unitPrice: 80, inspectionLevel: 'II', aql: 1, dueOn: spec.dueOn }],
  });
  const line = await PurchaseOrderLine.findOne({ where: { purchaseOrderId: order.id }, rejectOnEmpty: true });
  const { lot: received } = await receiveShipment(
    actorFromUser(people.clerk),
    {
      poLineId: line.id,
      packingSlipNumber: `PS-${spec.supplierLot}`,
      carrier: 'Larchway Freight',
      supplierLot: spec.supplierLot,
      quantity: spec.quantity,
      serials: `${spec.serialPrefix}${pad(1)}..${spec.serialPrefix}${pad(spec.quantity)}`,
      overReceiptReason: '',
      receivedAt: spec.receivedAt,
    },
    {},
  );
  const lot = await lotForInspection(received.id);
  const sample = (await evaluateLot(lot)).samplePieces.map((p) => p.serial);
  const measured = sample.slice(0, spec.measure ?? sample.length);
  const bench: AuditActor & { id: number } = { ...actorFromUser(people.inspector), id: people.inspector.id };
  await commitMeasurements(bench, lot.id, [{ originalname: `meter-${spec.supplierLot}.csv`, buffer: await lotMeterFile(lot, measured, spec.errors) }]);
  const decision = spec.decision ?? 'verdict';
  if (decision === 'none') return lot.id;
  const sign = async (input: Pick<DispositionInput, 'decision' | 'justification'>, expectedDispositionId: number | null) =>
    (await signDisposition(people.quality, lot.id, { ...input, password: people.password, meaningAcknowledged: true, expectedDispositionId })).disposition.id;
  const { proposal, explanation } = (await evaluateLot(await lotForInspection(lot.id))).verdict;
  if (proposal === 'undecided') throw new Error(`lot ${lot.id} of the history cannot be decided: ${explanation}`);
  const byVerdict = {
    decision: proposal === 'accept' ? 'accept' : 'reject',
    justification: proposal === 'accept' ? undefined : 'Sample out of tolerance.',
  } as const;
  if (decision === 'sort') await sign({ decision: 'sort', justification: 'Needed for the build: sorted at our bench.' }, null);
  else if (decision === 'reject-then-verdict') await sign(byVerdict, await sign({ decision: 'reject', justification: 'Held for a packaging check.' }, null));
  else await sign(byVerdict, null);
  return lot.id;
}

type History = {
  supplier: string;
  part: string;
  prefix: string;
  lotPrefix: string;
  lots: number;
  /** Days before today of the first receipt, and between receipts. */
  firstDaysAgo: number;
  everyDays: number;
  quantity: number;
  /** Days from order to due date, and from due date to the receipt of the i-th lot. */
  leadDays: number;
  lateness: (i: number) => number;
  /** Mean errors of lot i (in tolerances of the part) and the spread of pieces around them. */
  level: (i: number) => PieceErrors;
  spread: PieceErrors;
  undecidedLast?: boolean;
};

/** A second source of the 1064 nm quarter-wave plates, with only the deliveries of this history. */
const CORVANE = {
  name: 'Corvane Polarisation Works',
  contactEmail: 'orders@corvane-polarisation.example',
  notes: 'Second source for the 1064 nm quarter-wave plates; marks the fast axis with an engraving jig.',
};

const HISTORIES: History[] = [
  {
    supplier: 'Quillmere Crystal Foundry',
    part: 'VW-QWP-633',
    prefix: 'QH-',
    lotPrefix: 'QCF-26',
    lots: 8,
    firstDaysAgo: 200,
    everyDays: 22,
    quantity: 40,
    leadDays: 24,
    lateness: (i) => (i === 4 ? 3 : -2),
    level: (i) => ({ retardanceWaves: 0.1 * Math.cos(1.3 * i), axisDeg: 0.12 * Math.sin(1.9 * i) }),
    spread: { retardanceWaves: 0.18, axisDeg: 0.16 },
  },
  {
    supplier: 'Saltern Birefringents',
    part: 'VW-MOQ-633-12',
    prefix: 'SH-',
    lotPrefix: 'SB-69',
    lots: 6,
    firstDaysAgo: 190,
    everyDays: 28,
    quantity: 30,
    leadDays: 20,
    lateness: (i) => [4, -1, 9, 2, -3, 6][i],
    level: (i) => ({ retardanceWaves: 0.12 + 0.1 * Math.sin(2.3 * i), axisDeg: -0.05 + 0.08 * Math.cos(1.7 * i) }),
    spread: { retardanceWaves: 0.2, axisDeg: 0.18 },
  },
  {
    // The marking jig drifts: the mean axis error walks up lot by lot until pieces pass the tolerance.
    supplier: CORVANE.name,
    part: 'VW-QWP-1064',
    prefix: 'CH-',
    lotPrefix: 'CPW-4',
    lots: 11,
    firstDaysAgo: 150,
    everyDays: 13,
    quantity: 40,
    leadDays: 18,
    lateness: (i) => (i % 3 === 0 ? 1 : -1),
    level: (i) => ({ retardanceWaves: 0.02, axisDeg: [0.02, -0.03, 0.01, -0.02, 0.1, 0.18, 0.28, 0.4, 0.55, 0.9, 1.05][i] }),
    spread: { retardanceWaves: 0.16, axisDeg: 0.1 },
    undecidedLast: true,
  },
];

/** Seeds the histories against the demo's suppliers and parts. */
export async function seedPerformanceHistory(password: string) {
  const find = (role: string) => User.findOne({ where: { email: `${role}@phaselot.test` }, rejectOnEmpty: true });
  const people: HistoryPeople = {
    buyer: await find('buyer'),
    clerk: await find('clerk'),
    inspector: await find('inspector'),
    quality: await find('quality'),
    password,
  };
  await createSupplier(actorFromUser(people.buyer), CORVANE);
  let poNumber = 61;
  for (const [h, history] of HISTORIES.entries()) {
    const supplier = await Supplier.findOne({ where: { name: history.supplier }, rejectOnEmpty: true });
    const part = await Part.findOne({ where: { number: history.part }, rejectOnEmpty: true });
    const tolerance = { retardanceWaves: part.spec.retardanceTolWaves, axisDeg: part.spec.axisTolDeg };
    const normal = gaussian(seededUniform(4870 + h));
    for (let i = 0; i < history.lots; i++) {
      const received = Date.now() - (history.firstDaysAgo - i * history.everyDays) * DAY_MS;
      const due = received - history.lateness(i) * DAY_MS;
      const level = history.level(i);
      const errors = () => ({
        retardanceWaves: (level.retardanceWaves + history.spread.retardanceWaves * normal()) * tolerance.retardanceWaves,
        axisDeg: (level.axisDeg + history.spread.axisDeg * normal()) * tolerance.axisDeg,
      });
      await recordHistoryLot(people, {
        supplierId: supplier.id,
        partId: part.id,
        poNumber: `VW-PO-26-${pad(poNumber++)}`,
        orderedOn: isoDay(due - history.leadDays * DAY_MS),
        dueOn: isoDay(due),
        receivedAt: new Date(Math.floor(received / DAY_MS) * DAY_MS + 9.5 * 3_600_000).toISOString(),
        quantity: history.quantity,
        serialPrefix: `${history.prefix}${String(i + 1).padStart(2, '0')}-`,
        supplierLot: `${history.lotPrefix}${String(i + 11).padStart(2, '0')}`,
        errors,
        decision: history.undecidedLast && i === history.lots - 1 ? 'none' : 'verdict',
      });
      await checkDriftSinceLastRun();
    }
  }
}
