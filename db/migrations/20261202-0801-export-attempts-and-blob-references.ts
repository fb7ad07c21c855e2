// Exports become queue jobs: a job row names its queue job and the try that is building it, so only
// that try's progress and result count. Exports left unfinished by the in-process builder of before
// can never finish now: they are closed as failed. Indexes let the orphan sweep look blob keys up.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE export_jobs
      ADD COLUMN queue_job_id uuid,
      ADD COLUMN attempt integer NOT NULL DEFAULT 0 CHECK (attempt >= 0);
    UPDATE export_jobs SET status = 'failed', error = 'The server restarted before this export was finished. Start it again.', finished_at = now()
      WHERE status IN ('queued', 'running');
    CREATE INDEX export_jobs_storage_key ON export_jobs (storage_key) WHERE storage_key IS NOT NULL;
    CREATE INDEX measurement_files_storage_key ON measurement_files (storage_key);
    CREATE INDEX lot_documents_storage_key ON lot_documents (storage_key);
    CREATE INDEX attachments_sha256 ON attachments (sha256);
    CREATE INDEX mail_outbox_attachments ON mail_outbox USING gin (attachments jsonb_path_ops);
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    DROP INDEX mail_outbox_attachments, attachments_sha256, lot_documents_storage_key, measurement_files_storage_key, export_jobs_storage_key;
    ALTER TABLE export_jobs DROP COLUMN attempt, DROP COLUMN queue_job_id;
  `);
};
