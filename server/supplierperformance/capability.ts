// What was measured of a supplier's part: every piece's current result at the design wavelength,
// in the order the lots arrived, turned into capability and drift charts per characteristic.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { MARK_ON_SLOW_AXIS } from '../../shared/optics/judge';
import { DRIFT_CHARACTERISTICS, resolvePeriod, type CapabilityQuery, type CapabilityView, type Period } from '../../shared/schemas/supplierPerformance';
import type { PartSpec } from '../../shared/schemas/spec';
import { notFound } from '../http/errors';
import { alarmsOf } from './alarms';
import { periodReplacements } from './figures';
import { characteristicView, type MeasuredPiece } from './series';

/** The pieces of the supplier's part measured in lots received in the period, and how many were
 * left out for a mark on the slow axis (a gross error of another kind than the spread). */
export async function measuredPieces(supplierId: number, partId: number, period: Period, transaction?: Transaction) {
  const rows = await sequelize.query<{
    lot_id: number;
    supplier_lot: string;
    received_at: Date;
    spec: PartSpec;
    verdict: string;
    retardance: number;
    axis: number;
    slow_axis: boolean;
  }>(
    `SELECT l.id AS lot_id, l.supplier_lot, sh.received_at, pol.spec, r.verdict,
            (r.result->>'retardanceErrorWaves')::float8 AS retardance, (r.result->>'axisErrorDeg')::float8 AS axis,
            coalesce(r.result->'reasons' @> jsonb_build_array(CAST(:slowAxis AS text)), false) AS slow_axis
       FROM lots l
       JOIN shipments sh ON sh.id = l.shipment_id
       JOIN purchase_order_lines pol ON pol.id = l.po_line_id
       JOIN purchase_orders po ON po.id = pol.purchase_order_id
       JOIN pieces pc ON pc.lot_id = l.id
       JOIN piece_results r ON r.piece_id = pc.id AND r.superseded_by_file_id IS NULL
      WHERE po.supplier_id = :supplierId AND l.part_id = :partId
        AND sh.received_at >= :periodStart::timestamptz AND sh.received_at < :periodEnd::timestamptz
        AND r.verdict IN ('pass', 'fail') AND abs(r.wavelength_nm - (pol.spec->>'designWavelengthNm')::numeric) <= 0.5
        AND r.result->>'retardanceErrorWaves' IS NOT NULL AND r.result->>'axisErrorDeg' IS NOT NULL
      ORDER BY sh.received_at, l.id, pc.id`,
    { type: QueryTypes.SELECT, transaction, replacements: { supplierId, partId, slowAxis: MARK_ON_SLOW_AXIS, ...periodReplacements(period) } },
  );
  const pieces: MeasuredPiece[] = rows
    .filter((r) => !r.slow_axis)
    .map((r) => ({
      lotId: Number(r.lot_id),
      supplierLot: r.supplier_lot,
      receivedAt: r.received_at,
      retardanceErrorWaves: Number(r.retardance),
      axisErrorDeg: Number(r.axis),
      retardanceTolWaves: r.spec.retardanceTolWaves,
      axisTolDeg: r.spec.axisTolDeg,
      failing: r.verdict === 'fail',
    }));
  return { pieces, markOnSlowAxis: rows.length - pieces.length };
}

/** The supplier's and part's names; 404 unless the part was ordered from the supplier. */
async function supplierPart(supplierId: number, partId: number) {
  const [row] = await sequelize.query<{ supplier: string; number: string; description: string }>(
    `SELECT s.name AS supplier, p.number, p.description FROM suppliers s JOIN parts p ON p.id = :partId
      WHERE s.id = :supplierId AND EXISTS (SELECT 1 FROM purchase_order_lines pol JOIN purchase_orders po ON po.id = pol.purchase_order_id WHERE po.supplier_id = s.id AND pol.part_id = p.id)`,
    { type: QueryTypes.SELECT, replacements: { supplierId, partId } },
  );
  if (!row) throw notFound('Part ordered from this supplier');
  return row;
}

export async function supplierPartCapability(supplierId: number, query: CapabilityQuery, today = new Date()): Promise<CapabilityView> {
  const names = await supplierPart(supplierId, query.partId);
  const period = resolvePeriod(query, today);
  const { pieces, markOnSlowAxis } = await measuredPieces(supplierId, query.partId, period);
  return {
    supplier: { id: supplierId, name: names.supplier },
    part: { id: query.partId, number: names.number, description: names.description },
    period,
    markOnSlowAxis,
    characteristics: DRIFT_CHARACTERISTICS.map((c) => characteristicView(c, pieces)),
    alarms: await alarmsOf(supplierId, period, query.partId),
  };
}
