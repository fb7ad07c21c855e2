import { Router } from 'express';
import { partInputSchema, partListQuerySchema, type PartInput } from '../../../shared/schemas/purchasing';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { idParams, type IdParams } from '../../http/params';
import { validate } from '../../http/validate';
import { createPart, findPart, onHandOfPart, updatePart } from './operations';
import { partList, presentPart } from './presenter';

export const partsRouter = Router();

mountList(partsRouter, '/', 'catalog.read', partListQuerySchema, partList);

partsRouter.get('/:id', authenticate, allow('catalog.read'), validate({ params: idParams }), async (req, res) => {
  const { id } = req.valid.params as IdParams;
  res.json(presentPart(await findPart(id), await onHandOfPart(id)));
});

partsRouter.post('/', authenticate, allow('catalog.write'), validate({ body: partInputSchema }), async (req, res) => {
  const part = await createPart(actorOf(req), req.valid.body as PartInput);
  res.status(201).json(presentPart(part, 0));
});

partsRouter.put('/:id', authenticate, allow('catalog.write'), validate({ params: idParams, body: partInputSchema }), async (req, res) => {
  const { id } = req.valid.params as IdParams;
  const part = await updatePart(actorOf(req), id, req.valid.body as PartInput);
  res.json(presentPart(part, await onHandOfPart(id)));
});
