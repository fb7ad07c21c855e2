import { Router } from 'express';
import { certificateListSchema, verifyQuerySchema } from '../../../shared/schemas/certificates';
import { allow, authenticate } from '../../auth/authenticate';
import { findDocument, listDocuments, verifyDocument } from '../../documents/certificates';
import { validated } from '../../http/validate';
import { openBlob } from '../../storage/blobs';

export const certificatesRouter = Router();

/** Public: anyone holding a document can check it, and learns only what is printed on it. */
certificatesRouter.get(
  '/verify',
  validated({ query: verifyQuerySchema }, async ({ query }, _req, res) => {
    res.json(await verifyDocument(query.number, query.hash));
  }),
);

certificatesRouter.get(
  '/',
  authenticate,
  allow('certificates.read'),
  validated({ query: certificateListSchema }, async ({ query }, _req, res) => {
    res.json(await listDocuments(query));
  }),
);

export const documentsRouter = Router();

documentsRouter.get('/:file', authenticate, allow('certificates.read'), async (req, res) => {
  const document = await findDocument(String(req.params.file).replace(/\.pdf$/, ''));
  const stored = await openBlob(document.storageKey);
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `inline; filename="${document.number}.pdf"`);
  res.setHeader('X-Content-SHA256', document.pdfSha256);
  stored.on('error', () => res.destroy()).pipe(res);
});
