// Reading corrective-action requests: the list (overdue computed in SQL so it filters and sorts) and
// one request with its NCRs, links, answers and their files, and the lots checked or checkable.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { CorrectiveAction, CorrectiveActionAttachment } from '../../db/models';
import type { CarListQuery, CarResponseView, CarRow, CarStatus, CarView } from '../../shared/schemas/correctiveActions';
import { filterWhen, type ListDefinition } from '../http/list';
import { notFound } from '../http/errors';
import { laterLots } from './correctiveActions';

const OVERDUE = `(ca.status = 'awaiting-response' AND ca.response_due_on < (now() AT TIME ZONE 'UTC')::date)`;

const FROM = `corrective_actions ca
  JOIN suppliers s ON s.id = ca.supplier_id
  JOIN parts p ON p.id = ca.part_id
  CROSS JOIN LATERAL (SELECT coalesce(array_agg(n.number ORDER BY n.number), '{}') AS ncrs FROM corrective_action_nonconformances c JOIN nonconformances n ON n.id = c.nonconformance_id WHERE c.corrective_action_id = ca.id) linked
  CROSS JOIN LATERAL (SELECT count(*)::int AS responses FROM corrective_action_responses r WHERE r.corrective_action_id = ca.id) answered`;

const SELECT = `ca.id, ca.number, ca.status, to_char(ca.response_due_on, 'YYYY-MM-DD') AS "responseDueOn", ca.requested_at AS "requestedAt", ${OVERDUE} AS overdue,
  s.id AS "supplierId", s.name AS "supplierName", p.id AS "partId", p.number AS "partNumber", p.description AS "partDescription", linked.ncrs, answered.responses`;

function presentRow(r: Record<string, unknown>): CarRow {
  return {
    id: Number(r.id),
    number: String(r.number),
    supplier: { id: Number(r.supplierId), name: String(r.supplierName) },
    part: { id: Number(r.partId), number: String(r.partNumber) },
    status: r.status as CarStatus,
    ncrs: r.ncrs as string[],
    responseDueOn: String(r.responseDueOn),
    overdue: Boolean(r.overdue),
    requestedAt: (r.requestedAt as Date).toISOString(),
    responses: Number(r.responses),
  };
}

export const correctiveActionList: ListDefinition<CarRow, CarListQuery> = {
  select: SELECT,
  from: FROM,
  sortable: {
    number: 'ca.number',
    supplier: 's.name',
    part: 'p.number',
    status: 'ca.status',
    responseDueOn: 'ca.response_due_on',
    requestedAt: 'ca.requested_at',
  },
  defaultSort: '-requestedAt',
  tieBreaker: 'ca.id',
  search: ['ca.number', 's.name', 'p.number', 'ca.problem', `array_to_string(linked.ncrs, ' ') ILIKE :q`],
  filters: (query) => {
    const filters = { clauses: [] as string[], replacements: {} };
    filterWhen(filters, query.supplierId, 'ca.supplier_id = :supplierId', 'supplierId');
    filterWhen(filters, query.partId, 'ca.part_id = :partId', 'partId');
    filterWhen(filters, query.status, 'ca.status = :status', 'status');
    if (query.overdue) filters.clauses.push(query.overdue === 'true' ? OVERDUE : `NOT ${OVERDUE}`);
    return filters;
  },
  present: presentRow,
  csv: {
    filename: 'corrective-actions',
    columns: [
      { header: 'number', value: (c) => c.number },
      { header: 'supplier', value: (c) => c.supplier.name },
      { header: 'part', value: (c) => c.part.number },
      { header: 'ncrs', value: (c) => c.ncrs.join(' ') },
      { header: 'status', value: (c) => c.status },
      { header: 'response_due_on', value: (c) => c.responseDueOn },
      { header: 'overdue', value: (c) => c.overdue },
      { header: 'answers', value: (c) => c.responses },
      { header: 'requested_at', value: (c) => c.requestedAt },
    ],
  },
};

type Named = { name: string | null };
const iso = (d: Date | null) => d?.toISOString() ?? null;

