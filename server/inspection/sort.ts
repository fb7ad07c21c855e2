// The 100 % sort a 'sort' decision orders. The lot stays open for measurement ('sorting') until every
// piece still on site has a verdict; the commit that completes it then sends each piece by its own
// verdict (conforming to stock under the sort decision, nonconforming to return-to-vendor), marks the
// lot 'sorted' and issues the certificate of the released serials, all in that commit's transaction.
import { Op, type Transaction } from 'sequelize';
import { DispositionRecord, User } from '../../db/models';
import { lotName } from '../../shared/schemas/stock';
import { recordAudit, type AuditActor } from '../audit/record';
import { openLotNcr } from '../nonconformance/lotNcr';
import { issueLotDocuments } from './documents';
import type { LotEvaluation } from './evaluation';
import { routeLotPieces, routingOutcome, type LotForInspection } from './lotAccess';

/** Pieces of a sorting lot that still need a verdict (issued ones are gone and cannot be measured). */
export function piecesLeftToSort(lot: LotForInspection, evaluation: Pick<LotEvaluation, 'pieceVerdicts'>) {
  return lot.pieces.filter((p) => {
    const verdict = evaluation.pieceVerdicts.get(p.id);
    return p.state !== 'issued' && verdict !== 'pass' && verdict !== 'fail';
  });
}

/** Completes the lot's sort when nothing is left to measure; null while pieces remain. */
export async function completeSortWhenMeasured(lot: LotForInspection, evaluation: LotEvaluation, actor: AuditActor, transaction: Transaction) {
  if (piecesLeftToSort(lot, evaluation).length > 0) return null;
  const disposition = await DispositionRecord.findOne({ where: { lotId: lot.id, decision: 'sort', supersededAt: { [Op.is]: null } }, transaction });
  if (!disposition) throw new Error(`Lot ${lotName(lot.id)} is being sorted without a current sort decision`);
  const signer = (await User.findByPk(disposition.signerId, { transaction }))!;
  const routed = await routeLotPieces(lot, 'sorted', evaluation.pieceVerdicts, { dispositionId: disposition.id, deviationNumber: null }, actor, transaction);
  const explanation = (disposition.lotVerdict as { explanation?: string }).explanation ?? '';
  await openLotNcr(
    {
      lot,
      routing: 'sorted',
      dispositionId: disposition.id,
      signerId: disposition.signerId,
      explanation,
      setAside: routed['return-to-vendor'],
      supersededId: null,
    },
    actor,
    transaction,
  );
  const documents = await issueLotDocuments(
    { lot, evaluation, disposition, signer, released: routed.stock, outcome: routingOutcome('sorted', routed, evaluation.pieceVerdicts), issuedAt: new Date() },
    transaction,
  );
  await recordAudit(
    actor,
    {
      action: 'disposition.sort-completed',
      entityType: 'lot',
      entityId: lot.id,
      before: { state: 'sorting' },
      after: {
        state: 'sorted',
        dispositionId: disposition.id,
        released: routed.stock.length,
        returned: routed['return-to-vendor'].length,
        documents: documents.map((d) => d.number),
      },
    },
    transaction,
  );
  return { released: routed.stock.length, returned: routed['return-to-vendor'].length, documents: documents.map(({ pdf: _pdf, ...rest }) => rest) };
}
