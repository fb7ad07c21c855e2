import { Router } from 'express';
import { resumeInspectionSchema, severityOverrideSchema, switchingListQuerySchema, switchingParams } from '../../../shared/schemas/switching';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { validated } from '../../http/validate';
import { overrideSeverity, resumeInspection } from '../../inspection/switching';
import { findSwitchingPair, switchingList } from '../../inspection/switchingPairs';
import { presentSwitchingPair } from './presenter';

export const switchingRouter = Router();

mountList(switchingRouter, '/', 'switching.read', switchingListQuerySchema, switchingList);

switchingRouter.get(
  '/:supplierId/:partId',
  authenticate,
  allow('switching.read'),
  validated({ params: switchingParams }, async ({ params }, _req, res) => {
    res.json(presentSwitchingPair(await findSwitchingPair(params.supplierId, params.partId)));
  }),
);

switchingRouter.post(
  '/:supplierId/:partId/resume',
  authenticate,
  allow('switching.manage'),
  validated({ params: switchingParams, body: resumeInspectionSchema }, async ({ params, body }, req, res) => {
    const { requestId, address } = actorOf(req);
    res.status(201).json(await resumeInspection(req.user!, params.supplierId, params.partId, body, { requestId, address }));
  }),
);

switchingRouter.post(
  '/:supplierId/:partId/override',
  authenticate,
  allow('switching.manage'),
  validated({ params: switchingParams, body: severityOverrideSchema }, async ({ params, body }, req, res) => {
    const { requestId, address } = actorOf(req);
    res.status(201).json(await overrideSeverity(req.user!, params.supplierId, params.partId, body, { requestId, address }));
  }),
);
