import { Router } from 'express';
import { z } from 'zod';
import { SERIAL_PATTERN } from '../../../shared/serials';
import { allow, authenticate } from '../../auth/authenticate';
import { validated } from '../../http/validate';
import { findPieceHistories } from '../../receiving/pieces';
import { presentPieceHistory } from './presenter';

const serialParams = z.object({ serial: z.string().regex(SERIAL_PATTERN, 'Not a serial number') });

export const piecesRouter = Router();

piecesRouter.get(
  '/:serial',
  authenticate,
  allow('lots.read'),
  validated({ params: serialParams }, async ({ params }, _req, res) => {
    const pieces = (await findPieceHistories(params.serial)).map(presentPieceHistory);
    res.json({ data: pieces, total: pieces.length });
  }),
);
