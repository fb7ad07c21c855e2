// Returns to the vendor: pieces an NCR dispositioned for return leave the site on a shipment under
// the supplier's RMA number, for a credit or a replacement. The shipment, its pieces and their
// ledger moves out of stores are written in one transaction. A replacement is received like any
// shipment, naming the NCR it replaces pieces for.
import { QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { Nonconformance, NonconformancePiece, VendorReturn } from '../../db/models';
import { REMEDY_LABELS, returnInputSchema, type ReturnInput } from '../../shared/schemas/nonconformance';
import { recordAudit, type AuditActor } from '../audit/record';
import { badRequest, conflict } from '../http/errors';
import { movePieces } from '../stock/ledger';
import { lockOpenNcr, ncrPieceStates, piecesCovered } from './ncrs';

export function shipReturn(actor: AuditActor, rawInput: ReturnInput) {
  const input = returnInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const ncr = await lockOpenNcr(input.nonconformanceId, transaction);
    const all = await ncrPieceStates(ncr.id, transaction);
    const pieces = piecesCovered(
      all,
      input.pieceIds,
      (p) => p.decision === 'return-to-vendor' && !p.shipped && p.locationId !== null,
      'is dispositioned for return and not yet shipped',
    );
    const shipment = await VendorReturn.create(
      {
        nonconformanceId: ncr.id,
        rmaNumber: input.rmaNumber,
        shipDate: input.shipDate,
        carrier: input.carrier,
        tracking: input.tracking,
        remedy: input.remedy,
        creditAmount: input.remedy === 'credit' ? (input.creditAmount ?? null) : null,
        note: input.note,
        createdBy: actor.id!,
      },
      { transaction },
    );
    const pieceIds = pieces.map((p) => p.pieceId);
    await NonconformancePiece.update({ returnId: shipment.id }, { where: { nonconformanceId: ncr.id, pieceId: pieceIds }, transaction });
    await movePieces(
      {
        pieceIds,
        toLocationId: null,
        reason: 'ship-to-vendor',
        note: `${ncr.number}: RMA ${input.rmaNumber}, ${input.carrier}${input.tracking ? ` ${input.tracking}` : ''}, for ${REMEDY_LABELS[input.remedy].toLowerCase()}`,
      },
      actor,
      transaction,
    );
    await recordAudit(
      actor,
      {
        action: 'return.shipped',
        entityType: 'vendor-return',
        entityId: shipment.id,
        after: {
          ncr: ncr.number,
          rmaNumber: input.rmaNumber,
          shipDate: input.shipDate,
          carrier: input.carrier,
          remedy: input.remedy,
          creditAmount: shipment.creditAmount,
          serials: pieces.map((p) => p.serial),
        },
      },
      transaction,
    );
    return shipment;
  });
}

/** Pieces an NCR shipped back for a replacement that no replacement shipment has brought yet; `ncr`
 * is an SQL expression naming the NCR's id. */
export const replacementOwedSql = (ncr: string) =>
  `greatest(0, (SELECT count(*) FROM nonconformance_pieces np JOIN vendor_returns v ON v.id = np.return_id WHERE v.nonconformance_id = ${ncr} AND v.remedy = 'replacement')
     - (SELECT coalesce(sum(l.quantity), 0) FROM lots l JOIN shipments s ON s.id = l.shipment_id WHERE s.replacement_for_ncr_id = ${ncr}))::int`;

/** The NCR a replacement shipment is received against: it must be of the same supplier and part and
 * have pieces shipped back for a replacement. Answers how many of those are still owed, which the
 * shipment may bring beyond what the PO line still expects. */
export async function replacementOwed(ncrId: number, expected: { supplierId: number; partId: number }, transaction: Transaction) {
  const ncr = await Nonconformance.findByPk(ncrId, { transaction });
  if (!ncr) throw badRequest('The NCR named as replaced does not exist', [{ path: 'replacementForNcrId', message: 'Choose an NCR' }]);
  if (ncr.supplierId !== expected.supplierId || ncr.partId !== expected.partId) {
    throw badRequest(`${ncr.number} is for another supplier or part than this PO line`, [
      { path: 'replacementForNcrId', message: 'Choose an NCR of this supplier and part' },
    ]);
  }
  const [{ shipped, owed }] = await sequelize.query<{ shipped: boolean; owed: number }>(
    `SELECT EXISTS (SELECT 1 FROM vendor_returns v WHERE v.nonconformance_id = :ncrId AND v.remedy = 'replacement') AS shipped, ${replacementOwedSql(':ncrId')} AS owed`,
    { type: QueryTypes.SELECT, transaction, replacements: { ncrId } },
  );
  if (!shipped) throw conflict(`${ncr.number} has no pieces shipped back for a replacement`, { ncr: ncr.number });
  return { ncr, owed };
}
