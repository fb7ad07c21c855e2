// Reading the deviation register: the list (with each entry's standing computed in SQL, so it can be
// filtered and sorted) and one entry with its approvals and uses.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import type { DeviationListQuery, DeviationRow, DeviationStatus, DeviationView } from '../../shared/schemas/deviations';
import { filterWhen, type ListDefinition } from '../http/list';
import { notFound } from '../http/errors';

const FROM = `deviations dv
  JOIN suppliers s ON s.id = dv.supplier_id
  JOIN parts p ON p.id = dv.part_id
  CROSS JOIN LATERAL (SELECT coalesce(sum(u.quantity), 0)::int AS used FROM deviation_uses u WHERE u.deviation_id = dv.id AND u.released_at IS NULL) uses
  CROSS JOIN LATERAL (SELECT count(*)::int AS signed FROM deviation_approvals a WHERE a.deviation_id = dv.id) approvals`;

/** The standing of an entry today (UTC), in the order the checks of a use apply. */
const STATUS = `CASE
  WHEN dv.recorded_before_register THEN 'earlier'
  WHEN dv.withdrawn_at IS NOT NULL THEN 'withdrawn'
  WHEN approvals.signed < 2 THEN 'awaiting-approval'
  WHEN dv.expires_on < (now() AT TIME ZONE 'UTC')::date THEN 'expired'
  WHEN uses.used >= dv.quantity_limit THEN 'exhausted'
  ELSE 'current' END`;

const SELECT = `dv.id, dv.number, dv.allowed, dv.retardance_tol_waves AS "retardanceTolWaves", dv.axis_tol_deg AS "axisTolDeg",
  dv.quantity_limit AS "quantityLimit", to_char(dv.expires_on, 'YYYY-MM-DD') AS "expiresOn", uses.used AS "quantityUsed", approvals.signed AS approvals,
  s.id AS "supplierId", s.name AS "supplierName", p.id AS "partId", p.number AS "partNumber", p.description AS "partDescription", ${STATUS} AS status`;

const numberOrNull = (value: unknown) => (value === null || value === undefined ? null : Number(value));

function presentRow(r: Record<string, unknown>): DeviationRow {
  const limit = numberOrNull(r.quantityLimit);
  const used = Number(r.quantityUsed);
  return {
    id: Number(r.id),
    number: String(r.number),
    supplier: { id: Number(r.supplierId), name: String(r.supplierName) },
    part: { id: Number(r.partId), number: String(r.partNumber) },
    allowed: String(r.allowed),
    retardanceTolWaves: numberOrNull(r.retardanceTolWaves),
    axisTolDeg: numberOrNull(r.axisTolDeg),
    quantityLimit: limit,
    quantityUsed: used,
    quantityLeft: limit === null ? null : Math.max(0, limit - used),
    expiresOn: (r.expiresOn as string | null) ?? null,
    approvals: Number(r.approvals),
    status: r.status as DeviationStatus,
  };
}

export const deviationList: ListDefinition<DeviationRow, DeviationListQuery> = {
  select: SELECT,
  from: FROM,
  sortable: {
    number: 'dv.number',
    supplier: 's.name',
    part: 'p.number',
    expiresOn: 'dv.expires_on',
    quantityLeft: '(dv.quantity_limit - uses.used)',
    status: 'status',
    createdAt: 'dv.created_at',
  },
  defaultSort: '-createdAt',
  tieBreaker: 'dv.id',
  search: ['dv.number', 's.name', 'p.number', 'dv.allowed'],
  filters: (query) => {
    const filters = { clauses: [], replacements: {} };
    filterWhen(filters, query.supplierId, 'dv.supplier_id = :supplierId', 'supplierId');
    filterWhen(filters, query.partId, 'dv.part_id = :partId', 'partId');
    return filterWhen(filters, query.status, `${STATUS} = :status`, 'status');
  },
  present: presentRow,
  csv: {
    filename: 'deviations',
    columns: [
      { header: 'number', value: (d) => d.number },
      { header: 'supplier', value: (d) => d.supplier.name },
      { header: 'part', value: (d) => d.part.number },
      { header: 'allowed', value: (d) => d.allowed },
      { header: 'retardance_tolerance_waves', value: (d) => d.retardanceTolWaves },
      { header: 'axis_tolerance_deg', value: (d) => d.axisTolDeg },
      { header: 'quantity_limit', value: (d) => d.quantityLimit },
      { header: 'quantity_used', value: (d) => d.quantityUsed },
      { header: 'expires_on', value: (d) => d.expiresOn },
      { header: 'approvals', value: (d) => d.approvals },
      { header: 'status', value: (d) => d.status },
    ],
  },
};

export async function deviationView(id: number): Promise<DeviationView> {
  const [row] = await sequelize.query<Record<string, unknown>>(
    `SELECT ${SELECT}, dv.recorded_before_register AS "recordedBeforeRegister", dv.created_at AS "createdAt", creator.name AS "createdBy",
            dv.withdrawn_at AS "withdrawnAt", withdrawer.name AS "withdrawnBy", dv.withdrawal_reason AS "withdrawalReason"
       FROM ${FROM} LEFT JOIN users creator ON creator.id = dv.created_by LEFT JOIN users withdrawer ON withdrawer.id = dv.withdrawn_by
      WHERE dv.id = :id`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  if (!row) throw notFound('Deviation');
  const approvals = await sequelize.query<{ slot: 'quality' | 'second'; approver: string; meaning: string; signedAt: Date }>(
    `SELECT a.slot, u.name AS approver, a.meaning, a.signed_at AS "signedAt" FROM deviation_approvals a JOIN users u ON u.id = a.approver_id
      WHERE a.deviation_id = :id ORDER BY a.signed_at`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  const uses = await sequelize.query<{ lotId: number | null; ncr: boolean; quantity: number; usedAt: Date; releasedAt: Date | null }>(
    `SELECT lot_id AS "lotId", ncr_disposition_id IS NOT NULL AS ncr, quantity, used_at AS "usedAt", released_at AS "releasedAt"
       FROM deviation_uses WHERE deviation_id = :id ORDER BY used_at, id`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  return {
    ...presentRow(row),
    part: { id: Number(row.partId), number: String(row.partNumber), description: String(row.partDescription) },
    recordedBeforeRegister: Boolean(row.recordedBeforeRegister),
    createdBy: (row.createdBy as string | null) ?? null,
    createdAt: (row.createdAt as Date).toISOString(),
    withdrawn: row.withdrawnAt
      ? { at: (row.withdrawnAt as Date).toISOString(), by: (row.withdrawnBy as string | null) ?? null, reason: String(row.withdrawalReason) }
      : null,
    approvalsSigned: approvals.map((a) => ({ slot: a.slot, approver: a.approver, meaning: a.meaning, signedAt: a.signedAt.toISOString() })),
    uses: uses.map((u) => ({
      lotId: u.lotId,
      source: u.ncr ? 'nonconformance' : 'lot',
      quantity: u.quantity,
      usedAt: u.usedAt.toISOString(),
      releasedAt: u.releasedAt?.toISOString() ?? null,
    })),
  };
}
