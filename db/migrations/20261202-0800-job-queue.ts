// The job queue's own schema (pg-boss 10) and Phaselot's queues with their retry policies, made
// here by the role that runs migrations, so that at run time the application only reads and writes
// rows in it (the migrator grants the application's role the rows of every schema the owner has, this
// one included). A later pg-boss upgrade that changes its schema comes as its own migration
// (PgBoss.getMigrationPlans).
import PgBoss from 'pg-boss';
import type { Migration } from '../migrator';

const SCHEMA = 'pgboss';

// retryDelay in seconds; with retryBackoff the delay doubles each try. expireInSeconds: an active
// job older than this is taken for dead (its process gone) and failed, then retried.
const QUEUES: [string, Record<string, unknown>][] = [
  // pg-boss's own queue for the occurrences of scheduled jobs.
  ['__pgboss__send-it', { policy: 'standard' }],
  ['export-build-failed', { policy: 'standard', retryLimit: 3, retryDelay: 30 }],
  ['export-build', { policy: 'standard', retryLimit: 2, retryDelay: 10, retryBackoff: false, expireInSeconds: 900, deadLetter: 'export-build-failed' }],
  ['mail-deliver', { policy: 'standard', retryLimit: 3, retryDelay: 5, retryBackoff: true, expireInSeconds: 300 }],
  // Sweeps run one at a time; a missed one simply waits for the next occurrence.
  ['mail-sweep', { policy: 'singleton', retryLimit: 0, expireInSeconds: 600 }],
  ['blob-sweep', { policy: 'singleton', retryLimit: 0, expireInSeconds: 3600 }],
];

export const up: Migration = async ({ sequelize }) => {
  // The plans are one locked script (BEGIN … COMMIT) of CREATE SCHEMA, tables and functions.
  await sequelize.query(PgBoss.getConstructionPlans(SCHEMA));
  for (const [name, options] of QUEUES) {
    await sequelize.query(`SELECT ${SCHEMA}.create_queue(:name, CAST(:options AS json))`, { replacements: { name, options: JSON.stringify(options) } });
  }
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`DROP SCHEMA ${SCHEMA} CASCADE`);
};
