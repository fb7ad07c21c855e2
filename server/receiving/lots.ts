// One lot as its page shows it: receipt, order line, pieces and where they are, documents, plan,
// piece outcomes and the events of its history.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { Attachment, Lot, Part, PurchaseOrder, PurchaseOrderLine, Shipment, Supplier, User } from '../../db/models';
import type { MoveReason, PieceState } from '../../shared/schemas/stock';
import { notFound } from '../http/errors';
import { inspectionPlanOf } from '../inspection/sampling';
import { pieceQuantitiesSql } from '../stock/standing';

/** A lot in quarantine without a plan was received while acceptance was discontinued. */
export const AWAITING_RESUMPTION = `(l.state = 'quarantine' AND NOT EXISTS (SELECT 1 FROM lot_inspections li WHERE li.lot_id = l.id))`;

export type LotAuditEvent = { occurred_at: Date; action: string; actor_email: string | null; name: string | null };

/** Audit entries about lots (their receipt aside, which the shipment tells), oldest first. */
export function lotAuditEvents(lotIds: number[]) {
  return sequelize.query<LotAuditEvent>(
    `SELECT a.occurred_at, a.action, a.actor_email, u.name FROM audit_events a LEFT JOIN users u ON u.id = a.actor_id
      WHERE a.entity_type = 'lot' AND a.entity_id IN (:ids) AND a.action <> 'lot.receive' ORDER BY a.id`,
    { type: QueryTypes.SELECT, replacements: { ids: lotIds.map(String) } },
  );
}

export type LotMoveBatch = {
  moved_at: Date;
  reason: MoveReason;
  from_code: string | null;
  to_code: string | null;
  work_order: string | null;
  who: string | null;
  pieces: string;
};

/** The lot's moves, one row per batch of pieces moved together. */
function lotMoveBatches(lotId: number) {
  return sequelize.query<LotMoveBatch>(
    `SELECT m.moved_at, m.reason, f.code AS from_code, t.code AS to_code, m.work_order, u.name AS who, count(*) AS pieces
       FROM stock_moves m
       JOIN pieces p ON p.id = m.piece_id
       LEFT JOIN locations f ON f.id = m.from_location_id
       LEFT JOIN locations t ON t.id = m.to_location_id
       LEFT JOIN users u ON u.id = m.actor_id
      WHERE p.lot_id = :lotId
      GROUP BY m.moved_at, m.reason, f.code, t.code, m.work_order, u.name
      ORDER BY m.moved_at`,
    { type: QueryTypes.SELECT, replacements: { lotId } },
  );
}

export async function findLot(id: number) {
  // The reads are independent: they run at once, each on a connection of the pool, so that opening
  // a lot waits for the slowest of them rather than for their sum.
  const [lot, pieces, attachments, plan, [quantities], [{ waiting }], auditEvents, moves] = await Promise.all([
    Lot.findByPk(id, {
      include: [
        { model: Shipment, as: 'shipment', include: [{ model: User, as: 'receiver' }] },
        { model: PurchaseOrderLine, as: 'line', include: [{ model: PurchaseOrder, as: 'purchaseOrder', include: [{ model: Supplier, as: 'supplier' }] }] },
        { model: Part, as: 'part' },
      ],
    }),
    sequelize.query<{ id: number; serial: string; state: PieceState; location: string | null }>(
      `SELECT p.id, p.serial, p.state, loc.code AS location FROM pieces p
         LEFT JOIN piece_locations pl ON pl.piece_id = p.id LEFT JOIN locations loc ON loc.id = pl.location_id
        WHERE p.lot_id = :id ORDER BY p.serial`,
      { type: QueryTypes.SELECT, replacements: { id } },
    ),
    Attachment.findAll({ where: { lotId: id }, order: [['id', 'ASC']] }),
    inspectionPlanOf(id),
    sequelize.query<Record<string, unknown>>(`SELECT * FROM ${pieceQuantitiesSql('pc.lot_id = :id')} AS q`, { type: QueryTypes.SELECT, replacements: { id } }),
    // One row even for a lot that is not there, which is then reported missing.
    sequelize.query<{ waiting: boolean }>(`SELECT coalesce((SELECT ${AWAITING_RESUMPTION} FROM lots l WHERE l.id = :id), false) AS waiting`, {
      type: QueryTypes.SELECT,
      replacements: { id },
    }),
    lotAuditEvents([id]),
    lotMoveBatches(id),
  ]);
  if (!lot) throw notFound('Lot');
  return { lot, pieces, attachments, plan, quantities, acceptanceDiscontinued: waiting, auditEvents, moves };
}
export type LotRecord = Awaited<ReturnType<typeof findLot>>;
