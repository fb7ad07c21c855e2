import { Router } from 'express';
import { openLinesQuerySchema, poListQuerySchema, purchaseOrderInputSchema } from '../../../shared/schemas/purchasing';
import { allow, authenticate } from '../../auth/authenticate';
import { purchaseOrderPdf } from '../../documents/purchaseOrderSheet';
import { mountList } from '../../http/list';
import { idParams } from '../../http/params';
import { mountRecord } from '../../http/records';
import { validated } from '../../http/validate';
import { purchaseOrderList } from '../../purchasing/lists';
import { createPurchaseOrder, findPurchaseOrder, openLines, updatePurchaseOrder } from '../../purchasing/purchaseOrders';
import { presentOpenLine, presentPurchaseOrder } from './presenter';

export const purchaseOrdersRouter = Router();

mountList(purchaseOrdersRouter, '/', 'catalog.read', poListQuerySchema, purchaseOrderList);

purchaseOrdersRouter.get(
  '/open-lines',
  authenticate,
  allow('catalog.read'),
  validated({ query: openLinesQuerySchema }, async ({ query }, _req, res) => {
    const rows = (await openLines(query.q)).map(presentOpenLine);
    res.json({ data: rows, total: rows.length });
  }),
);

// The PO as a PDF to send to the supplier: what the PO page shows, so whoever reads POs may have it.
purchaseOrdersRouter.get(
  '/:id/order.pdf',
  authenticate,
  allow('catalog.read'),
  validated({ params: idParams }, async ({ params }, _req, res) => {
    const { number, pdf } = await purchaseOrderPdf(params.id);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `inline; filename="${number.replace(/[^A-Za-z0-9._-]/g, '_')}.pdf"`);
    res.send(pdf);
  }),
);

mountRecord(purchaseOrdersRouter, {
  read: 'catalog.read',
  write: 'catalog.write',
  schema: purchaseOrderInputSchema,
  view: async (id) => presentPurchaseOrder(await findPurchaseOrder(id)),
  create: createPurchaseOrder,
  update: updatePurchaseOrder,
});
