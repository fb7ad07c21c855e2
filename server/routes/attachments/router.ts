import { Router } from 'express';
import { allow, authenticate } from '../../auth/authenticate';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { findAttachment } from '../../receiving/attachments';
import { openBlob } from '../../storage/blobs';

export const attachmentsRouter = Router();

/** The stored file, shown in the browser (PDF and images are safe to show inline). */
attachmentsRouter.get(
  '/:id',
  authenticate,
  allow('lots.read'),
  validated({ params: idParams }, async ({ params }, _req, res) => {
    const attachment = await findAttachment(params.id);
    const stored = await openBlob(attachment.sha256);
    res.setHeader('Content-Type', attachment.mediaType);
    res.setHeader('Content-Length', String(attachment.sizeBytes));
    res.setHeader('Content-Disposition', `inline; filename*=UTF-8''${encodeURIComponent(attachment.originalName)}`);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Digest', `sha-256=${Buffer.from(attachment.sha256, 'hex').toString('base64')}`);
    stored.on('error', () => res.destroy()).pipe(res);
  }),
);
