import type { AttachmentView, HistoryEntry, LotView } from '../../../shared/schemas/receiving';
import { MOVE_REASON_LABELS, type PieceState } from '../../../shared/schemas/stock';
import { describePlan } from '../../inspection/sampling';
import type { LotAuditEvent, LotMoveBatch, LotRecord } from '../../receiving/lots';
import { pieceQuantities } from '../../stock/standing';

const presentAttachment = (a: LotRecord['attachments'][number]): AttachmentView => ({
  id: a.id,
  kind: a.kind,
  name: a.originalName,
  mediaType: a.mediaType,
  sizeBytes: a.sizeBytes,
  sha256: a.sha256,
  uploadedAt: a.uploadedAt.toISOString(),
});

const humanAction = (action: string) => {
  const words = action.replace(/^lot\./, '').replace(/[.-]/g, ' ');
  return words.charAt(0).toUpperCase() + words.slice(1);
};

/** Audit entries about a lot as history lines. */
export const presentLotAuditEvents = (events: LotAuditEvent[]): HistoryEntry[] =>
  events.map((r) => ({ at: r.occurred_at.toISOString(), what: humanAction(r.action), who: r.name ?? r.actor_email }));

const presentMoveBatch = (r: LotMoveBatch): HistoryEntry => ({
  at: r.moved_at.toISOString(),
  what: MOVE_REASON_LABELS[r.reason],
  who: r.who,
  detail: `${r.pieces} piece${r.pieces === '1' ? '' : 's'}${r.from_code ? ` from ${r.from_code}` : ''}${r.to_code ? ` to ${r.to_code}` : ''}${r.work_order ? ` for work order ${r.work_order}` : ''}`,
});

export function presentLot({ lot, pieces, attachments, plan, quantities, acceptanceDiscontinued, auditEvents, moves }: LotRecord): LotView {
  const shipment = lot.shipment!;
  const line = lot.line!;
  const order = line.purchaseOrder!;
  const pieceStates: Partial<Record<PieceState, number>> = {};
  for (const piece of pieces) pieceStates[piece.state] = (pieceStates[piece.state] ?? 0) + 1;
  const receivedBy = shipment.receiver?.name ?? null;
  const history = [
    {
      at: shipment.receivedAt.toISOString(),
      what: 'Received into quarantine',
      who: receivedBy,
      detail: `${lot.quantity} pieces on packing slip ${shipment.packingSlip}${shipment.carrier ? `, carrier ${shipment.carrier}` : ''}${lot.overReceiptReason ? `; more than the line expected: ${lot.overReceiptReason}` : ''}`,
    },
    ...presentLotAuditEvents(auditEvents),
    ...moves.map(presentMoveBatch).filter((entry) => entry.what !== MOVE_REASON_LABELS.receipt),
  ].sort((a, b) => a.at.localeCompare(b.at));
  return {
    id: lot.id,
    supplierLot: lot.supplierLot,
    state: lot.state,
    quantity: lot.quantity,
    overReceiptReason: lot.overReceiptReason,
    acceptanceDiscontinued,
    ...pieceQuantities(quantities),
    shipment: { id: shipment.id, packingSlip: shipment.packingSlip, carrier: shipment.carrier, receivedAt: shipment.receivedAt.toISOString(), receivedBy },
    purchaseOrder: { id: order.id, number: order.number, supplier: { id: order.supplier!.id, name: order.supplier!.name } },
    line: {
      id: line.id,
      lineNumber: line.lineNumber,
      quantity: line.quantity,
      inspectionLevel: line.inspectionLevel,
      aql: line.aql,
      hundredPercent: line.hundredPercent,
      spec: line.spec,
    },
    plan: plan && {
      severity: plan.severity,
      codeLetter: plan.codeLetter,
      planLetter: plan.planLetter,
      sampleSize: plan.sampleSize,
      accept: plan.acceptNumber,
      reject: plan.rejectNumber,
      hundredPercent: plan.hundredPercent,
      summary: describePlan(plan),
    },
    part: { id: lot.part!.id, number: lot.part!.number, description: lot.part!.description },
    pieceStates,
    pieces,
    attachments: attachments.map(presentAttachment),
    history,
  };
}
