// A supplier's scorecard over a period: its figures, the same per part it is ordered for (with the
// part's switching state now), and the drift alarms raised meanwhile.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { switchingPhaseOf, type SwitchingState } from '../../shared/sampling';
import { resolvePeriod, type ScorecardQuery, type SupplierScorecardView } from '../../shared/schemas/supplierPerformance';
import { notFound } from '../http/errors';
import { alarmsOf } from './alarms';
import { addCounts, countsOf, figuresOf, figuresSql, periodReplacements } from './figures';

export async function findSupplierSummary(supplierId: number) {
  const [supplier] = await sequelize.query<{ id: number; name: string; active: boolean; owner_id: number | null; owner_name: string | null }>(
    `SELECT s.id, s.name, s.active, u.id AS owner_id, u.name AS owner_name FROM suppliers s LEFT JOIN users u ON u.id = s.owner_id WHERE s.id = :supplierId`,
    { type: QueryTypes.SELECT, replacements: { supplierId } },
  );
  if (!supplier) throw notFound('Supplier');
  return supplier;
}

export async function supplierScorecard(supplierId: number, query: ScorecardQuery, today = new Date()): Promise<SupplierScorecardView> {
  const supplier = await findSupplierSummary(supplierId);
  const period = resolvePeriod(query, today);
  // Every part the supplier has been ordered for, with its figures and its switching state now.
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT p.id, p.number, p.description, ss.state AS switching, f.*
       FROM parts p
       CROSS JOIN LATERAL ${figuresSql({ lots: 'po.supplier_id = :supplierId AND l.part_id = p.id', records: 'x.supplier_id = :supplierId AND x.part_id = p.id' })} f
       LEFT JOIN switching_states ss ON ss.supplier_id = :supplierId AND ss.part_id = p.id
      WHERE EXISTS (SELECT 1 FROM purchase_order_lines pol JOIN purchase_orders po ON po.id = pol.purchase_order_id WHERE po.supplier_id = :supplierId AND pol.part_id = p.id)
        ${query.partId ? 'AND p.id = :partId' : ''}
      ORDER BY p.number`,
    { type: QueryTypes.SELECT, replacements: { supplierId, partId: query.partId, ...periodReplacements(period) } },
  );
  if (query.partId && rows.length === 0) throw notFound('Part ordered from this supplier');
  const counts = rows.map(countsOf);
  const parts = rows.map((r, i) => {
    const state = r.switching as SwitchingState | null;
    return {
      part: { id: Number(r.id), number: String(r.number), description: String(r.description) },
      figures: figuresOf(counts[i]),
      switching: state ? { phase: switchingPhaseOf(state), consecutiveAccepted: state.consecutiveAccepted } : null,
    };
  });
  return {
    supplier: {
      id: supplier.id,
      name: supplier.name,
      active: supplier.active,
      owner: supplier.owner_id ? { id: supplier.owner_id, name: supplier.owner_name! } : null,
    },
    part: query.partId ? parts[0].part : null,
    period,
    figures: figuresOf(addCounts(counts)),
    parts,
    alarms: await alarmsOf(supplierId, period, query.partId),
  };
}
