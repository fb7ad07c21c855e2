// Reading the trail: filtered, paged, or streamed whole for an export.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import type { AuditChoicesView, AuditEventView, AuditQuery } from '../../shared/schemas/audit';
import { containing, filterWhen, sortOf, uncountedPage, type Filters, type ListPage } from '../http/list';

type Filter = Omit<AuditQuery, 'page' | 'pageSize' | 'sort' | 'count'> & { entityIds?: string[]; uptoSeq?: string };

function whereOf(filter: Filter) {
  const filters: Filters = { clauses: [], replacements: {} };
  filterWhen(filters, filter.from, 'occurred_at >= :from::date', 'from');
  filterWhen(filters, filter.to, "occurred_at < :to::date + interval '1 day'", 'to');
  filterWhen(filters, filter.action && `${filter.action}%`, 'action LIKE :action', 'action');
  filterWhen(filters, filter.entityType, 'entity_type = :entityType', 'entityType');
  filterWhen(filters, filter.entityId, 'entity_id = :entityId', 'entityId');
  filterWhen(filters, filter.entityIds && (filter.entityIds.length ? filter.entityIds : ['']), 'entity_id IN (:entityIds)', 'entityIds');
  filterWhen(filters, filter.actor && containing(filter.actor), 'actor_email ILIKE :actor', 'actor');
  filterWhen(filters, filter.q && containing(filter.q), '(action ILIKE :q OR entity_id ILIKE :q OR actor_email ILIKE :q)', 'q');
  filterWhen(filters, filter.uptoSeq, 'seq <= :uptoSeq', 'uptoSeq');
  return { sql: filters.clauses.length ? `WHERE ${filters.clauses.join(' AND ')}` : '', replacements: filters.replacements };
}

type Row = {
  id: string;
  seq: string;
  occurred_at: Date;
  actor_email: string | null;
  actor_roles: string[];
  action: string;
  entity_type: string;
  entity_id: string | null;
  before: unknown;
  after: unknown;
  request_id: string | null;
  address: string | null;
  prev_hash: string | null;
  hash: string;
};

const present = (r: Row): AuditEventView => ({
  id: r.id,
  seq: r.seq,
  occurredAt: r.occurred_at.toISOString(),
  actorEmail: r.actor_email,
  actorRoles: r.actor_roles,
  action: r.action,
  entityType: r.entity_type,
  entityId: r.entity_id,
  before: r.before,
  after: r.after,
  requestId: r.request_id,
  address: r.address,
  prevHash: r.prev_hash,
  hash: r.hash,
});

export async function listAuditEvents(query: AuditQuery): Promise<ListPage<AuditEventView>> {
  const { sql, replacements } = whereOf(query);
  // Chain order is the order events were recorded in.
  const { direction } = sortOf({ occurredAt: 'seq' }, query.sort || '-occurredAt');
  // The page's positions first, from the index of kind, position and time alone where the filter
  // allows; then those rows.
  const positions = `SELECT seq FROM audit_events ${sql} ORDER BY seq ${direction} LIMIT :limit OFFSET :offset`;
  const rows = await sequelize.query<Row>(`SELECT a.* FROM (${positions}) page JOIN audit_events a USING (seq) ORDER BY a.seq ${direction}`, {
    type: QueryTypes.SELECT,
    replacements: { ...replacements, limit: query.pageSize + 1, offset: (query.page - 1) * query.pageSize },
  });
  const events = rows.map(present);
  const page = uncountedPage(events, query);
  if (page) return page;
  const [{ total }] = await sequelize.query<{ total: string }>(`SELECT count(*) AS total FROM audit_events ${sql}`, { type: QueryTypes.SELECT, replacements });
  return { data: events.slice(0, query.pageSize), total: Number(total), totalExact: true, totals: {} };
}

/** Every matching event in chain order, read in batches so an export never holds the trail in memory. */
export async function* streamAuditEvents(filter: Filter, batchSize = 1000): AsyncGenerator<AuditEventView> {
  const { sql, replacements } = whereOf(filter);
  let afterSeq = '0';
  for (;;) {
    const rows = await sequelize.query<Row>(`SELECT * FROM audit_events ${sql ? `${sql} AND` : 'WHERE'} seq > :afterSeq ORDER BY seq LIMIT :batchSize`, {
      type: QueryTypes.SELECT,
      replacements: { ...replacements, afterSeq, batchSize },
    });
    for (const row of rows) yield present(row);
    if (rows.length < batchSize) return;
    afterSeq = rows[rows.length - 1].seq;
  }
}

/**
 * The record types on the trail, read by skipping through the index of (type, id) from one type to
 * the next (a few index probes however long the trail); and every user by name.
 */
export async function auditChoices(): Promise<AuditChoicesView> {
  const types = await sequelize.query<{ type: string }>(
    `WITH RECURSIVE types(type) AS (
       SELECT min(entity_type) FROM audit_events
       UNION ALL
       SELECT (SELECT min(entity_type) FROM audit_events WHERE entity_type > types.type) FROM types WHERE types.type IS NOT NULL
     )
     SELECT type FROM types WHERE type IS NOT NULL`,
    { type: QueryTypes.SELECT },
  );
  const actors = await sequelize.query<{ email: string; name: string }>('SELECT email, name FROM users ORDER BY name, email', { type: QueryTypes.SELECT });
  return { recordTypes: types.map((t) => t.type), actors };
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
