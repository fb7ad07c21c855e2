// Re-computes the audit chain inside PostgreSQL and reports the first rows where it breaks: a row
// whose content no longer matches its digest, or whose link does not point at the row before it.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';

export type ChainReport = {
  intact: boolean;
  checked: number;
  problems: { id: string; problem: 'content changed' | 'link broken' }[];
};

export async function verifyAuditChain(): Promise<ChainReport> {
  const [{ checked }] = await sequelize.query<{ checked: string }>('SELECT count(*) AS checked FROM audit_events', { type: QueryTypes.SELECT });
  const broken = await sequelize.query<{ id: string; content_ok: boolean; link_ok: boolean }>(
    `SELECT id, content_ok, link_ok FROM (
       SELECT id,
              audit_event_digest(prev_hash, a) = hash AS content_ok,
              prev_hash IS NOT DISTINCT FROM lag(hash) OVER (ORDER BY id) AS link_ok
       FROM audit_events a
     ) chain
     WHERE NOT content_ok OR NOT link_ok
     ORDER BY id LIMIT 50`,
    { type: QueryTypes.SELECT },
  );
  return {
    intact: broken.length === 0,
    checked: Number(checked),
    problems: broken.map((row) => ({ id: row.id, problem: row.content_ok ? 'link broken' : 'content changed' })),
  };
}
