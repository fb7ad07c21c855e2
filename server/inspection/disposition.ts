// Signing a lot disposition: the quality manager re-enters the password and confirms the meaning of
// the signature; the decision, its documents, the stock moves, the switching state and (for a
// rejection or a sort) the buyer's e-mail are written in one transaction. Each piece goes where the
// decision sends it by its own verdict (see lotAccess routeLotPieces). A signed decision is never
// edited: a new one supersedes it and revokes its documents.
import { Op } from 'sequelize';
import { inTransaction } from '../../db';
import { DispositionRecord, LotDocument, User } from '../../db/models';
import { SIGNATURE_MEANINGS, type DispositionInput } from '../../shared/inspection/lotVerdict';
import { lotName } from '../../shared/schemas/stock';
import { actorFromUser, recordAudit, type AuditActor } from '../audit/record';
import { verifySignature } from '../auth/signature';
import { AppError, conflict } from '../http/errors';
import { queueMail } from '../mail/outbox';
import { buyersOfLot, notify } from '../notifications/notify';
import { openLotNcr } from '../nonconformance/lotNcr';
import { recordDeviationUse, releaseDeviationUse, takeDeviation } from '../supplierquality/deviationUse';
import { issueLotDocuments } from './documents';
import { lotForInspection, routeLotPieces, routingOutcome } from './lotAccess';
import { evaluateLot } from './evaluation';
import { completeSortWhenMeasured } from './sort';
import { recordLotInSwitching } from './switching';
import { formatDateTime } from '../../shared/format';

