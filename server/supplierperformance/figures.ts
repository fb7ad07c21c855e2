// The scorecard's figures as SQL, counted per supplier or per supplier-part over a period: lots
// received (by the shipment's arrival), decided and accepted under their current decision, pieces
// with a pass/fail verdict and those failing, lots with a due date and those on time; NCRs and
// corrective actions open now with their age in whole days. Rates are formed from the counts, so a
// supplier's figures are the sums of its parts'.
import type { OpenRecords, Period, ScorecardFigures } from '../../shared/schemas/supplierPerformance';

/** The replacements the figures' SQL names: the period as [start, end) instants in UTC. */
export const periodReplacements = (period: Period) => ({
  periodStart: `${period.from}T00:00:00Z`,
  periodEnd: new Date(Date.parse(`${period.to}T00:00:00Z`) + 86_400_000).toISOString(),
});

/** Pieces of lot `lot` with a current result of one of `verdicts` (a piece counts once over its wavelengths). */
const piecesWith = (lot: string, verdicts: string) =>
  `(SELECT count(DISTINCT r.piece_id) FROM pieces pc JOIN piece_results r ON r.piece_id = pc.id AND r.superseded_by_file_id IS NULL AND r.verdict IN (${verdicts})
     WHERE pc.lot_id = ${lot})`;

const ageDays = (since: string) => `floor(extract(epoch FROM now() - ${since}) / 86400)`;

/**
 * A LATERAL-ready subquery of the figures of the lots, NCRs and corrective actions `match` selects:
 * a condition on `po.supplier_id`/`l.part_id` for lots and on `x.supplier_id`/`x.part_id` for the
 * records (e.g. `{ lots: 'po.supplier_id = s.id', records: 'x.supplier_id = s.id' }`).
 */
export function figuresSql(match: { lots: string; records: string }) {
  return `(
    SELECT lf.*, nf.*, cf.* FROM
    (SELECT count(*) AS lots_received,
            count(pl.decision) AS lots_decided,
            count(*) FILTER (WHERE pl.decision = 'accept') AS lots_accepted,
            coalesce(sum(pl.inspected), 0) AS pieces_inspected,
            coalesce(sum(pl.nonconforming), 0) AS pieces_nonconforming,
            count(pl.due_on) AS lots_with_due_date,
            count(*) FILTER (WHERE pl.received_on <= pl.due_on) AS lots_on_time
       FROM (SELECT d.decision, pol.due_on, (sh.received_at AT TIME ZONE 'UTC')::date AS received_on,
                    ${piecesWith('l.id', "'pass', 'fail'")} AS inspected, ${piecesWith('l.id', "'fail'")} AS nonconforming
               FROM lots l
               JOIN shipments sh ON sh.id = l.shipment_id
               JOIN purchase_order_lines pol ON pol.id = l.po_line_id
               JOIN purchase_orders po ON po.id = pol.purchase_order_id
               LEFT JOIN dispositions d ON d.lot_id = l.id AND d.superseded_at IS NULL
              WHERE ${match.lots} AND sh.received_at >= :periodStart::timestamptz AND sh.received_at < :periodEnd::timestamptz) pl) lf,
    (SELECT count(*) FILTER (WHERE x.status <> 'closed') AS ncr_open,
            sum(${ageDays('x.opened_at')}) FILTER (WHERE x.status <> 'closed') AS ncr_open_days,
            max(${ageDays('x.opened_at')}) FILTER (WHERE x.status <> 'closed') AS ncr_oldest_days,
            count(*) FILTER (WHERE x.opened_at >= :periodStart::timestamptz AND x.opened_at < :periodEnd::timestamptz) AS ncr_opened
       FROM nonconformances x WHERE ${match.records}) nf,
    (SELECT count(*) FILTER (WHERE x.status <> 'closed') AS car_open,
            sum(${ageDays('x.requested_at')}) FILTER (WHERE x.status <> 'closed') AS car_open_days,
            max(${ageDays('x.requested_at')}) FILTER (WHERE x.status <> 'closed') AS car_oldest_days,
            count(*) FILTER (WHERE x.status = 'awaiting-response' AND x.response_due_on < current_date) AS car_overdue,
            count(*) FILTER (WHERE x.requested_at >= :periodStart::timestamptz AND x.requested_at < :periodEnd::timestamptz) AS car_requested
       FROM corrective_actions x WHERE ${match.records}) cf
  )`;
}

