import { Router } from 'express';
import { z } from 'zod';
import { LotDocument } from '../../../db/models';
import { certificateListSchema, verifyQuerySchema, type CertificateListQuery } from '../../../shared/schemas/certificates';
import { allow, authenticate } from '../../auth/authenticate';
import { notFound } from '../../http/errors';
import { validate } from '../../http/validate';
import { openBlob } from '../../storage/blobs';
import { listDocuments, verifyDocument } from './queries';

export const certificatesRouter = Router();

/** Public: anyone holding a document can check it, and learns only what is printed on it. */
certificatesRouter.get('/verify', validate({ query: verifyQuerySchema }), async (req, res) => {
  const { number, hash } = req.valid.query as z.infer<typeof verifyQuerySchema>;
  res.json(await verifyDocument(number, hash));
});

certificatesRouter.get('/', authenticate, allow('certificates.read'), validate({ query: certificateListSchema }), async (req, res) => {
  res.json(await listDocuments(req.valid.query as CertificateListQuery));
});

export const documentsRouter = Router();

documentsRouter.get('/:file', authenticate, allow('certificates.read'), async (req, res) => {
  const number = String(req.params.file).replace(/\.pdf$/, '');
  const document = await LotDocument.findOne({ where: { number } });
  if (!document) throw notFound('Document');
  const stored = await openBlob(document.storageKey);
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `inline; filename="${document.number}.pdf"`);
  res.setHeader('X-Content-SHA256', document.pdfSha256);
  stored.on('error', () => res.destroy()).pipe(res);
});
