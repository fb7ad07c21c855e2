import { Router } from 'express';
import {
  resumeInspectionSchema,
  severityOverrideSchema,
  switchingListQuerySchema,
  switchingParams,
  type ResumeInspectionInput,
  type SeverityOverrideInput,
  type SwitchingParams,
} from '../../../shared/schemas/switching';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { validate } from '../../http/validate';
import { overrideSeverity, resumeInspection } from '../../inspection/switching';
import { switchingList, switchingView } from './presenter';

export const switchingRouter = Router();

mountList(switchingRouter, '/', 'switching.read', switchingListQuerySchema, switchingList);

switchingRouter.get('/:supplierId/:partId', authenticate, allow('switching.read'), validate({ params: switchingParams }), async (req, res) => {
  const { supplierId, partId } = req.valid.params as SwitchingParams;
  res.json(await switchingView(supplierId, partId));
});

switchingRouter.post(
  '/:supplierId/:partId/resume',
  authenticate,
  allow('switching.manage'),
  validate({ params: switchingParams, body: resumeInspectionSchema }),
  async (req, res) => {
    const { supplierId, partId } = req.valid.params as SwitchingParams;
    const { requestId, address } = actorOf(req);
    res.status(201).json(await resumeInspection(req.user!, supplierId, partId, req.valid.body as ResumeInspectionInput, { requestId, address }));
  },
);

switchingRouter.post(
  '/:supplierId/:partId/override',
  authenticate,
  allow('switching.manage'),
  validate({ params: switchingParams, body: severityOverrideSchema }),
  async (req, res) => {
    const { supplierId, partId } = req.valid.params as SwitchingParams;
    const { requestId, address } = actorOf(req);
    res.status(201).json(await overrideSeverity(req.user!, supplierId, partId, req.valid.body as SeverityOverrideInput, { requestId, address }));
  },
);
