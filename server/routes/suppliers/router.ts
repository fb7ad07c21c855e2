import { Router } from 'express';
import { supplierInputSchema, supplierListQuerySchema } from '../../../shared/schemas/purchasing';
import { mountList } from '../../http/list';
import { mountRecord } from '../../http/records';
import { supplierList } from '../../purchasing/lists';
import { createSupplier, findSupplier, updateSupplier } from '../../purchasing/suppliers';
import { presentSupplier } from './presenter';

export const suppliersRouter = Router();

mountList(suppliersRouter, '/', 'catalog.read', supplierListQuerySchema, supplierList);

mountRecord(suppliersRouter, {
  read: 'catalog.read',
  write: 'catalog.write',
  schema: supplierInputSchema,
  view: async (id) => presentSupplier(await findSupplier(id)),
  create: createSupplier,
  update: updateSupplier,
});
