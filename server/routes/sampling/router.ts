// The plan look-up: the single sampling plan a lot size, inspection level, AQL and severity give in
// the published tables (shared/sampling), for forms and tools. Reads nothing stored.
import { Router } from 'express';
import { lookUpPlan } from '../../../shared/sampling';
import { planQuerySchema, type PlanQuery } from '../../../shared/schemas/sampling';
import { allow, authenticate } from '../../auth/authenticate';
import { validate } from '../../http/validate';

export const samplingRouter = Router();

samplingRouter.get('/plan', authenticate, allow('sampling.read'), validate({ query: planQuerySchema }), (req, res) => {
  res.json(lookUpPlan(req.valid.query as PlanQuery));
});
