import { Router, type Response } from 'express';
import { labelStockQuerySchema, lotLabelQuerySchema } from '../../../shared/schemas/labels';
import { lotName } from '../../../shared/schemas/stock';
import { allow, authenticate } from '../../auth/authenticate';
import { lotLabelsPdf, pieceLabelPdf } from '../../documents/labels';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';

export const labelsRouter = Router();

function sendPdf(res: Response, filename: string, pdf: Buffer) {
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `inline; filename="${filename}"`);
  res.send(pdf);
}

labelsRouter.get(
  '/lots/:id',
  authenticate,
  allow('labels.print'),
  validated({ params: idParams, query: lotLabelQuerySchema }, async ({ params, query }, _req, res) => {
    sendPdf(res, `${lotName(params.id)}-${query.kind}-${query.stock}.pdf`, await lotLabelsPdf(params.id, query.kind, query.stock));
  }),
);

labelsRouter.get(
  '/pieces/:id',
  authenticate,
  allow('labels.print'),
  validated({ params: idParams, query: labelStockQuerySchema }, async ({ params, query }, _req, res) => {
    const { serial, pdf } = await pieceLabelPdf(params.id, query.stock);
    sendPdf(res, `${serial.replace(/[^A-Za-z0-9._-]/g, '_')}-${query.stock}.pdf`, pdf);
  }),
);