/** The counts of one group, as the database answered them (bigint and numeric come as text). */
export type FigureCounts = {
  lotsReceived: number;
  lotsDecided: number;
  lotsAccepted: number;
  piecesInspected: number;
  piecesNonconforming: number;
  lotsWithDueDate: number;
  lotsOnTime: number;
  ncrOpen: number;
  ncrOpenDays: number;
  ncrOldestDays: number | null;
  ncrOpened: number;
  carOpen: number;
  carOpenDays: number;
  carOldestDays: number | null;
  carOverdue: number;
  carRequested: number;
};

const count = (value: unknown) => Number(value ?? 0);
const maybe = (value: unknown) => (value === null || value === undefined ? null : Number(value));

export function countsOf(row: Record<string, unknown>): FigureCounts {
  return {
    lotsReceived: count(row.lots_received),
    lotsDecided: count(row.lots_decided),
    lotsAccepted: count(row.lots_accepted),
    piecesInspected: count(row.pieces_inspected),
    piecesNonconforming: count(row.pieces_nonconforming),
    lotsWithDueDate: count(row.lots_with_due_date),
    lotsOnTime: count(row.lots_on_time),
    ncrOpen: count(row.ncr_open),
    ncrOpenDays: count(row.ncr_open_days),
    ncrOldestDays: maybe(row.ncr_oldest_days),
    ncrOpened: count(row.ncr_opened),
    carOpen: count(row.car_open),
    carOpenDays: count(row.car_open_days),
    carOldestDays: maybe(row.car_oldest_days),
    carOverdue: count(row.car_overdue),
    carRequested: count(row.car_requested),
  };
}

/** The counts of several groups (a supplier's parts) as one. */
export function addCounts(groups: readonly FigureCounts[]): FigureCounts {
  const sum = (key: keyof FigureCounts) => groups.reduce((total, g) => total + (g[key] ?? 0), 0);
  const oldest = (key: 'ncrOldestDays' | 'carOldestDays') =>
    groups.reduce<number | null>((max, g) => (g[key] === null ? max : Math.max(max ?? 0, g[key]!)), null);
  return {
    lotsReceived: sum('lotsReceived'),
    lotsDecided: sum('lotsDecided'),
    lotsAccepted: sum('lotsAccepted'),
    piecesInspected: sum('piecesInspected'),
    piecesNonconforming: sum('piecesNonconforming'),
    lotsWithDueDate: sum('lotsWithDueDate'),
    lotsOnTime: sum('lotsOnTime'),
    ncrOpen: sum('ncrOpen'),
    ncrOpenDays: sum('ncrOpenDays'),
    ncrOldestDays: oldest('ncrOldestDays'),
    ncrOpened: sum('ncrOpened'),
    carOpen: sum('carOpen'),
    carOpenDays: sum('carOpenDays'),
    carOldestDays: oldest('carOldestDays'),
    carOverdue: sum('carOverdue'),
    carRequested: sum('carRequested'),
  };
}

const ratio = (part: number, whole: number) => (whole > 0 ? part / whole : null);

function openRecords(open: number, days: number, oldest: number | null): OpenRecords {
  return { open, oldestOpenDays: open > 0 ? oldest : null, meanOpenDays: open > 0 ? Math.round((days / open) * 10) / 10 : null };
}

/** The scorecard's figures from the counts: rates only where there is something to divide by. */
export function figuresOf(c: FigureCounts): ScorecardFigures {
  const ppm = ratio(c.piecesNonconforming, c.piecesInspected);
  return {
    lotsReceived: c.lotsReceived,
    lotsDecided: c.lotsDecided,
    lotsAccepted: c.lotsAccepted,
    acceptanceRate: ratio(c.lotsAccepted, c.lotsDecided),
    piecesInspected: c.piecesInspected,
    piecesNonconforming: c.piecesNonconforming,
    ppm: ppm === null ? null : Math.round(ppm * 1_000_000),
    lotsWithDueDate: c.lotsWithDueDate,
    lotsOnTime: c.lotsOnTime,
    onTimeRate: ratio(c.lotsOnTime, c.lotsWithDueDate),
    ncrs: { ...openRecords(c.ncrOpen, c.ncrOpenDays, c.ncrOldestDays), openedInPeriod: c.ncrOpened },
    correctiveActions: { ...openRecords(c.carOpen, c.carOpenDays, c.carOldestDays), overdue: c.carOverdue, requestedInPeriod: c.carRequested },
  };
}
