import type { ReceiptRecord } from '../../receiving/receipts';

export const presentReceipt = ({ shipment, lot, attachments, plan }: ReceiptRecord) => ({
  shipmentId: shipment.id,
  lotId: lot.id,
  quantity: lot.quantity,
  state: lot.state,
  acceptanceDiscontinued: plan === null,
  attachments: attachments.map((a) => ({ id: a.id, kind: a.kind, name: a.originalName, sha256: a.sha256 })),
});
