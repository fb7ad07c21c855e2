import { Router } from 'express';
import {
  defectCodeInputSchema,
  ncrCloseSchema,
  ncrDispositionSchema,
  ncrListQuerySchema,
  ncrOpenSchema,
  ncrUpdateSchema,
  reworkReleaseSchema,
} from '../../../shared/schemas/nonconformance';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { createDefectCode, listDefectCodes, updateDefectCode } from '../../nonconformance/defectCodes';
import { closeNcr, openNcrByHand, releaseReworked, signNcrDisposition, updateNcr } from '../../nonconformance/ncrs';
import { ncrList, ncrView } from '../../nonconformance/queries';

export const nonconformancesRouter = Router();

mountList(nonconformancesRouter, '/', 'nonconformance.read', ncrListQuerySchema, ncrList);

// The catalogue comes before '/:id', which would take its name for an id.
nonconformancesRouter.get('/defect-codes', authenticate, allow('nonconformance.read'), async (_req, res) => {
  const data = await listDefectCodes();
  res.json({ data, total: data.length });
});

nonconformancesRouter.post(
  '/defect-codes',
  authenticate,
  allow('defect-codes.manage'),
  validated({ body: defectCodeInputSchema }, async ({ body }, req, res) => {
    const code = await createDefectCode(actorOf(req), body);
    res.status(201).json({ id: code.id, code: code.code, label: code.label, active: code.active });
  }),
);

nonconformancesRouter.put(
  '/defect-codes/:id',
  authenticate,
  allow('defect-codes.manage'),
  validated({ params: idParams, body: defectCodeInputSchema }, async ({ params, body }, req, res) => {
    const code = await updateDefectCode(actorOf(req), params.id, body);
    res.json({ id: code.id, code: code.code, label: code.label, active: code.active });
  }),
);

nonconformancesRouter.get(
  '/:id',
  authenticate,
  allow('nonconformance.read'),
  validated({ params: idParams }, async ({ params }, _req, res) => {
    res.json(await ncrView(params.id));
  }),
);

nonconformancesRouter.post(
  '/',
  authenticate,
  allow('nonconformance.open'),
  validated({ body: ncrOpenSchema }, async ({ body }, req, res) => {
    const ncr = await openNcrByHand(actorOf(req), body);
    res.status(201).json(await ncrView(ncr.id));
  }),
);

nonconformancesRouter.put(
  '/:id',
  authenticate,
  allow('nonconformance.open'),
  validated({ params: idParams, body: ncrUpdateSchema }, async ({ params, body }, req, res) => {
    await updateNcr(actorOf(req), params.id, body);
    res.json(await ncrView(params.id));
  }),
);

nonconformancesRouter.post(
  '/:id/dispositions',
  authenticate,
  allow('nonconformance.disposition'),
  validated({ params: idParams, body: ncrDispositionSchema }, async ({ params, body }, req, res) => {
    const { requestId, address } = actorOf(req);
    await signNcrDisposition(req.user!, params.id, body, { requestId, address });
    res.status(201).json(await ncrView(params.id));
  }),
);

nonconformancesRouter.post(
  '/:id/rework-release',
  authenticate,
  allow('nonconformance.disposition'),
  validated({ params: idParams, body: reworkReleaseSchema }, async ({ params, body }, req, res) => {
    const { requestId, address } = actorOf(req);
    await releaseReworked(req.user!, params.id, body, { requestId, address });
    res.status(201).json(await ncrView(params.id));
  }),
);

nonconformancesRouter.post(
  '/:id/close',
  authenticate,
  allow('nonconformance.disposition'),
  validated({ params: idParams, body: ncrCloseSchema }, async ({ params, body }, req, res) => {
    await closeNcr(actorOf(req), params.id, body);
    res.json(await ncrView(params.id));
  }),
);
