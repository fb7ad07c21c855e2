// Re-computes the audit chain inside PostgreSQL and reports the first rows where it breaks: a row
// whose content no longer matches its digest, whose link does not point at the row before it in
// chain order, or that follows a gap; and a head that does not name the last row (rows cut off the
// end). Everything is read from one snapshot, so writers running meanwhile never look like a break.
import { QueryTypes, Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { config } from '../config';
import type { AuditAnchor, AuditAnchorCheck, AuditChainHead, AuditChainReport } from '../../shared/schemas/audit';

const MAX_PROBLEMS = 50;

/** The last link of the chain: the number of events so far and the hash an outside copy can anchor. */
export async function chainHead(transaction?: Transaction): Promise<AuditChainHead> {
  const [head] = await sequelize.query<{ seq: string; hash: string | null; occurred_at: Date | null }>(
    `SELECT h.seq, h.hash, e.occurred_at FROM audit_chain_head h LEFT JOIN audit_events e ON e.seq = h.seq`,
    { type: QueryTypes.SELECT, transaction },
  );
  return { seq: String(head.seq), hash: head.hash, occurredAt: head.occurred_at?.toISOString() ?? null };
}

async function verifyIn(transaction: Transaction): Promise<AuditChainReport> {
  // Every event is read and hashed again: longer than a request's statements are allowed.
  await sequelize.query(`SET LOCAL statement_timeout = ${config.LONG_STATEMENT_TIMEOUT_SECONDS * 1000}`, { transaction });
  const [{ checked, last_seq, last_hash }] = await sequelize.query<{ checked: string; last_seq: string | null; last_hash: string | null }>(
    `SELECT count(*) AS checked, max(seq) AS last_seq, (SELECT hash FROM audit_events ORDER BY seq DESC LIMIT 1) AS last_hash FROM audit_events`,
    { type: QueryTypes.SELECT, transaction },
  );
  const broken = await sequelize.query<{ id: string; seq: string; content_ok: boolean; link_ok: boolean; in_place: boolean }>(
    `SELECT id, seq, content_ok, link_ok, in_place FROM (
       SELECT id, seq,
              audit_event_digest(prev_hash, a) = hash AS content_ok,
              prev_hash IS NOT DISTINCT FROM lag(hash) OVER chain AS link_ok,
              seq = coalesce(lag(seq) OVER chain, 0) + 1 AS in_place
       FROM audit_events a
       WINDOW chain AS (ORDER BY seq)
     ) checked
     WHERE NOT (content_ok AND link_ok AND in_place)
     ORDER BY seq LIMIT ${MAX_PROBLEMS}`,
    { type: QueryTypes.SELECT, transaction },
  );
  const problems: AuditChainReport['problems'] = broken.map((row) => ({
    id: row.id,
    seq: row.seq,
    problem: !row.content_ok ? 'content changed' : !row.in_place ? 'rows missing before it' : 'link broken',
  }));
  const head = await chainHead(transaction);
  if (head.seq !== String(last_seq ?? 0) || head.hash !== last_hash) {
    problems.push({ id: null, seq: head.seq, problem: 'head does not name the last row' });
  }
  return { intact: problems.length === 0, checked: Number(checked), head, problems: problems.slice(0, MAX_PROBLEMS) };
}

export function verifyAuditChain(transaction?: Transaction): Promise<AuditChainReport> {
  if (transaction) return verifyIn(transaction);
  return sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ, readOnly: true }, verifyIn);
}

/** Whether the row at an anchored position still carries the anchored hash. With an intact chain,
 * a match means nothing up to that position has changed since the anchor was taken. */
export async function checkAnchor(anchor: AuditAnchor): Promise<AuditAnchorCheck> {
  const [row] = await sequelize.query<{ hash: string }>('SELECT hash FROM audit_events WHERE seq = :seq', {
    type: QueryTypes.SELECT,
    replacements: { seq: anchor.seq },
  });
  const seq = String(anchor.seq);
  if (!row) return { seq, matches: false, message: `The trail has no event at position ${seq}: events have been removed, or the anchor is from another site.` };
  if (row.hash !== anchor.hash)
    return { seq, matches: false, message: `The event at position ${seq} carries another hash: the trail up to there has changed since the anchor was taken.` };
  return {
    seq,
    matches: true,
    message: `The event at position ${seq} carries the anchored hash: if the chain verifies, nothing up to there has changed since.`,
  };
}

/** Re-checks only the newest `rows` links of the chain (content, link and numbering) and that the head
 * names the last row: cheap enough for a dashboard; the full check is verifyAuditChain. */
export async function checkChainTail(rows: number): Promise<{ head: AuditChainHead; checked: number; intact: boolean }> {
  return sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ, readOnly: true }, async (transaction) => {
    const head = await chainHead(transaction);
    const [tail] = await sequelize.query<{ checked: string; intact: boolean; last_seq: string | null }>(
      `SELECT count(*) AS checked, max(seq) AS last_seq,
              coalesce(bool_and(content_ok AND (prev_seq IS NULL OR (link_ok AND seq = prev_seq + 1))), true) AS intact
         FROM (SELECT seq, audit_event_digest(prev_hash, a) = hash AS content_ok,
                      prev_hash IS NOT DISTINCT FROM lag(hash) OVER chain AS link_ok, lag(seq) OVER chain AS prev_seq
                 FROM audit_events a WHERE seq > :from WINDOW chain AS (ORDER BY seq)) t`,
      { type: QueryTypes.SELECT, transaction, replacements: { from: Number(head.seq) - rows } },
    );
    return { head, checked: Number(tail.checked), intact: tail.intact && String(tail.last_seq ?? 0) === head.seq };
  });
}
