import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { ATTACHMENT_KIND_LABELS, MAX_ATTACHMENT_BYTES, shipmentListQuerySchema, shipmentReceiveSchema } from '../../../shared/schemas/receiving';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { AppError } from '../../http/errors';
import { mountList } from '../../http/list';
import { validated } from '../../http/validate';
import { shipmentList } from '../../receiving/lists';
import { receiveShipment } from '../../receiving/receipts';
import { presentReceipt } from './presenter';

const FILE_LABELS: Record<string, string> = {
  packingSlip: ATTACHMENT_KIND_LABELS['packing-slip'],
  certificate: ATTACHMENT_KIND_LABELS.certificate,
  serialsFile: 'Serial file',
};

const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_ATTACHMENT_BYTES, files: 7, fields: 20 } }).fields([
  { name: 'packingSlip', maxCount: 2 },
  { name: 'certificate', maxCount: 4 },
  { name: 'serialsFile', maxCount: 1 },
]);

/** The multipart body; a file over the limit is named in the answer. */
const receiptUpload: RequestHandler = (req, res, next) =>
  upload(req, res, (error?: unknown) => {
    if (error instanceof multer.MulterError && error.code === 'LIMIT_FILE_SIZE') {
      next(new AppError(413, 'upload', `${FILE_LABELS[error.field ?? ''] ?? 'A file'} is larger than 20 MB`, { field: error.field }));
    } else next(error);
  });

export const shipmentsRouter = Router();

mountList(shipmentsRouter, '/', 'lots.read', shipmentListQuerySchema, shipmentList);

shipmentsRouter.post(
  '/',
  authenticate,
  allow('shipments.receive'),
  receiptUpload,
  validated({ body: shipmentReceiveSchema }, async ({ body }, req, res) => {
    // `.fields()` gives the files by field (a list comes from `.array()` only).
    const files = Array.isArray(req.files) ? {} : (req.files ?? {});
    res.status(201).json(presentReceipt(await receiveShipment(actorOf(req), body, files)));
  }),
);
