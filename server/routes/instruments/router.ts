import { Router } from 'express';
import { instrumentInputSchema } from '../../../shared/schemas/instruments';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { listInstruments, registerInstrument, updateInstrument } from '../../instruments/instruments';
import { presentInstrument } from '../../instruments/views';

export const instrumentsRouter = Router();

instrumentsRouter.get('/', authenticate, allow('instruments.read'), async (_req, res) => {
  const instruments = await listInstruments();
  res.json({ data: instruments.map(presentInstrument), total: instruments.length });
});

instrumentsRouter.post(
  '/',
  authenticate,
  allow('instruments.manage'),
  validated({ body: instrumentInputSchema }, async ({ body }, req, res) => {
    res.status(201).json(presentInstrument(await registerInstrument(actorOf(req), body)));
  }),
);

instrumentsRouter.put(
  '/:id',
  authenticate,
  allow('instruments.manage'),
  validated({ params: idParams, body: instrumentInputSchema }, async ({ params, body }, req, res) => {
    res.json(presentInstrument(await updateInstrument(actorOf(req), params.id, body)));
  }),
);
