import { Router } from 'express';
import { z } from 'zod';
import { exportFilterSchema, type ExportFilter } from '../../../shared/schemas/exports';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { validate } from '../../http/validate';
import { openBlob } from '../../storage/blobs';
import { exportForDownload, findExportJob, recentExports, requestExport } from './operations';
import { bundleFileName, presentExportJob } from './presenter';

const idParams = z.object({ id: z.coerce.number().int().positive() });
type IdParams = z.infer<typeof idParams>;

export const exportsRouter = Router();

exportsRouter.post('/', authenticate, allow('exports.create'), validate({ body: exportFilterSchema }), async (req, res) => {
  const job = await requestExport({ ...actorOf(req), id: req.user!.id }, req.valid.body as ExportFilter);
  res.status(202).location(`/api/exports/${job.id}`).json(presentExportJob(job));
});

exportsRouter.get('/', authenticate, allow('exports.create'), async (req, res) => {
  const jobs = await recentExports(req.user!.id);
  res.json({ data: jobs.map(presentExportJob), total: jobs.length });
});

exportsRouter.get('/:id', authenticate, allow('exports.create'), validate({ params: idParams }), async (req, res) => {
  res.json(presentExportJob(await findExportJob((req.valid.params as IdParams).id)));
});

exportsRouter.get('/:id/download', authenticate, allow('exports.create'), validate({ params: idParams }), async (req, res) => {
  const job = await exportForDownload(actorOf(req), (req.valid.params as IdParams).id);
  const stored = await openBlob(job.storageKey!);
  res.setHeader('Content-Type', 'application/zip');
  res.setHeader('Content-Length', String(job.size));
  res.setHeader('Content-Disposition', `attachment; filename="${bundleFileName(job)}"`);
  res.setHeader('X-Content-SHA256', job.sha256!);
  stored.on('error', () => res.destroy()).pipe(res);
});
