import { Router } from 'express';
import { lotListQuerySchema } from '../../../shared/schemas/stock';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { idParams, type IdParams } from '../../http/params';
import { validate } from '../../http/validate';
import { lotList, lotView } from './presenter';

export const lotsRouter = Router();

mountList(lotsRouter, '/', 'lots.read', lotListQuerySchema, lotList);

lotsRouter.get('/:id', authenticate, allow('lots.read'), validate({ params: idParams }), async (req, res) => {
  res.json(await lotView((req.valid.params as IdParams).id));
});
