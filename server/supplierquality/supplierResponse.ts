// The supplier's side of a corrective-action request, reached through the mailed link with no
// account: what the request asks, and the one answer the link takes (root cause, containment,
// corrective and preventive actions with dates, PDF/PNG/JPEG files sniffed from their content).
// The answer, its files, the used link, the request's new status, the mail to the buyer and quality
// and the audit entry (with the sender's address) are one transaction. A refused submission
// through a genuine link is audited too, in a transaction of its own.
import { fileTypeFromBuffer } from 'file-type';
import { QueryTypes } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { CorrectiveActionAttachment, CorrectiveActionResponse } from '../../db/models';
import {
  MAX_RESPONSE_FILE_BYTES,
  MAX_RESPONSE_FILES,
  RESPONSE_FILE_TYPES,
  supplierResponseSchema,
  type SupplierRequestView,
  type SupplierResponseInput,
} from '../../shared/schemas/correctiveActions';
import { recordAudit, type AuditActor } from '../audit/record';
import { config } from '../config';
import { AppError, conflict } from '../http/errors';
import { queueMail } from '../mail/outbox';
import { buyersOfSupplier, notify } from '../notifications/notify';
import { storeBlob } from '../storage/blobs';
import { buyerAndQuality, lockedRequest } from './correctiveActions';
import { claimedLink, linkOfToken } from './responseLinks';

export type UploadedFile = { originalname: string; buffer: Buffer; size: number };
export type Sender = Pick<AuditActor, 'requestId' | 'address'> & { userAgent?: string };

const senderActor = (sender: Sender): AuditActor => ({ id: null, email: null, roles: [], requestId: sender.requestId, address: sender.address });

export async function supplierRequestView(token: string): Promise<SupplierRequestView> {
  const link = await linkOfToken(token);
  const [request] = await sequelize.query<{
    number: string;
    supplier: string;
    partNumber: string;
    partDescription: string;
    problem: string;
    responseDueOn: string;
  }>(
    `SELECT ca.number, s.name AS supplier, p.number AS "partNumber", p.description AS "partDescription", ca.problem, to_char(ca.response_due_on, 'YYYY-MM-DD') AS "responseDueOn"
       FROM corrective_actions ca JOIN suppliers s ON s.id = ca.supplier_id JOIN parts p ON p.id = ca.part_id WHERE ca.id = :id`,
    { type: QueryTypes.SELECT, replacements: { id: link.correctiveActionId } },
  );
  const ncrs = await sequelize.query<{ number: string; description: string; serials: string[] }>(
    `SELECT n.number, n.description, coalesce(array_agg(p.serial ORDER BY p.serial) FILTER (WHERE p.serial IS NOT NULL), '{}') AS serials
       FROM corrective_action_nonconformances c JOIN nonconformances n ON n.id = c.nonconformance_id
       LEFT JOIN nonconformance_pieces np ON np.nonconformance_id = n.id LEFT JOIN pieces p ON p.id = np.piece_id
      WHERE c.corrective_action_id = :id GROUP BY n.id ORDER BY n.number`,
    { type: QueryTypes.SELECT, replacements: { id: link.correctiveActionId } },
  );
  const returned = await CorrectiveActionResponse.findOne({
    where: { correctiveActionId: link.correctiveActionId, review: 'returned' },
    order: [['reviewedAt', 'DESC']],
  });
  return {
    number: request.number,
    supplier: request.supplier,
    part: { number: request.partNumber, description: request.partDescription },
    problem: request.problem,
    ncrs,
    responseDueOn: request.responseDueOn,
    linkExpiresAt: link.expiresAt.toISOString(),
    returnedNote: returned?.reviewNote ?? null,
  };
}

/** Only PDF, PNG and JPEG content, each up to 10 MB, whatever the files are called. */
async function checkFiles(files: UploadedFile[]) {
  if (files.length > MAX_RESPONSE_FILES) throw new AppError(400, 'too_many_files', `At most ${MAX_RESPONSE_FILES} files can be attached`);
  const refused: { file: string; message: string }[] = [];
  const checked: (UploadedFile & { mediaType: string })[] = [];
  for (const file of files) {
    const type = await fileTypeFromBuffer(file.buffer);
    if (file.size === 0) refused.push({ file: file.originalname, message: `${file.originalname} is empty` });
    else if (file.size > MAX_RESPONSE_FILE_BYTES) refused.push({ file: file.originalname, message: `${file.originalname} is larger than 10 MB` });
    else if (!type || !(RESPONSE_FILE_TYPES as readonly string[]).includes(type.mime)) {
      refused.push({ file: file.originalname, message: `${file.originalname} is not a PDF, PNG or JPEG${type ? ` (its content is ${type.mime})` : ''}` });
    } else checked.push({ ...file, mediaType: type.mime });
  }
  if (refused.length) throw new AppError(415, 'unsupported_file', refused.map((r) => r.message).join('; '), refused);
  return checked;
}

