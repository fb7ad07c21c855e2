import { Router } from 'express';
import { deviationApprovalSchema, deviationInputSchema, deviationListQuerySchema, deviationWithdrawalSchema } from '../../../shared/schemas/deviations';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { mountList } from '../../http/list';
import { idParams } from '../../http/params';
import { mountRecord } from '../../http/records';
import { validated } from '../../http/validate';
import { deviationList, deviationView } from '../../supplierquality/deviationQueries';
import { approveDeviation, createDeviation, updateDeviation, withdrawDeviation } from '../../supplierquality/deviations';

export const deviationsRouter = Router();

mountList(deviationsRouter, '/', 'deviations.read', deviationListQuerySchema, deviationList);

mountRecord(deviationsRouter, {
  read: 'deviations.read',
  write: 'deviations.manage',
  schema: deviationInputSchema,
  view: deviationView,
  create: createDeviation,
  update: updateDeviation,
});

deviationsRouter.post(
  '/:id/approvals',
  authenticate,
  allow('deviations.approve'),
  validated({ params: idParams, body: deviationApprovalSchema }, async ({ params, body }, req, res) => {
    const { requestId, address } = actorOf(req);
    await approveDeviation(req.user!, params.id, body, { requestId, address });
    res.status(201).json(await deviationView(params.id));
  }),
);

deviationsRouter.post(
  '/:id/withdrawal',
  authenticate,
  allow('deviations.manage'),
  validated({ params: idParams, body: deviationWithdrawalSchema }, async ({ params, body }, req, res) => {
    await withdrawDeviation(actorOf(req), params.id, body.reason);
    res.json(await deviationView(params.id));
  }),
);
