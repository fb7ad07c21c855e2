import { Router } from 'express';
import type { z } from 'zod';
import { openLinesQuerySchema, poListQuerySchema, purchaseOrderInputSchema } from '../../../shared/schemas/purchasing';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { mountRecord } from '../../http/records';
import { validate } from '../../http/validate';
import { createPurchaseOrder, findPurchaseOrder, openLines, updatePurchaseOrder } from './operations';
import { presentOpenLine, presentPurchaseOrder, purchaseOrderList } from './presenter';

export const purchaseOrdersRouter = Router();

mountList(purchaseOrdersRouter, '/', 'catalog.read', poListQuerySchema, purchaseOrderList);

purchaseOrdersRouter.get('/open-lines', authenticate, allow('catalog.read'), validate({ query: openLinesQuerySchema }), async (req, res) => {
  const rows = (await openLines((req.valid.query as z.infer<typeof openLinesQuerySchema>).q)).map(presentOpenLine);
  res.json({ data: rows, total: rows.length });
});

mountRecord(purchaseOrdersRouter, {
  read: 'catalog.read',
  write: 'catalog.write',
  schema: purchaseOrderInputSchema,
  view: async (id) => {
    const { order, received, outcomes } = await findPurchaseOrder(id);
    return presentPurchaseOrder(order, received, outcomes);
  },
  create: createPurchaseOrder,
  update: updatePurchaseOrder,
});
