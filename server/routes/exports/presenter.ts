import type { ExportJobView } from '../../../shared/schemas/exports';
import type { ExportJobRecord } from '../../exports/exportJobs';

export const presentExportJob = (job: ExportJobRecord): ExportJobView => ({
  id: job.id,
  requestedBy: job.requestedBy,
  filter: job.filter,
  status: job.status,
  done: job.done,
  total: job.total,
  error: job.error,
  size: job.size,
  sha256: job.sha256,
  createdAt: job.createdAt.toISOString(),
  finishedAt: job.finishedAt?.toISOString() ?? null,
});

export const bundleFileName = (job: ExportJobRecord) => `phaselot-export-${job.filter.from}_${job.filter.to}-${job.id}.zip`;
