// Files stored by a transaction that then rolled back, or by a process killed before it
// committed, are named by no row. The sweep (a scheduled job) deletes such files once they are
// older than the grace period; a file whose key a transaction holds right now is left alone.
import { QueryTypes } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { logger } from '../logger';
import { blobStore, tryHoldBlobKey } from './blobs';

/** Every place a row names a stored file. A new column that holds blob keys must be added here. */
export const BLOB_REFERENCES = [
  { table: 'measurement_files', column: 'storage_key' },
  { table: 'lot_documents', column: 'storage_key' },
  { table: 'export_jobs', column: 'storage_key' },
  { table: 'attachments', column: 'sha256' },
  { table: 'corrective_action_attachments', column: 'storage_key' },
  { table: 'instrument_calibrations', column: 'certificate_storage_key' },
  { table: 'mail_outbox', column: 'attachments', jsonKey: 'storageKey' },
] as const;

const referenced = (key: string) =>
  BLOB_REFERENCES.map((r) =>
    'jsonKey' in r
      ? `EXISTS (SELECT 1 FROM ${r.table} WHERE ${r.column} @> jsonb_build_array(jsonb_build_object('${r.jsonKey}', ${key})))`
      : `EXISTS (SELECT 1 FROM ${r.table} WHERE ${r.column} = ${key})`,
  ).join(' OR ');

const UNREFERENCED = `SELECT k.key FROM unnest(ARRAY[:keys]::text[]) AS k(key) WHERE NOT (${referenced('k.key')})`;
const IS_REFERENCED = `SELECT ${referenced(':key')} AS referenced`;

export const ORPHAN_GRACE_MS = 60 * 60_000;
const BATCH = 500;

/** Deletes stored files no row names that are older than `graceMs`; answers what it removed. */
export async function sweepOrphanBlobs({ graceMs = ORPHAN_GRACE_MS }: { graceMs?: number } = {}) {
  const before = new Date(Date.now() - graceMs);
  const removed: string[] = [];
  const leftovers = await blobStore.removeLeftovers(before);

  const sweepBatch = async (keys: string[]) => {
    const orphans = await sequelize.query<{ key: string }>(UNREFERENCED, { replacements: { keys }, type: QueryTypes.SELECT });
    for (const { key } of orphans) {
      // Checked again under the key's lock: a transaction may have committed a reference since.
      const gone = await inTransaction(async (transaction) => {
        if (!(await tryHoldBlobKey(key, transaction))) return false;
        const [{ referenced: stillNamed }] = await sequelize.query<{ referenced: boolean }>(IS_REFERENCED, {
          replacements: { key },
          type: QueryTypes.SELECT,
          transaction,
        });
        if (stillNamed) return false;
        await blobStore.remove(key);
        return true;
      });
      if (gone) removed.push(key);
    }
  };

  let batch: string[] = [];
  for await (const blob of blobStore.list()) {
    if (blob.modifiedAt >= before) continue;
    batch.push(blob.key);
    if (batch.length === BATCH) {
      await sweepBatch(batch);
      batch = [];
    }
  }
  if (batch.length) await sweepBatch(batch);
  if (removed.length || leftovers) logger.info({ removed: removed.length, leftovers, store: blobStore.location }, 'orphan files removed from the file store');
  return { removed, leftovers };
}
