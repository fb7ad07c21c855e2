import { Router } from 'express';
import { partInputSchema, partListQuerySchema } from '../../../shared/schemas/purchasing';
import { mountList } from '../../http/list';
import { mountRecord } from '../../http/records';
import { partList } from '../../purchasing/lists';
import { createPart, findPart, updatePart } from '../../purchasing/parts';
import { presentPart } from './presenter';

export const partsRouter = Router();

mountList(partsRouter, '/', 'catalog.read', partListQuerySchema, partList);

mountRecord(partsRouter, {
  read: 'catalog.read',
  write: 'catalog.write',
  schema: partInputSchema,
  view: async (id) => presentPart(await findPart(id)),
  create: createPart,
  update: updatePart,
});
