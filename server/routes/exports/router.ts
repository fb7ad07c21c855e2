import { Router } from 'express';
import { exportFilterSchema, exportSpanQuerySchema } from '../../../shared/schemas/exports';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { documentSpan } from '../../documents/certificates';
import { exportForDownload, findExportJob, recentExports, requestExport } from '../../exports/exportJobs';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { openBlob } from '../../storage/blobs';
import { bundleFileName, presentExportJob } from './presenter';

export const exportsRouter = Router();

exportsRouter.post(
  '/',
  authenticate,
  allow('exports.create'),
  validated({ body: exportFilterSchema }, async ({ body }, req, res) => {
    const job = await requestExport({ ...actorOf(req), id: req.user!.id }, body);
    res.status(202).location(`/api/exports/${job.id}`).json(presentExportJob(job));
  }),
);

exportsRouter.get('/', authenticate, allow('exports.create'), async (req, res) => {
  const jobs = await recentExports(req.user!.id);
  res.json({ data: jobs.map(presentExportJob), total: jobs.length });
});

// What the form offers by default: the days that have documents for the chosen supplier and part.
exportsRouter.get(
  '/span',
  authenticate,
  allow('exports.create'),
  validated({ query: exportSpanQuerySchema }, async ({ query }, _req, res) => {
    res.json(await documentSpan(query));
  }),
);

exportsRouter.get(
  '/:id',
  authenticate,
  allow('exports.create'),
  validated({ params: idParams }, async ({ params }, _req, res) => {
    res.json(presentExportJob(await findExportJob(params.id)));
  }),
);

exportsRouter.get(
  '/:id/download',
  authenticate,
  allow('exports.create'),
  validated({ params: idParams }, async ({ params }, req, res) => {
    const job = await exportForDownload(actorOf(req), params.id);
    const stored = await openBlob(job.storageKey!);
    res.setHeader('Content-Type', 'application/zip');
    res.setHeader('Content-Length', String(job.size));
    res.setHeader('Content-Disposition', `attachment; filename="${bundleFileName(job)}"`);
    res.setHeader('X-Content-SHA256', job.sha256!);
    stored.on('error', () => res.destroy()).pipe(res);
  }),
);
