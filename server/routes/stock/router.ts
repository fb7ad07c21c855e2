import { Router } from 'express';
import { Location } from '../../../db/models';
import { issueInputSchema, moveListQuerySchema, releaseInputSchema, stockQuerySchema, transferInputSchema, type IssueInput, type ReleaseInput, type TransferInput } from '../../../shared/schemas/stock';
import type { StockMove } from '../../../db/models';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { validate } from '../../http/validate';
import { issueToWorkOrder, putAwayLot, transferBetweenBins } from './operations';
import { moveList, presentLocation, stockList } from './presenter';

const moved = (moves: StockMove[]) => ({ moved: moves.length, moveIds: moves.map((m) => m.id) });

export const stockRouter = Router();

mountList(stockRouter, '/moves', 'stock.read', moveListQuerySchema, moveList);

stockRouter.get('/locations', authenticate, allow('stock.read'), async (_req, res) => {
  const locations = await Location.findAll({ order: [['kind', 'ASC'], ['code', 'ASC']] });
  res.json({ data: locations.map(presentLocation), total: locations.length });
});

stockRouter.post('/issue', authenticate, allow('stock.move'), validate({ body: issueInputSchema }), async (req, res) => {
  res.status(201).json(moved(await issueToWorkOrder(actorOf(req), req.valid.body as IssueInput)));
});

stockRouter.post('/transfer', authenticate, allow('stock.move'), validate({ body: transferInputSchema }), async (req, res) => {
  res.status(201).json(moved(await transferBetweenBins(actorOf(req), req.valid.body as TransferInput)));
});

stockRouter.post('/release', authenticate, allow('stock.move'), validate({ body: releaseInputSchema }), async (req, res) => {
  res.status(201).json(moved(await putAwayLot(actorOf(req), req.valid.body as ReleaseInput)));
});

mountList(stockRouter, '/', 'stock.read', stockQuerySchema, stockList);
