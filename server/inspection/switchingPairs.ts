// What the switching screens read: the supplier-part pairs with their switching state, and one
// pair's state, counts, waiting lots and history.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import type { SwitchingPhase, SwitchingState } from '../../shared/sampling';
import type { SwitchingHistoryEntry, SwitchingListQuery, SwitchingRow, SwitchingView } from '../../shared/schemas/switching';
import { filterWhen, type ListDefinition } from '../http/list';
import { lotsWaitingForPlans, switchingStateOf } from './sampling';
import { supplierAndPart } from './switching';
import { readSiteSettings } from '../settings/siteSettings';

const PHASE = `CASE WHEN coalesce((ss.state->>'stopped')::boolean, false) THEN 'stopped' ELSE coalesce(ss.state->>'severity', 'normal') END`;

// Every pair that has received a lot or has a state, the initial state standing in for a missing one.
export const switchingList: ListDefinition<SwitchingRow, SwitchingListQuery> = {
  select: `pairs.supplier_id AS "supplierId", s.name AS "supplierName", pairs.part_id AS "partId", p.number AS "partNumber", p.description AS "partDescription",
    ${PHASE} AS phase,
    coalesce((ss.state->>'switchingScore')::int, 0) AS "switchingScore",
    coalesce((ss.state->>'consecutiveAccepted')::int, 0) AS "consecutiveAccepted",
    coalesce((ss.state->>'tightenedCount')::int, 0) AS "tightenedCount",
    (SELECT count(*) FROM lots l JOIN purchase_order_lines pol ON pol.id = l.po_line_id JOIN purchase_orders po ON po.id = pol.purchase_order_id
      WHERE po.supplier_id = pairs.supplier_id AND l.part_id = pairs.part_id AND l.state = 'quarantine'
        AND NOT EXISTS (SELECT 1 FROM lot_inspections li WHERE li.lot_id = l.id)) AS "waitingLots",
    (SELECT max(e.created_at) FROM switching_events e WHERE e.supplier_id = pairs.supplier_id AND e.part_id = pairs.part_id) AS "changedAt"`,
  from: `(SELECT po.supplier_id, l.part_id FROM lots l JOIN purchase_order_lines pol ON pol.id = l.po_line_id JOIN purchase_orders po ON po.id = pol.purchase_order_id
          UNION SELECT supplier_id, part_id FROM switching_states) pairs
    JOIN suppliers s ON s.id = pairs.supplier_id
    JOIN parts p ON p.id = pairs.part_id
    LEFT JOIN switching_states ss ON ss.supplier_id = pairs.supplier_id AND ss.part_id = pairs.part_id`,
  sortable: { supplierName: 's.name', partNumber: 'p.number', phase: PHASE, switchingScore: `coalesce((ss.state->>'switchingScore')::int, 0)` },
  defaultSort: 'supplierName',
  tieBreaker: 'p.number',
  search: ['s.name', 'p.number', 'p.description'],
  filters: (query) => {
    const filters = filterWhen({ clauses: [], replacements: {} }, query.supplierId, 'pairs.supplier_id = :supplierId', 'supplierId');
    filterWhen(filters, query.partId, 'pairs.part_id = :partId', 'partId');
    return filterWhen(filters, query.phase, `${PHASE} = :phase`, 'phase');
  },
  present: (r) => ({
    supplierId: Number(r.supplierId),
    supplierName: String(r.supplierName),
    partId: Number(r.partId),
    partNumber: String(r.partNumber),
    partDescription: String(r.partDescription),
    phase: r.phase as SwitchingPhase,
    switchingScore: Number(r.switchingScore),
    consecutiveAccepted: Number(r.consecutiveAccepted),
    tightenedCount: Number(r.tightenedCount),
    waitingLots: Number(r.waitingLots),
    changedAt: r.changedAt ? (r.changedAt as Date).toISOString() : null,
  }),
  csv: {
    filename: 'switching',
    columns: [
      { header: 'supplier', value: (r) => r.supplierName },
      { header: 'part_number', value: (r) => r.partNumber },
      { header: 'phase', value: (r) => r.phase },
      { header: 'switching_score', value: (r) => r.switchingScore },
      { header: 'consecutive_accepted', value: (r) => r.consecutiveAccepted },
      { header: 'not_accepted_on_tightened', value: (r) => r.tightenedCount },
      { header: 'lots_waiting', value: (r) => r.waitingLots },
      { header: 'changed_at', value: (r) => r.changedAt ?? '' },
    ],
  },
};

export type SwitchingEventRow = {
  id: number;
  kind: SwitchingHistoryEntry['kind'];
  position: number;
  lot_id: number | null;
  decision: string | null;
  result: { accepted: boolean; defectives: number; plan: { severity: string } } | null;
  severity: SwitchingHistoryEntry['severity'];
  reason: string | null;
  reference: string | null;
  corrective_action_id: number | null;
  by: string | null;
  before: SwitchingState;
  after: SwitchingState;
  explanation: string;
  created_at: Date;
  superseded_at: Date | null;
};

/** One pair: its names, state, the site's settings, lots waiting for a plan or a decision, and its history (newest first). */
export async function findSwitchingPair(supplierId: number, partId: number) {
  const names = await supplierAndPart(supplierId, partId);
  const [state, settings, waiting, open, events] = await Promise.all([
    switchingStateOf(supplierId, partId),
    readSiteSettings(),
    lotsWaitingForPlans(supplierId, partId),
    sequelize.query<{ id: number; supplier_lot: string; state: string; severity: SwitchingView['openLots'][number]['severity'] }>(
      `SELECT l.id, l.supplier_lot, l.state, li.severity FROM lots l JOIN lot_inspections li ON li.lot_id = l.id
         JOIN purchase_order_lines pol ON pol.id = l.po_line_id JOIN purchase_orders po ON po.id = pol.purchase_order_id
        WHERE po.supplier_id = :supplierId AND l.part_id = :partId AND NOT EXISTS (SELECT 1 FROM dispositions d WHERE d.lot_id = l.id)
        ORDER BY l.id`,
      { type: QueryTypes.SELECT, replacements: { supplierId, partId } },
    ),
    sequelize.query<SwitchingEventRow>(
      `SELECT e.id, e.kind, e.position, e.lot_id, d.decision, e.result, e.severity, e.reason, e.reference, e.corrective_action_id, u.name AS by, e.before, e.after,
              e.explanation, e.created_at, e.superseded_at
         FROM switching_events e LEFT JOIN dispositions d ON d.id = e.disposition_id LEFT JOIN users u ON u.id = e.actor_id
        WHERE e.supplier_id = :supplierId AND e.part_id = :partId ORDER BY e.id DESC`,
      { type: QueryTypes.SELECT, replacements: { supplierId, partId } },
    ),
  ]);
  return { supplierId, partId, names, state, settings, waiting, open, events };
}
export type SwitchingPairRecord = Awaited<ReturnType<typeof findSwitchingPair>>;
