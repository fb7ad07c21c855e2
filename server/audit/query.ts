// Reading the trail: filtered, paged, or streamed whole for an export.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import type { AuditEventView, AuditQuery } from '../../shared/schemas/audit';
import { sortOf } from '../http/list';

type Filter = Omit<AuditQuery, 'page' | 'pageSize' | 'sort'> & { entityIds?: string[]; uptoSeq?: string };

function whereOf(filter: Filter) {
  const clauses: string[] = [];
  const replacements: Record<string, unknown> = {};
  if (filter.from) (clauses.push('occurred_at >= :from::date'), (replacements.from = filter.from));
  if (filter.to) (clauses.push("occurred_at < :to::date + interval '1 day'"), (replacements.to = filter.to));
  if (filter.action) (clauses.push('action LIKE :action'), (replacements.action = `${filter.action}%`));
  if (filter.entityType) (clauses.push('entity_type = :entityType'), (replacements.entityType = filter.entityType));
  if (filter.entityId) (clauses.push('entity_id = :entityId'), (replacements.entityId = filter.entityId));
  if (filter.entityIds) (clauses.push('entity_id IN (:entityIds)'), (replacements.entityIds = filter.entityIds.length ? filter.entityIds : ['']));
  if (filter.actor) (clauses.push('actor_email ILIKE :actor'), (replacements.actor = `%${filter.actor}%`));
  if (filter.q) (clauses.push('(action ILIKE :q OR entity_id ILIKE :q OR actor_email ILIKE :q)'), (replacements.q = `%${filter.q}%`));
  if (filter.uptoSeq) (clauses.push('seq <= :uptoSeq'), (replacements.uptoSeq = filter.uptoSeq));
  return { sql: clauses.length ? `WHERE ${clauses.join(' AND ')}` : '', replacements };
}

type Row = {
  id: string; seq: string; occurred_at: Date; actor_email: string | null; actor_roles: string[]; action: string; entity_type: string;
  entity_id: string | null; before: unknown; after: unknown; request_id: string | null; address: string | null; prev_hash: string | null; hash: string;
};

const present = (r: Row): AuditEventView => ({
  id: r.id, seq: r.seq, occurredAt: r.occurred_at.toISOString(), actorEmail: r.actor_email, actorRoles: r.actor_roles, action: r.action,
  entityType: r.entity_type, entityId: r.entity_id, before: r.before, after: r.after, requestId: r.request_id, address: r.address, prevHash: r.prev_hash, hash: r.hash,
});

export async function listAuditEvents(query: AuditQuery) {
  const { sql, replacements } = whereOf(query);
  // Chain order is the order events were recorded in.
  const { direction } = sortOf({ occurredAt: 'seq' }, query.sort || '-occurredAt');
  const [{ total }] = await sequelize.query<{ total: string }>(`SELECT count(*) AS total FROM audit_events ${sql}`, { type: QueryTypes.SELECT, replacements });
  const rows = await sequelize.query<Row>(`SELECT * FROM audit_events ${sql} ORDER BY seq ${direction} LIMIT :limit OFFSET :offset`, {
    type: QueryTypes.SELECT,
    replacements: { ...replacements, limit: query.pageSize, offset: (query.page - 1) * query.pageSize },
  });
  return { data: rows.map(present), total: Number(total) };
}

/** Every matching event in chain order, read in batches so an export never holds the trail in memory. */
export async function* streamAuditEvents(filter: Filter, batchSize = 1000): AsyncGenerator<AuditEventView> {
  const { sql, replacements } = whereOf(filter);
  let afterSeq = '0';
  for (;;) {
    const rows = await sequelize.query<Row>(
      `SELECT * FROM audit_events ${sql ? `${sql} AND` : 'WHERE'} seq > :afterSeq ORDER BY seq LIMIT :batchSize`,
      { type: QueryTypes.SELECT, replacements: { ...replacements, afterSeq, batchSize } },
    );
    for (const row of rows) yield present(row);
    if (rows.length < batchSize) return;
    afterSeq = rows[rows.length - 1].seq;
  }
}

export const AUDIT_CSV_COLUMNS = [
  { header: 'seq', value: (e: AuditEventView) => e.seq },
  { header: 'id', value: (e: AuditEventView) => e.id },
  { header: 'occurred_at', value: (e: AuditEventView) => e.occurredAt },
  { header: 'actor', value: (e: AuditEventView) => e.actorEmail },
  { header: 'roles', value: (e: AuditEventView) => e.actorRoles.join(' ') },
  { header: 'action', value: (e: AuditEventView) => e.action },
  { header: 'entity_type', value: (e: AuditEventView) => e.entityType },
  { header: 'entity_id', value: (e: AuditEventView) => e.entityId },
  { header: 'before', value: (e: AuditEventView) => e.before },
  { header: 'after', value: (e: AuditEventView) => e.after },
  { header: 'request_id', value: (e: AuditEventView) => e.requestId },
  { header: 'address', value: (e: AuditEventView) => e.address },
  { header: 'prev_hash', value: (e: AuditEventView) => e.prevHash },
  { header: 'hash', value: (e: AuditEventView) => e.hash },
];
