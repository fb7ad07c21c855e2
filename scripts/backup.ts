// `npm run backup [-- --out FILE]`: the database and the files its rows name, in one archive
// (scripts/lib/backup.ts); prints the archive's path. Without DATABASE_URL it backs up `npm start`'s
// database, starting the project's cluster for the while if it is not running.
import { join, resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { PROJECT_DATABASE, useProjectDatabase } from './lib/postgres';

const { values } = parseArgs({ options: { out: { type: 'string' } } });
const cluster = process.env.DATABASE_URL ? null : await useProjectDatabase(PROJECT_DATABASE.port, PROJECT_DATABASE.name);

// Imported only now, so that they read the environment set above.
const { config } = await import('../server/config');
const { blobStore } = await import('../server/storage/blobs');
const { createBackup } = await import('./lib/backup');

const stamp = new Date().toISOString().replace(/[:.]/g, '-');
const file = resolve(values.out ?? join(import.meta.dirname, '..', '.data', 'backups', `phaselot-${stamp}.zip`));
try {
  const manifest = await createBackup({ ownerUrl: config.MIGRATION_DATABASE_URL, store: blobStore, file });
  console.log(
    `database ${manifest.database.name} (PostgreSQL ${manifest.database.serverVersion}, ${manifest.database.bytes} bytes dumped) and ${manifest.files.count} stored file(s) from the ${manifest.files.store}`,
  );
  console.log(file);
} catch (error) {
  console.error(`backup failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exitCode = 1;
} finally {
  cluster?.stop();
}
