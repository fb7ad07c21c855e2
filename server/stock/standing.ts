// A piece's standing as SQL, shared by the stock ledger (what may go to stock or a work order) and
// the lot and PO quantities. `piece` and `lot` are SQL expressions naming the piece's and lot's id.
import type { PieceQuantities } from '../../shared/schemas/stock';

/** The piece's current results (superseded ones aside) include a fail. */
export const failingNowSql = (piece: string) =>
  `EXISTS (SELECT 1 FROM piece_results r WHERE r.piece_id = ${piece} AND r.superseded_by_file_id IS NULL AND r.verdict = 'fail')`;

/** The lot's current signed decision is use as is: its failed pieces are released under that decision. */
export const usedAsIsSql = (lot: string) =>
  `EXISTS (SELECT 1 FROM dispositions d WHERE d.lot_id = ${lot} AND d.superseded_at IS NULL AND d.decision = 'use-as-is')`;

/** The piece's latest NCR released it to use: a signed use as is, or a signed release after rework. */
export const releasedByNcrSql = (piece: string) =>
  `EXISTS (SELECT 1 FROM nonconformance_pieces np JOIN ncr_dispositions nd ON nd.id = np.disposition_id
            WHERE np.piece_id = ${piece} AND (nd.decision = 'use-as-is' OR np.rework_release_id IS NOT NULL)
              AND np.nonconformance_id = (SELECT max(latest.nonconformance_id) FROM nonconformance_pieces latest WHERE latest.piece_id = ${piece}))`;

/** The PieceQuantities of the pieces `where` selects (pieces alias `pc`, their lots `ql`). */
export const pieceQuantitiesSql = (where: string) => `(
  SELECT count(*) FILTER (WHERE pc.state IN ('in-stock', 'issued')) AS accepted,
         count(*) FILTER (WHERE ${failingNowSql('pc.id')}) AS nonconforming,
         count(*) FILTER (WHERE pc.state IN ('returned', 'shipped-back')) AS returned
    FROM pieces pc JOIN lots ql ON ql.id = pc.lot_id WHERE ${where})`;

export const pieceQuantities = (row: Record<string, unknown>): PieceQuantities => ({
  accepted: Number(row.accepted ?? 0),
  nonconforming: Number(row.nonconforming ?? 0),
  returned: Number(row.returned ?? 0),
});

/** Pieces received as ordered on the PO lines `where` selects (lots alias `ol`): a shipment that
 * replaces an NCR's returned pieces is counted apart (replacedPiecesSql), so neither is counted twice. */
export const receivedAsOrderedSql = (where: string) =>
  `(SELECT coalesce(sum(ol.quantity), 0) FROM lots ol JOIN shipments os ON os.id = ol.shipment_id WHERE os.replacement_for_ncr_id IS NULL AND ${where})`;

/** Pieces received in shipments that replace an NCR's returned pieces, of the lots `where` selects
 * (lots alias `rl`). */
export const replacedPiecesSql = (where: string) =>
  `(SELECT count(*) FROM pieces rp JOIN lots rl ON rl.id = rp.lot_id JOIN shipments rs ON rs.id = rl.shipment_id
     WHERE rs.replacement_for_ncr_id IS NOT NULL AND ${where})`;
