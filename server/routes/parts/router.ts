import { Router } from 'express';
import { partInputSchema, partListQuerySchema } from '../../../shared/schemas/purchasing';
import { mountList } from '../../http/list';
import { mountRecord } from '../../http/records';
import { createPart, findPart, onHandOfPart, updatePart } from './operations';
import { partList, presentPart } from './presenter';

export const partsRouter = Router();

mountList(partsRouter, '/', 'catalog.read', partListQuerySchema, partList);

mountRecord(partsRouter, {
  read: 'catalog.read',
  write: 'catalog.write',
  schema: partInputSchema,
  view: async (id) => presentPart(await findPart(id), await onHandOfPart(id)),
  create: createPart,
  update: updatePart,
});
