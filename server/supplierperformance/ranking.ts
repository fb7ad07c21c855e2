// The ranked list of suppliers over a period: the scorecard's figures per supplier, ranked by lot
// acceptance rate, then nonconforming pieces per million, then on-time delivery. Suppliers without a
// decided lot in the period are listed (when active or with lots received) but not ranked.
import { resolvePeriod, type SupplierRankingQuery, type SupplierRankingRow } from '../../shared/schemas/supplierPerformance';
import type { ListDefinition } from '../http/list';
import { figuresSql, periodReplacements } from './figures';

const rates = `(SELECT s.id, s.name, s.active, f.*,
      f.lots_accepted::float8 / nullif(f.lots_decided, 0) AS acceptance,
      f.pieces_nonconforming * 1000000.0 / nullif(f.pieces_inspected, 0) AS ppm,
      f.lots_on_time::float8 / nullif(f.lots_with_due_date, 0) AS on_time,
      (SELECT count(*) FROM drift_alarms a WHERE a.supplier_id = s.id AND a.raised_at >= :periodStart::timestamptz AND a.raised_at < :periodEnd::timestamptz) AS alarms
    FROM suppliers s CROSS JOIN LATERAL ${figuresSql({ lots: 'po.supplier_id = s.id', records: 'x.supplier_id = s.id' })} f)`;

const nullableNumber = (value: unknown) => (value === null || value === undefined ? null : Number(value));

export const supplierRanking: ListDefinition<SupplierRankingRow, SupplierRankingQuery> = {
  select: `ranked.*, :from AS period_from, :to AS period_to`,
  from: `(SELECT r.*, CASE WHEN r.lots_decided > 0 THEN rank() OVER (PARTITION BY r.lots_decided > 0 ORDER BY r.acceptance DESC, r.ppm ASC NULLS LAST, r.on_time DESC NULLS LAST) END AS rank
            FROM ${rates} r WHERE r.active OR r.lots_received > 0) ranked`,
  sortable: {
    rank: 'ranked.rank',
    name: 'ranked.name',
    lotsReceived: 'ranked.lots_received',
    acceptanceRate: 'ranked.acceptance',
    ppm: 'ranked.ppm',
    onTimeRate: 'ranked.on_time',
    openNcrs: 'ranked.ncr_open',
    openCorrectiveActions: 'ranked.car_open',
    alarms: 'ranked.alarms',
  },
  defaultSort: 'rank',
  tieBreaker: 'ranked.id',
  search: ['ranked.name'],
  filters: (query) => {
    const period = resolvePeriod(query);
    return { clauses: [], replacements: { ...periodReplacements(period), from: period.from, to: period.to } };
  },
  present: (r) => ({
    rank: nullableNumber(r.rank),
    supplier: { id: Number(r.id), name: String(r.name), active: Boolean(r.active) },
    lotsReceived: Number(r.lots_received),
    lotsDecided: Number(r.lots_decided),
    acceptanceRate: nullableNumber(r.acceptance),
    ppm: r.ppm === null ? null : Math.round(Number(r.ppm)),
    onTimeRate: nullableNumber(r.on_time),
    openNcrs: Number(r.ncr_open),
    openCorrectiveActions: Number(r.car_open),
    alarms: Number(r.alarms),
    period: { from: String(r.period_from), to: String(r.period_to) },
  }),
  csv: {
    filename: 'supplier-scorecards',
    columns: [
      { header: 'rank', value: (s) => s.rank },
      { header: 'supplier', value: (s) => s.supplier.name },
      { header: 'period_from', value: (s) => s.period.from },
      { header: 'period_to', value: (s) => s.period.to },
      { header: 'lots_received', value: (s) => s.lotsReceived },
      { header: 'lots_decided', value: (s) => s.lotsDecided },
      { header: 'lot_acceptance_rate', value: (s) => s.acceptanceRate },
      { header: 'nonconforming_ppm', value: (s) => s.ppm },
      { header: 'on_time_rate', value: (s) => s.onTimeRate },
      { header: 'open_ncrs', value: (s) => s.openNcrs },
      { header: 'open_corrective_actions', value: (s) => s.openCorrectiveActions },
      { header: 'drift_alarms', value: (s) => s.alarms },
    ],
  },
};
