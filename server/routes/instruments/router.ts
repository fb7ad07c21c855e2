import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { calibrationInputSchema, instrumentInputSchema, instrumentUpdateSchema, MAX_CERTIFICATE_BYTES } from '../../../shared/schemas/instruments';
import { listQuerySchema } from '../../../shared/schemas/paging';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { sendCsv } from '../../http/csv';
import { AppError } from '../../http/errors';
import { listAll, listPage } from '../../http/list';
import { idParam, idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { attachCertificate, calibrationCertificate, findInstrument, recordCalibration, requireInstrument } from '../../instruments/calibrations';
import { listInstruments, registerInstrument, updateInstrument } from '../../instruments/instruments';
import { instrumentFileList } from '../../instruments/lists';
import { presentInstrument } from '../../instruments/views';
import { openBlob } from '../../storage/blobs';
import { presentInstrumentDetail } from './presenter';

export const instrumentsRouter = Router();

/** One optional `certificate` file beside the form's fields. */
const certificateUpload: RequestHandler = (req, res, next) =>
  multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_CERTIFICATE_BYTES, files: 1, fields: 20 } }).single('certificate')(
    req,
    res,
    (error: unknown) => {
      if (error instanceof multer.MulterError && error.code === 'LIMIT_FILE_SIZE') next(new AppError(413, 'upload', 'The certificate is larger than 10 MB'));
      else if (error instanceof multer.MulterError) next(new AppError(400, 'upload', `Send one PDF as "certificate" (${error.message})`));
      else next(error);
    },
  );

const calibrationParams = idParams.extend({ calibrationId: idParam });

instrumentsRouter.get('/', authenticate, allow('instruments.read'), async (_req, res) => {
  const instruments = await listInstruments();
  res.json({ data: instruments.map(presentInstrument), total: instruments.length });
});

instrumentsRouter.post(
  '/',
  authenticate,
  allow('instruments.manage'),
  validated({ body: instrumentInputSchema }, async ({ body }, req, res) => {
    res.status(201).json(presentInstrument(await registerInstrument(actorOf(req), body)));
  }),
);

instrumentsRouter.get(
  '/:id',
  authenticate,
  allow('instruments.read'),
  validated({ params: idParams }, async ({ params }, _req, res) => {
    res.json(presentInstrumentDetail(await findInstrument(params.id)));
  }),
);

instrumentsRouter.put(
  '/:id',
  authenticate,
  allow('instruments.manage'),
  validated({ params: idParams, body: instrumentUpdateSchema }, async ({ params, body }, req, res) => {
    res.json(presentInstrument(await updateInstrument(actorOf(req), params.id, body)));
  }),
);

instrumentsRouter.post(
  '/:id/calibrations',
  authenticate,
  allow('instruments.calibrate'),
  certificateUpload,
  validated({ params: idParams, body: calibrationInputSchema }, async ({ params, body }, req, res) => {
    await recordCalibration(actorOf(req), params.id, body, req.file);
    res.status(201).json(presentInstrumentDetail(await findInstrument(params.id)));
  }),
);

instrumentsRouter.post(
  '/:id/calibrations/:calibrationId/certificate',
  authenticate,
  allow('instruments.calibrate'),
  certificateUpload,
  validated({ params: calibrationParams }, async ({ params }, req, res) => {
    if (!req.file) throw new AppError(400, 'upload', 'Send the certificate PDF as "certificate"');
    await attachCertificate(actorOf(req), params.id, params.calibrationId, req.file);
    res.json(presentInstrumentDetail(await findInstrument(params.id)));
  }),
);

/** A calibration certificate, shown in the browser (only PDFs are ever stored). */
instrumentsRouter.get(
  '/:id/calibrations/:calibrationId/certificate',
  authenticate,
  allow('instruments.read'),
  validated({ params: calibrationParams }, async ({ params }, _req, res) => {
    const certificate = await calibrationCertificate(params.id, params.calibrationId);
    const stored = await openBlob(certificate.storageKey);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `inline; filename*=UTF-8''${encodeURIComponent(certificate.name)}`);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    stored.on('error', () => res.destroy()).pipe(res);
  }),
);

/** The bench files measured with the instrument, a page at a time (or every one as CSV). */
instrumentsRouter.get(
  '/:id/files',
  authenticate,
  allow('lots.read'),
  validated({ params: idParams, query: listQuerySchema }, async ({ params, query }, _req, res) => {
    await requireInstrument(params.id);
    res.json(await listPage(instrumentFileList, { ...query, instrumentId: params.id }));
  }),
);

instrumentsRouter.get(
  '/:id/files/export.csv',
  authenticate,
  allow('lots.read'),
  validated({ params: idParams, query: listQuerySchema }, async ({ params, query }, _req, res) => {
    await requireInstrument(params.id);
    await sendCsv(res, `instrument-${params.id}-files.csv`, instrumentFileList.csv.columns, listAll(instrumentFileList, { ...query, instrumentId: params.id }));
  }),
);
