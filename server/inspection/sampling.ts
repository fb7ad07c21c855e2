// The lot's sampling plan: ISO 2859-1 single sampling at the PO line's inspection level and AQL, at
// the severity its supplier and part are on when the lot is received, and a random sample whose
// seed is stored so the same sample can be drawn again. The plan is drawn in the receiving
// transaction and fixed from then on (a lot keeps the severity it was sampled under), so reading a
// lot never writes. While acceptance is discontinued a received lot waits without a plan; resuming
// inspection draws it.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { LotInspection, SamplePiece } from '../../db/models';
import { describeSamplingPlan, drawSample, initialSwitchingState, newSampleSeed, planFor, type SwitchingState } from '../../shared/sampling';
import { lotName } from '../../shared/schemas/stock';
import { AppError } from '../http/errors';
import { lotForInspection, type LotForInspection } from './lotAccess';

type StateLock = 'share' | 'update';

/** The switching state of a supplier and part; `lock` holds its row to the end of the transaction
 * (a missing row is created first, so that there is one to hold). */
export async function switchingStateOf(supplierId: number, partId: number, transaction?: Transaction, lock?: StateLock): Promise<SwitchingState> {
  const replacements = { supplierId, partId, initial: JSON.stringify(initialSwitchingState()) };
  if (lock) {
    await sequelize.query('INSERT INTO switching_states (supplier_id, part_id, state) VALUES (:supplierId, :partId, :initial::jsonb) ON CONFLICT DO NOTHING', {
      transaction,
      replacements,
    });
  }
  const [row] = await sequelize.query<{ state: SwitchingState }>(
    `SELECT state FROM switching_states WHERE supplier_id = :supplierId AND part_id = :partId${lock ? ` FOR ${lock.toUpperCase()}` : ''}`,
    { type: QueryTypes.SELECT, transaction, replacements },
  );
  return row?.state ?? initialSwitchingState();
}

export function describePlan(plan: LotInspection) {
  return describeSamplingPlan({
    severity: plan.severity,
    level: plan.inspectionLevel,
    aql: plan.aql,
    codeLetter: plan.codeLetter,
    planLetter: plan.planLetter,
    sampleSize: plan.sampleSize,
    accept: plan.acceptNumber,
    reject: plan.rejectNumber,
    hundredPercent: plan.hundredPercent,
  });
}

/** The lot's plan as drawn, or null while the lot waits for inspection to resume. Never writes. */
export function inspectionPlanOf(lotId: number, transaction?: Transaction) {
  return LotInspection.findOne({ where: { lotId }, transaction });
}

export function discontinuedError(lot: Pick<LotForInspection, 'id' | 'supplier' | 'part'>) {
  return new AppError(
    409,
    'acceptance_discontinued',
    `Lot ${lotName(lot.id)} waits without a sampling plan: acceptance inspection of ${lot.part.number} from ${lot.supplier.name} is discontinued until a quality manager resumes it`,
    { lotId: lot.id, supplierId: lot.supplier.id, partId: lot.part.id },
  );
}

/** Draws the lot's plan and sample at the given state's severity; the caller holds the state. */
async function drawPlan(lot: LotForInspection, state: SwitchingState, transaction: Transaction) {
  const plan = planFor({ lotSize: lot.quantity, level: lot.inspectionLevel, aql: lot.aql, severity: state.severity });
  const hundredPercent = lot.hundredPercent || plan.hundredPercent;
  const sampleSize = hundredPercent ? lot.pieces.length : plan.sampleSize;
  const seed = newSampleSeed();
  const inspection = await LotInspection.create(
    {
      lotId: lot.id,
      severity: state.severity,
      inspectionLevel: lot.inspectionLevel,
      aql: lot.aql,
      codeLetter: plan.codeLetter,
      planLetter: plan.planLetter,
      sampleSize,
      // 100 % inspection keeps the plan's Ac/Re: the lot is judged on every piece instead of a sample.
      acceptNumber: plan.accept,
      rejectNumber: plan.reject,
      hundredPercent,
      sampleSeed: seed,
    },
    { transaction },
  );
  const chosen = new Set(
    hundredPercent
      ? lot.pieces.map((p) => p.serial)
      : drawSample(
          lot.pieces.map((p) => p.serial),
          sampleSize,
          seed,
        ),
  );
  await SamplePiece.bulkCreate(
    lot.pieces.filter((p) => chosen.has(p.serial)).map((p) => ({ inspectionId: inspection.id, pieceId: p.id })),
    { transaction },
  );
  return inspection;
}

/** At receipt, in the receiving transaction: the plan at the severity in effect, or none (null)
 * while acceptance is discontinued. The state is held shared, so a resumption that runs meanwhile
 * either sees this lot waiting or has already lifted the discontinuation. */
export async function drawPlanAtReceipt(lotId: number, transaction: Transaction) {
  const lot = await lotForInspection(lotId, transaction);
  const state = await switchingStateOf(lot.supplier.id, lot.part.id, transaction, 'share');
  return state.stopped ? null : drawPlan(lot, state, transaction);
}

/** Lots of a supplier and part received while acceptance was discontinued, oldest first. */
export async function lotsWaitingForPlans(supplierId: number, partId: number, transaction?: Transaction) {
  return sequelize.query<{ id: number; supplierLot: string; quantity: number; receivedAt: Date }>(
    `SELECT l.id, l.supplier_lot AS "supplierLot", l.quantity, s.received_at AS "receivedAt"
       FROM lots l JOIN shipments s ON s.id = l.shipment_id JOIN purchase_orders po ON po.id = s.purchase_order_id
      WHERE po.supplier_id = :supplierId AND l.part_id = :partId AND l.state = 'quarantine'
        AND NOT EXISTS (SELECT 1 FROM lot_inspections li WHERE li.lot_id = l.id)
      ORDER BY s.received_at, l.id`,
    { type: QueryTypes.SELECT, transaction, replacements: { supplierId, partId } },
  );
}

/** Once acceptance is no longer discontinued, the waiting lots get their plans at the state's
 * severity (tightened after a resumption). The caller holds the state for update. */
export async function drawWaitingPlans(supplierId: number, partId: number, state: SwitchingState, transaction: Transaction) {
  if (state.stopped) return [];
  const drawn: LotInspection[] = [];
  for (const waiting of await lotsWaitingForPlans(supplierId, partId, transaction)) {
    drawn.push(await drawPlan(await lotForInspection(waiting.id, transaction), state, transaction));
  }
  return drawn;
}
