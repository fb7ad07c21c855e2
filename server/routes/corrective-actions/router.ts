import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import {
  carCloseSchema,
  carListQuerySchema,
  carRaiseSchema,
  carReviewSchema,
  MAX_RESPONSE_FILES,
  MAX_RESPONSE_FILE_BYTES,
  supplierResponseSchema,
} from '../../../shared/schemas/correctiveActions';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { AppError } from '../../http/errors';
import { mountList } from '../../http/list';
import { idParam, idParams } from '../../http/params';
import { addressRateLimit } from '../../http/rateLimit';
import { validated } from '../../http/validate';
import { openBlob } from '../../storage/blobs';
import { closeCorrectiveAction, raiseCorrectiveAction, reviewResponse, revokeLink, sendNewLink } from '../../supplierquality/correctiveActions';
import { correctiveActionList, correctiveActionView, responseAttachment } from '../../supplierquality/correctiveQueries';
import { auditRefusal, submitSupplierResponse, supplierRequestView } from '../../supplierquality/supplierResponse';

export const correctiveActionsRouter = Router();

// The supplier's response form, reached with the mailed link and no account. The link's token comes
// in a header (the page reads it from the URL's fragment), never in a URL a log could keep.
const LINK_HEADER = 'x-response-link';
const linkToken = (req: Parameters<RequestHandler>[0]) => {
  const token = req.get(LINK_HEADER);
  if (!token) throw new AppError(400, 'link_missing', 'This page needs the link from the request mail. Open the link exactly as it was mailed to you.');
  return token.slice(0, 2000);
};

const senderOf = (req: Parameters<RequestHandler>[0]) => ({ requestId: String(req.id ?? ''), address: req.ip, userAgent: req.get('user-agent') });

/** The upload's own refusals (a file over 10 MB, too many files) are audited like the operation's,
 * when they came through a genuine link: the operation never sees those requests. */
function uploadRefusal(error: unknown) {
  if (!(error instanceof multer.MulterError)) return null;
  if (error.code === 'LIMIT_FILE_SIZE')
    return new AppError(413, 'file_too_large', 'A file is larger than 10 MB; attach files of up to 10 MB each', { field: error.field });
  if (error.code === 'LIMIT_FILE_COUNT') return new AppError(400, 'too_many_files', `At most ${MAX_RESPONSE_FILES} files can be attached`);
  return null;
}

const upload: RequestHandler = (req, res, next) =>
  multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_RESPONSE_FILE_BYTES, files: MAX_RESPONSE_FILES, fields: 20 } }).array(
    'files',
    MAX_RESPONSE_FILES,
  )(req, res, (error: unknown) => {
    const refusal = uploadRefusal(error);
    const token = req.get(LINK_HEADER);
    if (!refusal || !token) return next(refusal ?? error);
    auditRefusal(token.slice(0, 2000), refusal, senderOf(req)).then(() => next(refusal), next);
  });

correctiveActionsRouter.get('/respond', addressRateLimit('car-response-read', 60, 15), async (req, res) => {
  res.json(await supplierRequestView(linkToken(req)));
});

correctiveActionsRouter.post(
  '/respond',
  addressRateLimit('car-response-send', 10, 60),
  upload,
  validated({ body: supplierResponseSchema }, async ({ body }, req, res) => {
    const files = (req.files as Express.Multer.File[] | undefined) ?? [];
    const response = await submitSupplierResponse(linkToken(req), body, files, senderOf(req));
    res.status(201).json({ submittedAt: response.submittedAt.toISOString() });
  }),
);

mountList(correctiveActionsRouter, '/', 'corrective.read', carListQuerySchema, correctiveActionList);

correctiveActionsRouter.post(
  '/',
  authenticate,
  allow('corrective.manage'),
  validated({ body: carRaiseSchema }, async ({ body }, req, res) => {
    const request = await raiseCorrectiveAction(actorOf(req), body);
    res.status(201).json(await correctiveActionView(request.id));
  }),
);

correctiveActionsRouter.get(
  '/:id',
  authenticate,
  allow('corrective.read'),
  validated({ params: idParams }, async ({ params }, _req, res) => {
    res.json(await correctiveActionView(params.id));
  }),
);

correctiveActionsRouter.post(
  '/:id/link',
  authenticate,
  allow('corrective.manage'),
  validated({ params: idParams }, async ({ params }, req, res) => {
    await sendNewLink(actorOf(req), params.id);
    res.status(201).json(await correctiveActionView(params.id));
  }),
);

correctiveActionsRouter.post(
  '/:id/link/revocation',
  authenticate,
  allow('corrective.manage'),
  validated({ params: idParams }, async ({ params }, req, res) => {
    await revokeLink(actorOf(req), params.id);
    res.json(await correctiveActionView(params.id));
  }),
);

correctiveActionsRouter.post(
  '/:id/review',
  authenticate,
  allow('corrective.review'),
  validated({ params: idParams, body: carReviewSchema }, async ({ params, body }, req, res) => {
    const { requestId, address } = actorOf(req);
    await reviewResponse(req.user!, params.id, body, { requestId, address });
    res.json(await correctiveActionView(params.id));
  }),
);

correctiveActionsRouter.post(
  '/:id/closure',
  authenticate,
  allow('corrective.review'),
  validated({ params: idParams, body: carCloseSchema }, async ({ params, body }, req, res) => {
    const { requestId, address } = actorOf(req);
    await closeCorrectiveAction(req.user!, params.id, body, { requestId, address });
    res.json(await correctiveActionView(params.id));
  }),
);

const attachmentParams = idParams.extend({ attachmentId: idParam });

/** A file of the supplier's answer, shown in the browser (only PDF and images are ever stored). */
correctiveActionsRouter.get(
  '/:id/attachments/:attachmentId',
  authenticate,
  allow('corrective.read'),
  validated({ params: attachmentParams }, async ({ params }, _req, res) => {
    const file = await responseAttachment(params.id, params.attachmentId);
    const stored = await openBlob(file.storageKey);
    res.setHeader('Content-Type', file.mediaType);
    res.setHeader('Content-Disposition', `inline; filename*=UTF-8''${encodeURIComponent(file.name)}`);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    stored.on('error', () => res.destroy()).pipe(res);
  }),
);