export async function correctiveActionView(id: number): Promise<CarView> {
  const [row] = await sequelize.query<Record<string, unknown>>(`SELECT ${SELECT}, ca.problem, ca.sent_to AS "sentTo" FROM ${FROM} WHERE ca.id = :id`, {
    type: QueryTypes.SELECT,
    replacements: { id },
  });
  if (!row) throw notFound('Corrective-action request');
  const car = await CorrectiveAction.findByPk(id, { rejectOnEmpty: true });
  const nameOf = async (userId: number | null) =>
    userId === null
      ? null
      : ((await sequelize.query<Named>('SELECT name FROM users WHERE id = :userId', { type: QueryTypes.SELECT, replacements: { userId } }))[0]?.name ?? null);
  const nonconformances = await sequelize.query<{ id: number; number: string; lotId: number | null; description: string }>(
    `SELECT n.id, n.number, n.lot_id AS "lotId", n.description FROM corrective_action_nonconformances c JOIN nonconformances n ON n.id = c.nonconformance_id
      WHERE c.corrective_action_id = :id ORDER BY n.number`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  const links = await sequelize.query<{ id: number; issuedAt: Date; expiresAt: Date; revokedAt: Date | null; submittedAt: Date | null }>(
    `SELECT id, issued_at AS "issuedAt", expires_at AS "expiresAt", revoked_at AS "revokedAt", submitted_at AS "submittedAt" FROM corrective_action_links
      WHERE corrective_action_id = :id ORDER BY issued_at, id`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  const responses = await sequelize.query<Omit<CarResponseView, 'attachments' | 'submittedAt' | 'reviewedAt'> & { submittedAt: Date; reviewedAt: Date | null }>(
    `SELECT r.id, r.responder_name AS "responderName", r.root_cause AS "rootCause", r.containment, r.corrective_actions AS "correctiveActions",
            r.preventive_actions AS "preventiveActions", to_char(r.containment_on, 'YYYY-MM-DD') AS "containmentOn", to_char(r.corrective_due_on, 'YYYY-MM-DD') AS "correctiveDueOn",
            to_char(r.preventive_due_on, 'YYYY-MM-DD') AS "preventiveDueOn", r.submitted_at AS "submittedAt", r.address, r.review, u.name AS "reviewedBy",
            r.reviewed_at AS "reviewedAt", r.review_note AS "reviewNote"
       FROM corrective_action_responses r LEFT JOIN users u ON u.id = r.reviewed_by WHERE r.corrective_action_id = :id ORDER BY r.submitted_at DESC, r.id DESC`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  const files = await CorrectiveActionAttachment.findAll({ where: { responseId: responses.map((r) => r.id) }, order: [['id', 'ASC']] });
  const checked = await sequelize.query<{ id: number; supplierLot: string; decision: string | null }>(
    `SELECT l.id, l.supplier_lot AS "supplierLot", d.decision FROM corrective_action_checked_lots c JOIN lots l ON l.id = c.lot_id
       LEFT JOIN dispositions d ON d.lot_id = l.id AND d.superseded_at IS NULL WHERE c.corrective_action_id = :id ORDER BY l.id`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  const now = Date.now();
  return {
    ...presentRow(row),
    part: { id: Number(row.partId), number: String(row.partNumber), description: String(row.partDescription) },
    problem: String(row.problem),
    sentTo: String(row.sentTo),
    requestedBy: await nameOf(car.requestedBy),
    nonconformances,
    links: links.map((l) => ({
      id: l.id,
      issuedAt: l.issuedAt.toISOString(),
      expiresAt: l.expiresAt.toISOString(),
      revokedAt: iso(l.revokedAt),
      submittedAt: iso(l.submittedAt),
      live: !l.revokedAt && !l.submittedAt && l.expiresAt.getTime() > now,
    })),
    responseHistory: responses.map((r) => ({
      ...r,
      submittedAt: r.submittedAt.toISOString(),
      reviewedAt: iso(r.reviewedAt),
      attachments: files.filter((f) => f.responseId === r.id).map((f) => ({ id: f.id, name: f.name, mediaType: f.mediaType, size: f.size })),
    })),
    acceptedBy: await nameOf(car.acceptedBy),
    acceptedAt: iso(car.acceptedAt),
    closedBy: await nameOf(car.closedBy),
    closedAt: iso(car.closedAt),
    effectivenessNote: car.effectivenessNote,
    checkedLots: checked,
    laterLots: (await laterLots(car)).map((l) => ({ ...l, receivedAt: l.receivedAt.toISOString() })),
  };
}

/** A file of a supplier's answer: its name, type and stored key. */
export async function responseAttachment(requestId: number, attachmentId: number) {
  const [file] = await sequelize.query<{ name: string; mediaType: string; storageKey: string }>(
    `SELECT a.name, a.media_type AS "mediaType", a.storage_key AS "storageKey" FROM corrective_action_attachments a
       JOIN corrective_action_responses r ON r.id = a.response_id WHERE a.id = :attachmentId AND r.corrective_action_id = :requestId`,
    { type: QueryTypes.SELECT, replacements: { requestId, attachmentId } },
  );
  if (!file) throw notFound('File');
  return file;
}
