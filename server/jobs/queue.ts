// Background jobs on pg-boss, a PostgreSQL queue: a job is a row, queued in the transaction of the
// event that calls for it, taken by one server process at a time (SKIP LOCKED), retried with the
// queue's policy, and started again when its process dies (an active job that outlives its expiry
// is failed by the queue's maintenance and retried). The queue's schema and the queues with their
// retry policies are made by a migration, run as the owner role; at run time pg-boss only reads and
// writes rows (migrate: false), so the app role needs no right to create anything.
import PgBoss from 'pg-boss';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { config } from '../config';
import { logger } from '../logger';

export const QUEUE_SCHEMA = 'pgboss';

/** The queues the migrations create; `-failed` ones receive the jobs that failed for good. */
export const QUEUES = {
  exportBuild: 'export-build',
  exportFailed: 'export-build-failed',
  mailDeliver: 'mail-deliver',
  mailSweep: 'mail-sweep',
  blobSweep: 'blob-sweep',
  correctiveReminders: 'corrective-action-reminders',
  supplierDriftCheck: 'supplier-drift-check',
  calibrationReminders: 'calibration-reminders',
} as const;

export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

/** A failure that trying again cannot mend (a stored file that is missing or altered): the job ends at once. */
export class JobFailure extends Error {}

/** Which try this is: 0 for the first, then the queue's retry count. */
export type JobRun = { retryCount: number };

export type JobDefinition<T extends object = object> = {
  queue: QueueName;
  /** Does the work. Throwing retries it by the queue's policy; throwing JobFailure ends it. */
  run(data: T, job: JobRun): Promise<void>;
  /** Records a job that failed for good: a JobFailure, the last try's error, or killed on its last try. */
  failed?: { queue: QueueName; record(data: T, reason: string): Promise<void> };
  /** A cron expression (UTC) for scheduled work; one process sends each occurrence. */
  schedule?: string;
  /**
   * Jobs taken per fetch (1 by default). A worker waits for the polling interval after each fetch,
   * so one job a fetch drains a burst (a day's reminders, a run of rejections) at one job every 2 s.
   */
  batchSize?: number;
};

// pg-boss's words for a try cut off by expiry or by its process stopping.
const CUT_OFF = ['job failed by timeout in active state', 'pg-boss shut down while active'];

/** Why a job's last try failed, from the output pg-boss kept (a serialised error). */
function lastReason(output: object | null) {
  const { message, value } = (output ?? {}) as { message?: string; value?: { message?: string } };
  const reason = message ?? value?.message ?? 'no reason recorded';
  return CUT_OFF.includes(reason) ? 'the last try was cut off (its server process stopped, or it ran past its time limit)' : reason;
}

let boss: PgBoss | undefined;

function queueClient() {
  boss ??= new PgBoss({
    connectionString: config.DATABASE_URL,
    schema: QUEUE_SCHEMA,
    migrate: false,
    max: 4,
    application_name: 'phaselot-jobs',
    maintenanceIntervalSeconds: config.JOBS_MAINTENANCE_SECONDS,
  }).on('error', (error) => logger.error({ err: error }, 'job queue error'));
  return boss;
}

/** Runs pg-boss's SQL in the caller's transaction. */
const onTransaction = (transaction: Transaction): PgBoss.Db => ({
  async executeSql(text, values) {
    // pg takes undefined for NULL; Sequelize's bind refuses it.
    const bind = values.map((value) => (value === undefined ? null : value));
    return { rows: await sequelize.query(text, { bind, transaction, type: QueryTypes.SELECT }) };
  },
});

/** Queues a job in `transaction`: it exists exactly when the transaction commits. Answers its id. */
export async function enqueue(queue: QueueName, data: object, transaction: Transaction, options: PgBoss.SendOptions = {}) {
  const id = await queueClient().send(queue, data, { ...options, db: onTransaction(transaction) });
  if (!id) throw new Error(`The job queue refused a job for ${queue}`);
  return id;
}

/** Starts working the given queues in this process (and the schedules among them). */
export async function startJobs(definitions: JobDefinition<never>[]) {
  const client = queueClient();
  await client.start();
  for (const definition of definitions as JobDefinition[]) {
    const runOne = async (job: PgBoss.JobWithMetadata<object>) => {
      try {
        await definition.run(job.data, { retryCount: job.retryCount });
      } catch (error) {
        if (!(error instanceof JobFailure)) {
          logger.warn({ err: error, queue: definition.queue, job: job.id, retryCount: job.retryCount }, 'job failed; the queue retries it while tries remain');
          throw error;
        }
        logger.warn({ queue: definition.queue, job: job.id, reason: error.message }, 'job failed for good');
        await definition.failed?.record(job.data, error.message);
      }
    };
    await client.work<object>(definition.queue, { includeMetadata: true, batchSize: definition.batchSize ?? 1 }, async (jobs) => {
      // One job: its failure is the batch's, which the queue retries by its policy.
      if (jobs.length === 1) return runOne(jobs[0]);
      // Several: each fails on its own (and is retried on its own); the rest complete with the batch.
      for (const job of jobs) {
        await runOne(job).catch((error: unknown) => client.fail(definition.queue, job.id, { message: error instanceof Error ? error.message : String(error) }));
      }
    });
    if (definition.failed) {
      const { record } = definition.failed;
      await client.work<object>(definition.failed.queue, { includeMetadata: true, batchSize: 1 }, async ([job]) => {
        await record(job.data, `Given up after ${job.retryLimit + 1} tries: ${lastReason(job.output)}`);
      });
    }
    if (definition.schedule) await client.schedule(definition.queue, definition.schedule);
  }
}

/** Stops taking jobs; a job still running after `timeoutMs` is failed and so retried elsewhere. */
export async function stopJobs(timeoutMs = 10_000) {
  const stopping = boss;
  boss = undefined;
  await stopping?.stop({ graceful: true, timeout: timeoutMs });
}