export async function signDisposition(signer: User, lotId: number, input: DispositionInput, request: Pick<AuditActor, 'requestId' | 'address'> = {}) {
  const actor = { ...actorFromUser(signer), ...request };
  // The password is checked before anything is locked: a wrong one costs no one a wait.
  await verifySignature(signer, input.password, actor, undefined, { entityType: 'lot', entityId: lotId });
  return inTransaction(async (transaction) => {
    const lot = await lotForInspection(lotId, transaction, { lock: true });
    const current = await DispositionRecord.findOne({ where: { lotId, supersededAt: { [Op.is]: null } }, transaction });
    if ((current?.id ?? null) !== input.expectedDispositionId) {
      throw conflict('This lot was decided by someone else meanwhile: reload it to see the current decision', { currentDispositionId: current?.id ?? null });
    }
    const evaluation = await evaluateLot(lot, transaction);
    const verdict = evaluation.verdict;
    if (verdict.proposal === 'undecided') throw new AppError(409, 'lot_undecided', `The lot cannot be decided yet. ${verdict.explanation}`);
    if (input.decision === 'accept' && verdict.proposal !== 'accept') {
      throw new AppError(409, 'decision_contradicts_verdict', 'The sample rejects this lot: it can be rejected, sorted 100 %, or used as is under a deviation');
    }
    if (input.decision === 'use-as-is' && verdict.proposal !== 'reject') {
      throw new AppError(409, 'decision_contradicts_verdict', 'The sample accepts this lot: a deviation is not needed');
    }

    if (current) {
      current.supersededAt = new Date();
      await current.save({ transaction });
      await LotDocument.update({ revokedAt: new Date() }, { where: { dispositionId: current.id, revokedAt: { [Op.is]: null } }, transaction });
      await releaseDeviationUse({ dispositionId: current.id }, transaction);
    }
    // Every piece of the lot is released under the deviation, so it must cover them all.
    const deviation =
      input.decision === 'use-as-is'
        ? await takeDeviation(
            {
              deviationId: input.deviationId!,
              supplierId: lot.supplier.id,
              partId: lot.part.id,
              quantity: lot.pieces.length,
              pieceIds: lot.pieces.map((p) => p.id),
            },
            transaction,
          )
        : null;
    const disposition = await DispositionRecord.create(
      {
        lotId,
        decision: input.decision,
        meaning: SIGNATURE_MEANINGS[input.decision],
        deviationId: deviation?.id ?? null,
        deviationNumber: deviation?.number ?? null,
        justification: input.justification || null,
        lotVerdict: verdict,
        signerId: signer.id,
        supersedesId: current?.id ?? null,
      },
      { transaction },
    );
    if (deviation) await recordDeviationUse(deviation, { dispositionId: disposition.id }, lot.pieces.length, lot.id, transaction);
    await recordLotInSwitching(lot, evaluation, disposition, actor, transaction);
    const context = { dispositionId: disposition.id, deviationNumber: disposition.deviationNumber };
    const routed = await routeLotPieces(lot, input.decision, evaluation.pieceVerdicts, context, actor, transaction);
    const setAside = [...routed['material-review'], ...routed['return-to-vendor']];
    await openLotNcr(
      {
        lot,
        routing: input.decision,
        dispositionId: disposition.id,
        signerId: signer.id,
        explanation: verdict.explanation,
        setAside,
        supersededId: current?.id ?? null,
      },
      actor,
      transaction,
    );
    const outcome = routingOutcome(input.decision, routed, evaluation.pieceVerdicts);
    const documents = await issueLotDocuments({ lot, evaluation, disposition, signer, released: routed.stock, outcome }, transaction);

    if (input.decision === 'reject' || input.decision === 'sort') {
      const report = documents.find((d) => d.kind === 'inspection-report')!;
      const failing = evaluation.samplePieces.filter((p) => p.verdict === 'fail');
      const sorting = input.decision === 'sort';
      await queueMail(
        {
          to: [lot.buyer?.email ?? signer.email],
          subject: `Lot ${lotName(lot.id)} rejected${sorting ? ', 100 % sort ordered' : ''}: ${lot.part.number}, supplier lot ${lot.supplierLot} (${lot.supplier.name})`,
          text: [
            `Lot ${lotName(lot.id)} of ${lot.part.number} (${lot.part.description}) from ${lot.supplier.name}, supplier lot ${lot.supplierLot}, PO ${lot.poNumber}, was rejected by ${signer.name} on ${formatDateTime(disposition.signedAt)}${sorting ? ', with a 100 % sort' : ''}.`,
            '',
            `Sampling: ${evaluation.planSummary}. ${verdict.explanation}.`,
            '',
            'Failing pieces:',
            ...failing.map((p) => `  ${p.serial}: ${p.reasons.join('; ')}`),
            '',
            input.justification ? `Note from quality: ${input.justification}` : '',
            sorting
              ? `The inspection report ${report.number} is attached. Every remaining piece is being measured: conforming pieces will be released to stock, nonconforming ones returned to the supplier.`
              : `The inspection report ${report.number} is attached. The lot has been moved to the return-to-vendor area.`,
          ].join('\n'),
          attachments: [{ filename: `${report.number}.pdf`, contentType: 'application/pdf', content: report.pdf }],
          related: { type: 'lot', id: lot.id },
        },
        transaction,
      );
      await notify(
        {
          kind: 'lot-rejected',
          permission: 'lots.read',
          title: `Lot ${lotName(lot.id)} rejected${sorting ? ' (100 % sort)' : ''}: ${lot.part.number} from ${lot.supplier.name}, PO ${lot.poNumber}`,
          link: `/lots/${lot.id}`,
          entity: { type: 'lot', id: lot.id },
          ...(await buyersOfLot(lot.id, transaction)),
          actorId: signer.id,
        },
        transaction,
      );
    }
    await recordAudit(
      actor,
      {
        action: `disposition.${input.decision}`,
        entityType: 'lot',
        entityId: lotId,
        before: current ? { dispositionId: current.id, decision: current.decision } : { state: lot.state },
        after: {
          dispositionId: disposition.id,
          decision: input.decision,
          meaning: disposition.meaning,
          deviationNumber: disposition.deviationNumber,
          note: disposition.justification,
          pieces: outcome,
          documents: documents.map((d) => d.number),
        },
      },
      transaction,
    );
    // A sort of a lot whose pieces all have a verdict already (e.g. inspected 100 %) completes at once.
    const sorted = input.decision === 'sort' ? await completeSortWhenMeasured(lot, evaluation, actor, transaction) : null;
    return { disposition, documents: [...documents.map(({ pdf: _pdf, ...rest }) => rest), ...(sorted?.documents ?? [])] };
  });
}
