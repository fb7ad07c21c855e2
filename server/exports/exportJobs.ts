// Export jobs: requested in one transaction with their audit entry and their queue job; built by
// whichever server process takes the job (server/jobs), while the page polls their progress. A try
// cut off by a stopped process is retried by the queue; each try starts the bundle afresh, and only
// the latest try's progress and result are kept.
import { inTransaction } from '../../db';
import { ExportJob } from '../../db/models';
import type { ExportFilter } from '../../shared/schemas/exports';
import { recordAudit, type AuditActor } from '../audit/record';
import { config } from '../config';
import { writeExportBundle } from './bundle';
import { badRequest, conflict, notFound } from '../http/errors';
import { enqueue, QUEUES, type JobDefinition, type JobRun } from '../jobs/queue';
import { logger } from '../logger';
import { storeBlobFile } from '../storage/blobs';
import { documentsForExport, listDocuments } from '../documents/certificates';

const PROGRESS_SAVE_INTERVAL_MS = 250;

type ExportJobData = { exportId: number };

export async function requestExport(actor: AuditActor & { id: number }, filter: ExportFilter) {
  const { total } = await listDocuments({ ...filter, page: 1, pageSize: 1 });
  if (total === 0) throw badRequest(`No certificate or inspection report was issued from ${filter.from} to ${filter.to} for this choice; nothing to export.`);
  return inTransaction(async (transaction) => {
    const job = await ExportJob.create({ requestedBy: actor.id, filter, total }, { transaction });
    const data: ExportJobData = { exportId: job.id };
    job.queueJobId = await enqueue(QUEUES.exportBuild, data, transaction, { expireInSeconds: config.EXPORT_TIMEOUT_SECONDS });
    await job.save({ transaction });
    await recordAudit(actor, { action: 'export.create', entityType: 'export', entityId: job.id, after: { filter, documents: total } }, transaction);
    return job;
  });
}

async function buildExport({ exportId }: ExportJobData, { retryCount }: JobRun) {
  const mine = { id: exportId, attempt: retryCount, status: 'running' } as const;
  // Claimed for this try; a finished export (the job delivered once more) is left as it is.
  const [claimed] = await ExportJob.update({ status: 'running', attempt: retryCount, done: 0 }, { where: { id: exportId, status: ['queued', 'running'] } });
  if (!claimed) return;
  logger.info({ exportJob: exportId, attempt: retryCount, pid: process.pid }, 'export build started');
  const job = (await ExportJob.findByPk(exportId))!;
  const documents = await documentsForExport(job.filter);
  await ExportJob.update({ total: documents.length }, { where: mine });
  let savedAt = 0;
  const kept = await writeExportBundle(
    documents,
    async (done) => {
      if (Date.now() - savedAt < PROGRESS_SAVE_INTERVAL_MS) return;
      savedAt = Date.now();
      await ExportJob.update({ done }, { where: mine });
    },
    (bundle) =>
      inTransaction(async (transaction) => {
        // Stored only while this try is still the one that counts, so a job leaves one file.
        const current = await ExportJob.findOne({ where: mine, lock: transaction.LOCK.UPDATE, transaction });
        if (!current) return false;
        const storageKey = await storeBlobFile(bundle.path, bundle.sha256, transaction);
        await current.update(
          { status: 'done', done: documents.length, storageKey, size: bundle.size, sha256: bundle.sha256, finishedAt: new Date() },
          { transaction },
        );
        return true;
      }),
  );
  logger.info({ exportJob: exportId, attempt: retryCount, kept }, 'export build finished');
}

async function recordExportFailure({ exportId }: ExportJobData, reason: string) {
  await ExportJob.update({ status: 'failed', error: reason, finishedAt: new Date() }, { where: { id: exportId, status: ['queued', 'running'] } });
}

export const exportJob: JobDefinition<ExportJobData> = {
  queue: QUEUES.exportBuild,
  run: buildExport,
  failed: { queue: QUEUES.exportFailed, record: recordExportFailure },
};

export async function findExportJob(id: number) {
  const job = await ExportJob.findByPk(id);
  if (!job) throw notFound('Export');
  return job;
}

/** An export job as stored, for the route's presenter. */
export type ExportJobRecord = Awaited<ReturnType<typeof findExportJob>>;

export const recentExports = (userId: number) =>
  ExportJob.findAll({
    where: { requestedBy: userId },
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: 10,
  });

/** The finished job whose ZIP is about to be sent, with the download recorded first. */
export async function exportForDownload(actor: AuditActor, id: number) {
  const job = await findExportJob(id);
  if (job.status !== 'done' || !job.storageKey)
    throw conflict(job.status === 'failed' ? `This export failed: ${job.error}` : 'This export is not finished yet.');
  await recordAudit(actor, { action: 'export.download', entityType: 'export', entityId: id, after: { sha256: job.sha256, size: job.size } });
  return job;
}
