import { Router } from 'express';
import { returnInputSchema, returnListQuerySchema } from '../../../shared/schemas/nonconformance';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { returnList, returnView } from '../../nonconformance/queries';
import { shipReturn } from '../../nonconformance/returns';

export const returnsRouter = Router();

mountList(returnsRouter, '/', 'nonconformance.read', returnListQuerySchema, returnList);

returnsRouter.get(
  '/:id',
  authenticate,
  allow('nonconformance.read'),
  validated({ params: idParams }, async ({ params }, _req, res) => {
    res.json(await returnView(params.id));
  }),
);

returnsRouter.post(
  '/',
  authenticate,
  allow('returns.ship'),
  validated({ body: returnInputSchema }, async ({ body }, req, res) => {
    const shipped = await shipReturn(actorOf(req), body);
    res.status(201).json(await returnView(shipped.id));
  }),
);
