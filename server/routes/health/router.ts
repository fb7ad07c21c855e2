import { Router } from 'express';
import { healthReport } from '../../http/health';

export const healthRouter = Router();

healthRouter.get('/', async (_req, res) => {
  const { status, body } = await healthReport();
  res.status(status).json(body);
});
