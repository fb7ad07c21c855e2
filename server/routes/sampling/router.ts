// The plan look-up: the single sampling plan a lot size, inspection level, AQL and severity give in
// the published tables (shared/sampling), for forms and tools. Reads nothing stored.
import { Router } from 'express';
import { lookUpPlan } from '../../../shared/sampling';
import { planQuerySchema } from '../../../shared/schemas/sampling';
import { allow, authenticate } from '../../auth/authenticate';
import { validated } from '../../http/validate';

export const samplingRouter = Router();

samplingRouter.get(
  '/plan',
  authenticate,
  allow('sampling.read'),
  validated({ query: planQuerySchema }, ({ query }, _req, res) => {
    res.json(lookUpPlan(query));
  }),
);
