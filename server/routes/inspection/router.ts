import { Router, type Request } from 'express';
import multer from 'multer';
import { dispositionInputSchema } from '../../../shared/inspection/lotVerdict';
import { measurementUploadSchema, previewPageParams, previewPageQuery } from '../../../shared/schemas/inspection';
import { listQuerySchema } from '../../../shared/schemas/paging';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { badRequest } from '../../http/errors';
import { mountList } from '../../http/list';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { signDisposition } from '../../inspection/disposition';
import { findLotInspection } from '../../inspection/lotInspection';
import { commitMeasurements, MAX_MEASUREMENT_BYTES, type UploadedFile } from '../../inspection/measurements';
import { previewMeasurements, previewPage } from '../../inspection/preview';
import { inspectionQueue } from '../../inspection/queue';
import { presentLotInspection } from './presenter';

// Bench files are CSV text: anything that is not (a NUL byte in the first kilobyte) is refused
// before the engine sees it.
const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: MAX_MEASUREMENT_BYTES, files: 20 },
});

function csvFiles(files: Request['files']): UploadedFile[] {
  // `upload.array()` gives a list (the by-field shape comes from `.fields()` only).
  const list = Array.isArray(files) ? files : [];
  for (const file of list) {
    if (file.buffer.subarray(0, 1024).includes(0)) throw badRequest(`${file.originalname} is not a text (CSV) file`);
  }
  return list.map((f) => ({ originalname: f.originalname, buffer: f.buffer }));
}

export const inspectionRouter = Router();

mountList(inspectionRouter, '/queue', 'lots.read', listQuerySchema, inspectionQueue);

inspectionRouter.get(
  '/lots/:id',
  authenticate,
  allow('lots.read'),
  validated({ params: idParams }, async ({ params }, _req, res) => {
    res.json(presentLotInspection(await findLotInspection(params.id)));
  }),
);

/** What both measurement routes share: inspectors only, the files, then the lot and the instrument. */
const measurementUpload = [authenticate, allow('inspection.perform'), upload.array('files')];
const measurementInput = { params: idParams, body: measurementUploadSchema };

inspectionRouter.post(
  '/lots/:id/measurements/preview',
  ...measurementUpload,
  validated(measurementInput, async ({ params, body }, req, res) => {
    res.json(await previewMeasurements(params.id, csvFiles(req.files), body.instrumentId));
  }),
);

/** A page of a checked file's pieces, errors or warnings. */
inspectionRouter.get(
  '/lots/:id/measurements/preview/:sha256/:list',
  authenticate,
  allow('inspection.perform'),
  validated({ params: previewPageParams, query: previewPageQuery }, async ({ params, query }, _req, res) => {
    res.json(await previewPage(params.id, params.sha256, params.list, query));
  }),
);

inspectionRouter.post(
  '/lots/:id/measurements',
  ...measurementUpload,
  validated(measurementInput, async ({ params, body }, req, res) => {
    res.status(201).json(await commitMeasurements({ ...actorOf(req), id: req.user!.id }, params.id, csvFiles(req.files), body.instrumentId));
  }),
);

inspectionRouter.post(
  '/lots/:id/dispositions',
  authenticate,
  allow('disposition.sign'),
  validated({ params: idParams, body: dispositionInputSchema }, async ({ params, body }, req, res) => {
    const { requestId, address } = actorOf(req);
    const result = await signDisposition(req.user!, params.id, body, { requestId, address });
    res.status(201).json({ dispositionId: result.disposition.id, decision: result.disposition.decision, documents: result.documents });
  }),
);
