import { Router } from 'express';
import { z } from 'zod';
import { SERIAL_PATTERN } from '../../../shared/serials';
import { allow, authenticate } from '../../auth/authenticate';
import { validate } from '../../http/validate';
import { pieceHistories } from './presenter';

const serialParams = z.object({ serial: z.string().regex(SERIAL_PATTERN, 'Not a serial number') });

export const piecesRouter = Router();

piecesRouter.get('/:serial', authenticate, allow('lots.read'), validate({ params: serialParams }), async (req, res) => {
  const { serial } = req.valid.params as z.infer<typeof serialParams>;
  const pieces = await pieceHistories(serial);
  res.json({ data: pieces, total: pieces.length });
});
