import { Router } from 'express';
import { supplierInputSchema, supplierListQuerySchema, type SupplierInput } from '../../../shared/schemas/purchasing';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { idParams, type IdParams } from '../../http/params';
import { validate } from '../../http/validate';
import { createSupplier, findSupplier, updateSupplier } from './operations';
import { presentSupplier, supplierList } from './presenter';

export const suppliersRouter = Router();

mountList(suppliersRouter, '/', 'catalog.read', supplierListQuerySchema, supplierList);

suppliersRouter.get('/:id', authenticate, allow('catalog.read'), validate({ params: idParams }), async (req, res) => {
  const { supplier, openOrders } = await findSupplier((req.valid.params as IdParams).id);
  res.json(presentSupplier(supplier, openOrders));
});

suppliersRouter.post('/', authenticate, allow('catalog.write'), validate({ body: supplierInputSchema }), async (req, res) => {
  const created = await createSupplier(actorOf(req), req.valid.body as SupplierInput);
  const { supplier, openOrders } = await findSupplier(created.id);
  res.status(201).json(presentSupplier(supplier, openOrders));
});

suppliersRouter.put('/:id', authenticate, allow('catalog.write'), validate({ params: idParams, body: supplierInputSchema }), async (req, res) => {
  const { id } = req.valid.params as IdParams;
  await updateSupplier(actorOf(req), id, req.valid.body as SupplierInput);
  const { supplier, openOrders } = await findSupplier(id);
  res.json(presentSupplier(supplier, openOrders));
});
