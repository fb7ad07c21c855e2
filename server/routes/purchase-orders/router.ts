import { Router } from 'express';
import { openLinesQuerySchema, poListQuerySchema, purchaseOrderInputSchema, type PurchaseOrderInput } from '../../../shared/schemas/purchasing';
import type { z } from 'zod';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { idParams, type IdParams } from '../../http/params';
import { validate } from '../../http/validate';
import { createPurchaseOrder, findPurchaseOrder, openLines, updatePurchaseOrder } from './operations';
import { presentOpenLine, presentPurchaseOrder, purchaseOrderList } from './presenter';

export const purchaseOrdersRouter = Router();

mountList(purchaseOrdersRouter, '/', 'catalog.read', poListQuerySchema, purchaseOrderList);

purchaseOrdersRouter.get('/open-lines', authenticate, allow('catalog.read'), validate({ query: openLinesQuerySchema }), async (req, res) => {
  const rows = (await openLines((req.valid.query as z.infer<typeof openLinesQuerySchema>).q)).map(presentOpenLine);
  res.json({ data: rows, total: rows.length });
});

purchaseOrdersRouter.get('/:id', authenticate, allow('catalog.read'), validate({ params: idParams }), async (req, res) => {
  const { order, received } = await findPurchaseOrder((req.valid.params as IdParams).id);
  res.json(presentPurchaseOrder(order, received));
});

purchaseOrdersRouter.post('/', authenticate, allow('catalog.write'), validate({ body: purchaseOrderInputSchema }), async (req, res) => {
  const created = await createPurchaseOrder(actorOf(req), req.valid.body as PurchaseOrderInput);
  const { order, received } = await findPurchaseOrder(created.id);
  res.status(201).json(presentPurchaseOrder(order, received));
});

purchaseOrdersRouter.put('/:id', authenticate, allow('catalog.write'), validate({ params: idParams, body: purchaseOrderInputSchema }), async (req, res) => {
  const { id } = req.valid.params as IdParams;
  await updatePurchaseOrder(actorOf(req), id, req.valid.body as PurchaseOrderInput);
  const { order, received } = await findPurchaseOrder(id);
  res.json(presentPurchaseOrder(order, received));
});
