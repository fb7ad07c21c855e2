import { Router } from 'express';
import { z } from 'zod';
import { Instrument } from '../../../db/models';
import { instrumentInputSchema, type InstrumentInput } from '../../../shared/schemas/instruments';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { validate } from '../../http/validate';
import { registerInstrument, updateInstrument } from './operations';
import { presentInstrument } from './presenter';

const idParams = z.object({ id: z.coerce.number().int().positive() });

export const instrumentsRouter = Router();

instrumentsRouter.get('/', authenticate, allow('instruments.read'), async (_req, res) => {
  const instruments = await Instrument.findAll({ order: [['code', 'ASC']] });
  res.json({ data: instruments.map(presentInstrument), total: instruments.length });
});

instrumentsRouter.post('/', authenticate, allow('instruments.manage'), validate({ body: instrumentInputSchema }), async (req, res) => {
  const instrument = await registerInstrument(actorOf(req), req.valid.body as InstrumentInput);
  res.status(201).json(presentInstrument(instrument));
});

instrumentsRouter.put('/:id', authenticate, allow('instruments.manage'), validate({ params: idParams, body: instrumentInputSchema }), async (req, res) => {
  const { id } = req.valid.params as z.infer<typeof idParams>;
  const instrument = await updateInstrument(actorOf(req), id, req.valid.body as InstrumentInput);
  res.json(presentInstrument(instrument));
});
