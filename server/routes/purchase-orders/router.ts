import { Router } from 'express';
import { openLinesQuerySchema, poListQuerySchema, purchaseOrderInputSchema } from '../../../shared/schemas/purchasing';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
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

mountRecord(purchaseOrdersRouter, {
  read: 'catalog.read',
  write: 'catalog.write',
  schema: purchaseOrderInputSchema,
  view: async (id) => presentPurchaseOrder(await findPurchaseOrder(id)),
  create: createPurchaseOrder,
  update: updatePurchaseOrder,
});
