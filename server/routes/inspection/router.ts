import { Router, type Request } from 'express';
import multer from 'multer';
import type { z } from 'zod';
import { dispositionInputSchema, type DispositionInput } from '../../../shared/inspection/lotVerdict';
import { lotIdParams, measurementUploadSchema, previewPageParams, previewPageQuery } from '../../../shared/schemas/inspection';
import { listQuerySchema } from '../../../shared/schemas/paging';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { badRequest } from '../../http/errors';
import { mountList } from '../../http/list';
import { validate, validated } from '../../http/validate';
import { signDisposition } from '../../inspection/disposition';
import { commitMeasurements, MAX_MEASUREMENT_BYTES, type UploadedFile } from '../../inspection/measurements';
import { previewMeasurements, previewPage } from '../../inspection/preview';
import { inspectionQueue } from '../../inspection/queue';
import { lotInspectionView } from './presenter';

// Bench files are CSV text: anything that is not (a NUL byte in the first kilobyte) is refused
// before the engine sees it.
const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: MAX_MEASUREMENT_BYTES, files: 20 },
});

function csvFiles(files: Express.Multer.File[] | undefined): UploadedFile[] {
  const list = files ?? [];
  for (const file of list) {
    if (file.buffer.subarray(0, 1024).includes(0)) throw badRequest(`${file.originalname} is not a text (CSV) file`);
  }
  return list.map((f) => ({ originalname: f.originalname, buffer: f.buffer }));
}

type LotParams = z.infer<typeof lotIdParams>;

export const inspectionRouter = Router();

mountList(inspectionRouter, '/queue', 'lots.read', listQuerySchema, inspectionQueue);

inspectionRouter.get('/lots/:id', authenticate, allow('lots.read'), validate({ params: lotIdParams }), async (req, res) => {
  res.json(await lotInspectionView((req.valid.params as LotParams).id));
});

/** The middleware both measurement routes share: inspectors only, the files, the lot and the instrument. */
const measurementUpload = [authenticate, allow('inspection.perform'), upload.array('files'), validate({ params: lotIdParams, body: measurementUploadSchema })];

function uploadOf(req: Request) {
  const { instrumentId } = req.valid.body as z.infer<typeof measurementUploadSchema>;
  return { lotId: (req.valid.params as LotParams).id, files: csvFiles(req.files as Express.Multer.File[]), instrumentId };
}

inspectionRouter.post('/lots/:id/measurements/preview', ...measurementUpload, async (req, res) => {
  const { lotId, files, instrumentId } = uploadOf(req);
  res.json(await previewMeasurements(lotId, files, instrumentId));
});

/** A page of a checked file's pieces, errors or warnings. */
inspectionRouter.get(
  '/lots/:id/measurements/preview/:sha256/:list',
  authenticate,
  allow('inspection.perform'),
  validated({ params: previewPageParams, query: previewPageQuery }, async ({ params, query }, _req, res) => {
    res.json(await previewPage(params.id, params.sha256, params.list, query));
  }),
);

inspectionRouter.post('/lots/:id/measurements', ...measurementUpload, async (req, res) => {
  const { lotId, files, instrumentId } = uploadOf(req);
  res.status(201).json(await commitMeasurements({ ...actorOf(req), id: req.user!.id }, lotId, files, instrumentId));
});

inspectionRouter.post(
  '/lots/:id/dispositions',
  authenticate,
  allow('disposition.sign'),
  validate({ params: lotIdParams, body: dispositionInputSchema }),
  async (req, res) => {
    const { requestId, address } = actorOf(req);
    const result = await signDisposition(req.user!, (req.valid.params as LotParams).id, req.valid.body as DispositionInput, { requestId, address });
    res.status(201).json({ dispositionId: result.disposition.id, decision: result.disposition.decision, documents: result.documents });
  },
);
