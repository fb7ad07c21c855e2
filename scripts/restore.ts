// `npm run restore -- FILE [--database NAME] [--force]`: a backup made by `npm run backup` into the
// configured database (or the one named, created when missing) and the configured file store. The
// database must be empty unless --force, which first drops everything its owner role owns there.
// Without DATABASE_URL the target is `npm start`'s cluster.
import { parseArgs } from 'node:util';
import pg from 'pg';
import { ensureDatabase, PROJECT_DATABASE, useProjectDatabase } from './lib/postgres';

const usage = 'usage: npm run restore -- FILE [--database NAME] [--force]';
const { values, positionals } = parseArgs({ allowPositionals: true, options: { database: { type: 'string' }, force: { type: 'boolean', default: false } } });
if (positionals.length !== 1) {
  console.error(usage);
  process.exit(2);
}
const projectCluster = !process.env.DATABASE_URL;
const cluster = projectCluster ? await useProjectDatabase(PROJECT_DATABASE.port, PROJECT_DATABASE.name) : null;
if (projectCluster && values.database) await ensureDatabase(PROJECT_DATABASE.port, values.database);

const { config } = await import('../server/config');
const { blobStore } = await import('../server/storage/blobs');
const { restoreBackup } = await import('./lib/backup');

/** The same server and role, another database. */
function onDatabase(url: string, database: string | undefined) {
  if (!database) return url;
  const target = new URL(url);
  target.pathname = `/${encodeURIComponent(database)}`;
  return target.toString();
}

/** Others connected to the target (a running Phaselot) would see it change under them. */
async function otherSessions(url: string) {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const { rows } = await client.query<{ count: string }>(
      'SELECT count(*) FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid()',
    );
    return Number(rows[0].count);
  } finally {
    await client.end();
  }
}

const ownerUrl = onDatabase(config.MIGRATION_DATABASE_URL, values.database);
try {
  const others = await otherSessions(ownerUrl);
  if (others > 0) throw new Error(`${others} other connection(s) use the target database: stop Phaselot (and anything else using it) first`);
  const restored = await restoreBackup(positionals[0], {
    ownerUrl,
    appUrl: onDatabase(config.DATABASE_URL, values.database),
    store: blobStore,
    force: values.force,
  });
  const { manifest } = restored;
  console.log(
    `restored the backup of ${manifest.createdAt} (database ${manifest.database.name}) into ${new URL(ownerUrl).pathname.slice(1)}, and ${restored.files} stored file(s) into the ${blobStore.location}`,
  );
  if (restored.migrationsApplied.length) console.log(`applied ${restored.migrationsApplied.length} migration(s) newer than the backup`);
} catch (error) {
  console.error(`restore failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exitCode = 1;
} finally {
  cluster?.stop();
}
