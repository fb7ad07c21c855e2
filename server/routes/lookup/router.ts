import { Router } from 'express';
import { lookupQuerySchema, type LookupView } from '../../../shared/schemas/labels';
import { authenticate } from '../../auth/authenticate';
import { validated } from '../../http/validate';
import { lookupCode } from '../../receiving/lookup';

export const lookupRouter = Router();

// Open to every signed-in user: the look-up answers only what the user's roles may read.
lookupRouter.get(
  '/',
  authenticate,
  validated({ query: lookupQuerySchema }, async ({ query }, req, res) => {
    const view: LookupView = { code: query.code, matches: await lookupCode(req.user!, query.code) };
    res.json(view);
  }),
);
