// The nonconformance part of the demo, written through the real operations after inspection has
// opened its NCRs: the rejected lot's failed plates scrapped and the rest shipped back for a
// replacement, which has arrived; the sort's nonconforming plates shipped back for a credit and the
// NCR closed; a plate found failing at assembly, its NCR still open.
import { Op } from 'sequelize';
import { DefectCode, Lot, Nonconformance, NonconformancePiece, Piece, PurchaseOrderLine, User } from '../models';
import { actorFromUser } from '../../server/audit/record';
import { closeNcr, openNcrByHand, signNcrDisposition } from '../../server/nonconformance/ncrs';
import { shipReturn } from '../../server/nonconformance/returns';
import { receiveShipment } from '../../server/receiving/receipts';
import { demoDocument, pdfFile } from './receivingDemo';

async function demoUser(role: string) {
  return User.findOne({ where: { email: `${role}@phaselot.test` }, rejectOnEmpty: true });
}

const daysAgo = (days: number) => new Date(Date.now() - days * 86_400_000).toISOString().slice(0, 10);

/** The NCR a lot decision of this origin opened first in the demo. */
const firstNcr = (origin: 'rejection' | 'sort') =>
  Nonconformance.findOne({ where: { origin, status: { [Op.ne]: 'closed' } }, order: [['id', 'ASC']], rejectOnEmpty: true });

async function failingPieceIds(ncrId: number) {
  const pieces = await NonconformancePiece.findAll({ where: { nonconformanceId: ncrId } });
  return pieces.filter((p) => p.reasons.length > 0).map((p) => p.pieceId);
}

export async function seedNonconformanceDemo(password: string) {
  const [quality, buyer, clerk, inspector] = await Promise.all(['quality', 'buyer', 'clerk', 'inspector'].map(demoUser));
  const sign = { password, meaningAcknowledged: true as const };

  // The rejected lot: the supplier asks for the failed plates to be scrapped here and the rest back.
  const rejected = await firstNcr('rejection');
  await signNcrDisposition(quality, rejected.id, {
    ...sign,
    decision: 'scrap',
    pieceIds: await failingPieceIds(rejected.id),
    note: 'Supplier agreed: scrap on site, no return needed',
  });
  await signNcrDisposition(quality, rejected.id, { ...sign, decision: 'return-to-vendor' });
  const shipped = await shipReturn(actorFromUser(buyer), {
    nonconformanceId: rejected.id,
    rmaNumber: 'SB-RMA-26118',
    shipDate: daysAgo(12),
    carrier: 'Larchway Freight',
    tracking: 'LF-7731-0442',
    remedy: 'replacement',
    note: 'Supplier re-polishes from a new blank batch.',
  });
  const lot = await Lot.findByPk(rejected.lotId!, { rejectOnEmpty: true });
  const line = await PurchaseOrderLine.findByPk(lot.poLineId, { rejectOnEmpty: true });
  const count = await NonconformancePiece.count({ where: { returnId: shipped.id } });
  const slip = 'PS-SB-7731R';
  const packingSlip = await demoDocument(`Packing slip ${slip}`, [
    'From: Saltern Birefringents',
    'To: Veltrane Optics Works, goods in',
    `Replacement for RMA ${shipped.rmaNumber}: ${count} pieces, serials HW1-0081 to HW1-${String(80 + count).padStart(4, '0')}`,
  ]);
  await receiveShipment(
    actorFromUser(clerk),
    {
      poLineId: line.id,
      packingSlipNumber: slip,
      carrier: 'Larchway Freight',
      supplierLot: 'SB-7731R',
      quantity: count,
      serials: `HW1-0081..HW1-${String(80 + count).padStart(4, '0')}`,
      replacementForNcrId: rejected.id,
    },
    { packingSlip: [pdfFile(`${slip}.pdf`, packingSlip)] },
  );

  // The sort's nonconforming plates go back for a credit, and the NCR is closed.
  const sorted = await firstNcr('sort');
  await signNcrDisposition(quality, sorted.id, { ...sign, decision: 'return-to-vendor' });
  const sortedLine = await PurchaseOrderLine.findByPk((await Lot.findByPk(sorted.lotId!, { rejectOnEmpty: true })).poLineId, { rejectOnEmpty: true });
  const sortedPieces = await NonconformancePiece.count({ where: { nonconformanceId: sorted.id } });
  await shipReturn(actorFromUser(buyer), {
    nonconformanceId: sorted.id,
    rmaNumber: 'OTF-R-0093',
    shipDate: daysAgo(5),
    carrier: 'Pellow Couriers',
    remedy: 'credit',
    creditAmount: sortedPieces * sortedLine.unitPrice,
  });
  await closeNcr(actorFromUser(quality), sorted.id, { note: 'Credit note OTF-CN-2211 received.' });

  // A plate issued to a work order found failing at assembly: its NCR is open, the plate under review.
  const issued = await Piece.findOne({ where: { state: 'issued' }, order: [['serial', 'ASC']], rejectOnEmpty: true });
  const axisMark = await DefectCode.findOne({ where: { code: 'axis-mark' }, rejectOnEmpty: true });
  await openNcrByHand(actorFromUser(inspector), {
    partId: issued.partId,
    serials: issued.serial,
    defectCodeIds: [axisMark.id],
    description: 'Polarisation extinction in the finished instrument 3 dB short; the plate re-measured at the bench shows the fast-axis mark 1.4° off.',
    containment: 'Plate taken out of the build; the other plates of its lot issued to the same work order re-checked, all within tolerance.',
  });
}
