import { Router } from 'express';
import { supplierInputSchema, supplierListQuerySchema } from '../../../shared/schemas/purchasing';
import { mountList } from '../../http/list';
import { mountRecord } from '../../http/records';
import { createSupplier, findSupplier, updateSupplier } from './operations';
import { presentSupplier, supplierList } from './presenter';

export const suppliersRouter = Router();

mountList(suppliersRouter, '/', 'catalog.read', supplierListQuerySchema, supplierList);

mountRecord(suppliersRouter, {
  read: 'catalog.read',
  write: 'catalog.write',
  schema: supplierInputSchema,
  view: async (id) => {
    const { supplier, openOrders } = await findSupplier(id);
    return presentSupplier(supplier, openOrders);
  },
  create: createSupplier,
  update: updateSupplier,
});
