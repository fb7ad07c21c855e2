// Signing a lot disposition: the quality manager re-enters the password and confirms the meaning of
// the signature; the decision, its documents, the stock moves, the switching state and (for a
// rejection) the buyer's e-mail are written in one transaction. A signed decision is never edited:
// a new one supersedes it and revokes its documents.
import bcrypt from 'bcryptjs';
import { Op } from 'sequelize';
import { inTransaction } from '../../db';
import { DispositionRecord, LotDocument, User } from '../../db/models';
import { SIGNATURE_MEANINGS, type DispositionInput } from '../../shared/inspection/lotVerdict';
import { actorFromUser, recordAudit, type AuditActor } from '../audit/record';
import { AppError, conflict } from '../http/errors';
import { queueMail } from '../mail/outbox';
import { issueLotDocuments } from './documents';
import { applyDispositionToLot, lotForInspection } from './lotAccess';
import { evaluateLot } from './evaluation';
import { recordLotInSwitching } from './switching';

export async function signDisposition(signer: User, lotId: number, input: DispositionInput, request: Pick<AuditActor, 'requestId' | 'address'> = {}) {
  const actor = { ...actorFromUser(signer), ...request };
  // The password is checked before anything is locked: a wrong one costs no one a wait.
  if (!(await bcrypt.compare(input.password, signer.passwordHash))) {
    await recordAudit(actor, { action: 'disposition.signature-refused', entityType: 'lot', entityId: lotId });
    throw new AppError(401, 'signature_refused', 'The password does not match: the disposition was not signed');
  }
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
      throw new AppError(409, 'decision_contradicts_verdict', 'The sample rejects this lot: it can be rejected, or used as is under a deviation');
    }
    if (input.decision === 'use-as-is' && verdict.proposal !== 'reject') {
      throw new AppError(409, 'decision_contradicts_verdict', 'The sample accepts this lot: a deviation is not needed');
    }

    if (current) {
      current.supersededAt = new Date();
      await current.save({ transaction });
      await LotDocument.update({ revokedAt: new Date() }, { where: { dispositionId: current.id, revokedAt: { [Op.is]: null } }, transaction });
    }
    const disposition = await DispositionRecord.create(
      {
        lotId,
        decision: input.decision,
        meaning: SIGNATURE_MEANINGS[input.decision],
        deviationNumber: input.decision === 'use-as-is' ? input.deviationNumber! : null,
        justification: input.justification || null,
        lotVerdict: verdict,
        signerId: signer.id,
        supersedesId: current?.id ?? null,
      },
      { transaction },
    );
    await recordLotInSwitching(lot, evaluation, disposition, actor, transaction);
    await applyDispositionToLot(lot, input.decision, actor, transaction);
    const documents = await issueLotDocuments({ lot, evaluation, disposition, signer }, transaction);

    if (input.decision === 'reject') {
      const report = documents.find((d) => d.kind === 'inspection-report')!;
      const failing = evaluation.samplePieces.filter((p) => p.verdict === 'fail');
      await queueMail(
        {
          to: [lot.buyer?.email ?? signer.email],
          subject: `Lot rejected: ${lot.part.number}, supplier lot ${lot.supplierLot} (${lot.supplier.name})`,
          text: [
            `Lot ${lot.id} of ${lot.part.number} (${lot.part.description}) from ${lot.supplier.name}, supplier lot ${lot.supplierLot}, PO ${lot.poNumber}, was rejected by ${signer.name} on ${disposition.signedAt.toISOString().slice(0, 16).replace('T', ' ')} UTC.`,
            '',
            `Sampling: ${evaluation.planSummary}. ${verdict.explanation}.`,
            '',
            'Failing pieces:',
            ...failing.map((p) => `  ${p.serial}: ${p.reasons.join('; ')}`),
            '',
            input.justification ? `Note from quality: ${input.justification}` : '',
            `The inspection report ${report.number} is attached. The lot has been moved to return-to-vendor.`,
          ].join('\n'),
          attachments: [{ filename: `${report.number}.pdf`, contentType: 'application/pdf', content: report.pdf }],
          related: { type: 'lot', id: lot.id },
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
        after: { dispositionId: disposition.id, decision: input.decision, meaning: disposition.meaning, deviationNumber: disposition.deviationNumber, documents: documents.map((d) => d.number) },
      },
      transaction,
    );
    return { disposition, documents: documents.map(({ pdf: _pdf, ...rest }) => rest) };
  });
}
