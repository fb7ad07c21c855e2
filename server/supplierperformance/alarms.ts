// Reading the drift alarms raised on a supplier's parts.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import type { DriftAlarmView, DriftCharacteristic, Period } from '../../shared/schemas/supplierPerformance';
import { lotName } from '../../shared/schemas/stock';
import { periodReplacements } from './figures';

/** The supplier's alarms raised in the period (of one part when given), newest first. */
export async function alarmsOf(supplierId: number, period: Period, partId?: number): Promise<DriftAlarmView[]> {
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT a.id, a.part_id, p.number AS part_number, a.characteristic, a.direction, a.lot_id, l.supplier_lot, a.lot_mean, a.ewma, a.limit_value,
            a.failing_pieces, a.raised_at
       FROM drift_alarms a JOIN parts p ON p.id = a.part_id JOIN lots l ON l.id = a.lot_id
      WHERE a.supplier_id = :supplierId ${partId ? 'AND a.part_id = :partId' : ''}
        AND a.raised_at >= :periodStart::timestamptz AND a.raised_at < :periodEnd::timestamptz
      ORDER BY a.raised_at DESC, a.id DESC
      LIMIT 200`,
    { type: QueryTypes.SELECT, replacements: { supplierId, partId, ...periodReplacements(period) } },
  );
  return rows.map((r) => ({
    id: Number(r.id),
    part: { id: Number(r.part_id), number: String(r.part_number) },
    characteristic: r.characteristic as DriftCharacteristic,
    direction: r.direction as 'high' | 'low',
    lot: { id: Number(r.lot_id), name: lotName(Number(r.lot_id)), supplierLot: String(r.supplier_lot) },
    lotMean: Number(r.lot_mean),
    ewma: Number(r.ewma),
    limit: Number(r.limit_value),
    failingPieces: Number(r.failing_pieces),
    raisedAt: (r.raised_at as Date).toISOString(),
  }));
}
