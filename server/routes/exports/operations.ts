// Export jobs: requested in one transaction with their audit entry, then built in the background of
// this process while the page polls their progress.
import { inTransaction } from '../../../db';
import { ExportJob } from '../../../db/models';
import type { ExportFilter } from '../../../shared/schemas/exports';
import { recordAudit, type AuditActor } from '../../audit/record';
import { writeExportBundle } from '../../exports/bundle';
import { badRequest, conflict, notFound } from '../../http/errors';
import { logger } from '../../logger';
import { documentsForExport, listDocuments } from '../certificates/queries';

/** Jobs this process is building; an unfinished job missing here was cut off by a restart. */
const building = new Set<number>();
const PROGRESS_SAVE_INTERVAL_MS = 250;

export async function requestExport(actor: AuditActor & { id: number }, filter: ExportFilter) {
  const { total } = await listDocuments({ ...filter, page: 1, pageSize: 1 });
  if (total === 0) throw badRequest(`No certificate or inspection report was issued from ${filter.from} to ${filter.to} for this choice; nothing to export.`);
  const job = await inTransaction(async (transaction) => {
    const created = await ExportJob.create({ requestedBy: actor.id, filter, total }, { transaction });
    await recordAudit(actor, { action: 'export.create', entityType: 'export', entityId: created.id, after: { filter, documents: total } }, transaction);
    return created;
  });
  building.add(job.id);
  void buildExport(job);
  return job;
}

async function buildExport(job: ExportJob) {
  try {
    const documents = await documentsForExport(job.filter);
    await job.update({ status: 'running', total: documents.length });
    let savedAt = 0;
    const bundle = await writeExportBundle(documents, async (done) => {
      if (Date.now() - savedAt < PROGRESS_SAVE_INTERVAL_MS) return;
      savedAt = Date.now();
      await job.update({ done });
    });
    await job.update({ status: 'done', done: documents.length, storageKey: bundle.key, size: bundle.size, sha256: bundle.sha256, finishedAt: new Date() });
  } catch (error) {
    logger.error({ err: error, exportJob: job.id }, 'export failed');
    const message = error instanceof Error ? error.message : String(error);
    await ExportJob.update({ status: 'failed', error: message, finishedAt: new Date() }, { where: { id: job.id } });
  } finally {
    building.delete(job.id);
  }
}

export async function findExportJob(id: number) {
  const job = await ExportJob.findByPk(id);
  if (!job) throw notFound('Export');
  if ((job.status === 'queued' || job.status === 'running') && !building.has(id)) {
    await job.update({ status: 'failed', error: 'The server restarted before this export was finished. Start it again.', finishedAt: new Date() });
  }
  return job;
}

export const recentExports = (userId: number) => ExportJob.findAll({ where: { requestedBy: userId }, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: 10 });

/** The finished job whose ZIP is about to be sent, with the download recorded first. */
export async function exportForDownload(actor: AuditActor, id: number) {
  const job = await findExportJob(id);
  if (job.status !== 'done' || !job.storageKey) throw conflict(job.status === 'failed' ? `This export failed: ${job.error}` : 'This export is not finished yet.');
  await recordAudit(actor, { action: 'export.download', entityType: 'export', entityId: id, after: { sha256: job.sha256, size: job.size } });
  return job;
}
