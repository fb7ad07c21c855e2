import { Router } from 'express';
import { databaseIsUp } from '../../../db';

export const healthRouter = Router();

healthRouter.get('/', async (_req, res) => {
  const up = await databaseIsUp();
  res.status(up ? 200 : 503).json({ status: up ? 'ok' : 'degraded', db: up ? 'ok' : 'down' });
});
