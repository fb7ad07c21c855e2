// Receiving: a shipment logged against an open PO line becomes one lot of serialised pieces in
// quarantine, with its documents and its sampling plan (none while acceptance is discontinued).
// Everything is checked first and written in one transaction, so a refused receipt leaves nothing
// behind.
import { QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { Attachment, Lot, Piece, PurchaseOrder, PurchaseOrderLine, Shipment } from '../../db/models';
import { shipmentReceiveSchema, type ShipmentReceiveInput } from '../../shared/schemas/receiving';
import { lotName } from '../../shared/schemas/stock';
import { parseSerialText, type SerialList } from '../../shared/serials';
import { recordAudit, type AuditActor } from '../audit/record';
import { drawPlanAtReceipt } from '../inspection/sampling';
import { replacementOwed } from '../nonconformance/returns';
import { AppError, badRequest, conflict, notFound } from '../http/errors';
import { storeBlob } from '../storage/blobs';
import { defaultLocation, recordReceipt } from '../stock/ledger';
import { receivedAsOrderedSql } from '../stock/standing';
import { checkDocuments, readSerialFile, type UploadedFile } from './uploads';

export type ReceiptFiles = { packingSlip?: UploadedFile[]; certificate?: UploadedFile[]; serialsFile?: UploadedFile[] };

function serialsOf(typed: string, file: UploadedFile | undefined): { list: SerialList; source: string } {
  if (typed.trim() && file) throw badRequest('Give the serial numbers either typed or as a file, not both');
  if (file) return { list: readSerialFile(file), source: `the serial file ${file.originalname}` };
  if (!typed.trim()) throw badRequest('Give the serial numbers: type or paste them, give a range such as QW-0001..QW-0050, or upload a CSV');
  return { list: parseSerialText(typed), source: 'the serial numbers' };
}

/** How many pieces the line has received so far as ordered (replacements of returned pieces apart). */
export async function receivedOnLine(lineId: number, transaction?: Transaction) {
  const [row] = await sequelize.query<{ received: string }>(`SELECT ${receivedAsOrderedSql('ol.po_line_id = :lineId')} AS received`, {
    type: QueryTypes.SELECT,
    replacements: { lineId },
    transaction,
  });
  return Number(row.received);
}

export async function receiveShipment(actor: AuditActor, rawInput: ShipmentReceiveInput, files: ReceiptFiles) {
  const input = shipmentReceiveSchema.parse(rawInput);
  const { list, source } = serialsOf(input.serials, files.serialsFile?.[0]);
  if (list.errors.length) throw new AppError(400, 'serials', `Some entries in ${source} are not valid`, list.errors);
  if (list.serials.length !== input.quantity) {
    throw badRequest(`The quantity is ${input.quantity} but ${source} give${source.startsWith('the serial file') ? 's' : ''} ${list.serials.length}`);
  }
  const documents = await checkDocuments({ 'packing-slip': files.packingSlip, certificate: files.certificate });
  const receivedAt = input.receivedAt ? new Date(input.receivedAt) : new Date();
  // A few minutes of grace for a clock that runs ahead of the server's.
  if (receivedAt.getTime() > Date.now() + 5 * 60_000)
    throw badRequest('The receipt time lies in the future', [{ path: 'receivedAt', message: 'Not after now' }]);

  return inTransaction(async (transaction) => {
    // The line is locked so two clerks receiving against it at once count each other's receipts.
    const line = await PurchaseOrderLine.findByPk(input.poLineId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!line) throw notFound('PO line');
    const order = await PurchaseOrder.findByPk(line.purchaseOrderId, { transaction });
    if (!order) throw notFound('Purchase order');
    if (order.status !== 'open') throw conflict(`PO ${order.number} is closed; nothing more can be received against it`);

    // A replacement may bring, beyond what the line still expects, the pieces its NCR shipped back.
    const replacement = input.replacementForNcrId
      ? await replacementOwed(input.replacementForNcrId, { supplierId: order.supplierId, partId: line.partId }, transaction)
      : null;
    const outstanding = line.quantity - (await receivedOnLine(line.id, transaction)) + (replacement?.owed ?? 0);
    if (input.quantity > outstanding && !input.overReceiptReason) {
      throw badRequest(
        `Line ${line.lineNumber} of PO ${order.number} still expects ${Math.max(outstanding, 0)}; receiving ${input.quantity} needs a stated reason for the extra pieces`,
        [{ path: 'overReceiptReason', message: 'State why more than the line expects is received' }],
      );
    }

    const known = await sequelize.query<{ serial: string; lotId: number }>(
      `SELECT serial, lot_id AS "lotId" FROM pieces WHERE part_id = :partId AND serial IN (:serials) ORDER BY serial`,
      { type: QueryTypes.SELECT, replacements: { partId: line.partId, serials: list.serials }, transaction },
    );
    if (known.length) {
      const shown = known
        .slice(0, 12)
        .map((k) => `${k.serial} (lot ${lotName(k.lotId)})`)
        .join(', ');
      throw conflict(`Already received for this part: ${shown}${known.length > 12 ? ` and ${known.length - 12} more` : ''}`, {
        serials: known.map((k) => k.serial),
      });
    }

    const quarantine = await defaultLocation('quarantine', transaction);
    const shipment = await Shipment.create(
      {
        purchaseOrderId: order.id,
        packingSlip: input.packingSlipNumber,
        carrier: input.carrier,
        receivedAt,
        receivedBy: actor.id,
        replacementForNcrId: replacement?.ncr.id ?? null,
      },
      { transaction },
    );
    const lot = await Lot.create(
      {
        shipmentId: shipment.id,
        poLineId: line.id,
        partId: line.partId,
        supplierLot: input.supplierLot,
        quantity: input.quantity,
        overReceiptReason: input.quantity > outstanding ? input.overReceiptReason : null,
      },
      { transaction },
    );
    const pieces = await Piece.bulkCreate(
      list.serials.map((serial) => ({ lotId: lot.id, partId: line.partId, serial })),
      { transaction },
    );
    await recordReceipt(
      pieces.map((p) => p.id),
      quarantine.id,
      shipment.receivedAt,
      actor,
      transaction,
    );
    const plan = await drawPlanAtReceipt(lot.id, transaction);
    const keys: string[] = [];
    for (const d of documents) keys.push(await storeBlob(d.data, transaction));
    const attachments = await Attachment.bulkCreate(
      documents.map((d, i) => ({
        shipmentId: shipment.id,
        lotId: lot.id,
        kind: d.kind,
        originalName: d.name,
        mediaType: d.mediaType,
        sizeBytes: d.data.length,
        sha256: keys[i],
        uploadedBy: actor.id,
      })),
      { transaction },
    );
    await recordAudit(
      actor,
      {
        action: 'lot.receive',
        entityType: 'lot',
        entityId: lot.id,
        after: {
          purchaseOrder: order.number,
          line: line.lineNumber,
          supplierLot: lot.supplierLot,
          packingSlip: shipment.packingSlip,
          quantity: lot.quantity,
          overReceiptReason: lot.overReceiptReason,
          replacementFor: replacement?.ncr.number ?? null,
          serials: list.serials,
          attachments: attachments.map((a) => ({ kind: a.kind, name: a.originalName, sha256: a.sha256 })),
          sampling: plan
            ? {
                severity: plan.severity,
                codeLetter: plan.codeLetter,
                planLetter: plan.planLetter,
                sampleSize: plan.sampleSize,
                accept: plan.acceptNumber,
                reject: plan.rejectNumber,
                seed: plan.sampleSeed,
              }
            : 'acceptance discontinued: the lot waits without a plan',
        },
      },
      transaction,
    );
    return { shipment, lot, attachments, plan };
  });
}
export type ReceiptRecord = Awaited<ReturnType<typeof receiveShipment>>;
