import { Router } from 'express';
import { issueInputSchema, moveListQuerySchema, releaseInputSchema, stockQuerySchema, transferInputSchema } from '../../../shared/schemas/stock';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { validated } from '../../http/validate';
import { moveList, stockList } from '../../stock/lists';
import { listLocations } from '../../stock/locations';
import { issueToWorkOrder, putAwayLot, transferBetweenBins } from '../../stock/moves';
import { presentLocation, presentMoves } from './presenter';

export const stockRouter = Router();

mountList(stockRouter, '/moves', 'stock.read', moveListQuerySchema, moveList);

stockRouter.get('/locations', authenticate, allow('stock.read'), async (_req, res) => {
  const locations = await listLocations();
  res.json({ data: locations.map(presentLocation), total: locations.length });
});

stockRouter.post(
  '/issue',
  authenticate,
  allow('stock.move'),
  validated({ body: issueInputSchema }, async ({ body }, req, res) => {
    res.status(201).json(presentMoves(await issueToWorkOrder(actorOf(req), body)));
  }),
);

stockRouter.post(
  '/transfer',
  authenticate,
  allow('stock.move'),
  validated({ body: transferInputSchema }, async ({ body }, req, res) => {
    res.status(201).json(presentMoves(await transferBetweenBins(actorOf(req), body)));
  }),
);

stockRouter.post(
  '/release',
  authenticate,
  allow('stock.move'),
  validated({ body: releaseInputSchema }, async ({ body }, req, res) => {
    res.status(201).json(presentMoves(await putAwayLot(actorOf(req), body)));
  }),
);

mountList(stockRouter, '/', 'stock.read', stockQuerySchema, stockList);
