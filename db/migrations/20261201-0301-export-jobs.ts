// Export bundles are built in the background; this table is their progress and, once done, points
// at the finished ZIP in the file store.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE export_jobs (
      id serial PRIMARY KEY,
      requested_by integer NOT NULL REFERENCES users (id),
      filter jsonb NOT NULL,
      status varchar(10) NOT NULL DEFAULT 'queued' CHECK (status IN ('queued', 'running', 'done', 'failed')),
      done integer NOT NULL DEFAULT 0 CHECK (done >= 0),
      total integer NOT NULL DEFAULT 0 CHECK (total >= 0),
      error text,
      storage_key varchar(64),
      size bigint,
      sha256 char(64),
      created_at timestamptz NOT NULL DEFAULT now(),
      finished_at timestamptz,
      CHECK (status <> 'done' OR (storage_key IS NOT NULL AND sha256 IS NOT NULL AND size IS NOT NULL)),
      CHECK (status <> 'failed' OR error IS NOT NULL)
    );
    CREATE INDEX export_jobs_recent ON export_jobs (requested_by, created_at DESC);
  `);
};

export const down: Migration = async ({ queryInterface }) => {
  await queryInterface.dropTable('export_jobs');
};
