import { Router } from 'express';
import { lotListQuerySchema } from '../../../shared/schemas/stock';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { idParams } from '../../http/params';
import { sendUnchangedAnswer } from '../../http/unchangedAnswers';
import { validated } from '../../http/validate';
import { lotList } from '../../receiving/lists';
import { findLot } from '../../receiving/lots';
import { presentLot } from './presenter';

export const lotsRouter = Router();

mountList(lotsRouter, '/', 'lots.read', lotListQuerySchema, lotList);

lotsRouter.get(
  '/:id',
  authenticate,
  allow('lots.read'),
  validated({ params: idParams }, async ({ params }, req, res) => {
    await sendUnchangedAnswer(req, res, `lot ${params.id}`, async () => presentLot(await findLot(params.id)));
  }),
);