/** Audits a refused answer (with the sender's address) when it came through a link the server issued. */
export async function auditRefusal(token: string, error: AppError, sender: Sender) {
  // Only a link the server issued names a request; forged tokens leave no trace but the rate limit's.
  const link = await claimedLink(token);
  if (!link) return;
  await recordAudit(senderActor(sender), {
    action: 'corrective-action.response-refused',
    entityType: 'corrective-action',
    entityId: link.correctiveActionId,
    after: { linkId: link.id, code: error.code, reason: error.message, userAgent: sender.userAgent ?? null },
  });
}

export async function submitSupplierResponse(token: string, rawInput: SupplierResponseInput, files: UploadedFile[], sender: Sender) {
  try {
    const input = supplierResponseSchema.parse(rawInput);
    const attachments = await checkFiles(files);
    return await inTransaction(async (transaction) => {
      const link = await linkOfToken(token, transaction);
      const request = await lockedRequest(link.correctiveActionId, transaction);
      if (request.status !== 'awaiting-response') throw conflict(`${request.number} is not awaiting an answer`);
      const response = await CorrectiveActionResponse.create(
        {
          ...input,
          containmentOn: input.containmentOn ?? null,
          preventiveDueOn: input.preventiveDueOn ?? null,
          correctiveActionId: request.id,
          linkId: link.id,
          address: sender.address?.slice(0, 64) ?? null,
          userAgent: sender.userAgent?.slice(0, 300) ?? null,
        },
        { transaction },
      );
      const stored = [];
      for (const file of attachments) {
        const storageKey = await storeBlob(file.buffer, transaction);
        stored.push(
          await CorrectiveActionAttachment.create(
            { responseId: response.id, name: file.originalname.slice(0, 255), mediaType: file.mediaType, size: file.size, storageKey },
            { transaction },
          ),
        );
      }
      link.submittedAt = new Date();
      await link.save({ transaction });
      request.set({ status: 'responded', updatedAt: new Date() });
      await request.save({ transaction });
      await queueMail(
        {
          to: await buyerAndQuality(request, transaction),
          subject: `Supplier answered ${request.number}: review the answer`,
          text: [
            `${input.responderName} answered corrective-action request ${request.number}.`,
            '',
            `Root cause: ${input.rootCause}`,
            `Corrective actions (in effect by ${input.correctiveDueOn}): ${input.correctiveActions}`,
            stored.length ? `Files attached to the answer: ${stored.map((a) => a.name).join(', ')}` : 'No files were attached.',
            '',
            `Review it (accept, or return it to the supplier) at ${config.PUBLIC_URL}/corrective-actions/${request.id}`,
          ].join('\n'),
          related: { type: 'corrective-action', id: request.id },
        },
        transaction,
      );
      const buyers = await buyersOfSupplier(request.supplierId, transaction);
      await notify(
        {
          kind: 'corrective-answered',
          permission: 'corrective.read',
          title: `Supplier answered ${request.number}: review the answer`,
          link: `/corrective-actions/${request.id}`,
          entity: { type: 'corrective-action', id: request.id },
          users: [request.requestedBy, ...(buyers.users ?? [])],
          roles: ['quality'],
        },
        transaction,
      );
      await recordAudit(
        senderActor(sender),
        {
          action: 'corrective-action.response',
          entityType: 'corrective-action',
          entityId: request.id,
          after: {
            responseId: response.id,
            linkId: link.id,
            responderName: input.responderName,
            files: stored.map((a) => ({ name: a.name, sha256: a.storageKey, size: a.size })),
            userAgent: sender.userAgent ?? null,
          },
        },
        transaction,
      );
      return response;
    });
  } catch (error) {
    if (error instanceof AppError) await auditRefusal(token, error, sender);
    throw error;
  }
}
