import { Router } from 'express';
import { capabilityQuerySchema, scorecardQuerySchema, supplierRankingQuerySchema } from '../../../shared/schemas/supplierPerformance';
import { allow, authenticate } from '../../auth/authenticate';
import { sendCsv } from '../../http/csv';
import { mountList } from '../../http/list';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { supplierPartCapability } from '../../supplierperformance/capability';
import { supplierRanking } from '../../supplierperformance/ranking';
import { supplierScorecard } from '../../supplierperformance/scorecard';
import { scorecardCsvColumns, scorecardCsvRows } from './presenter';

/** Mounted at /suppliers beside the supplier records. */
export const supplierPerformanceRouter = Router();

supplierPerformanceRouter.get(
  '/:id/scorecard',
  authenticate,
  allow('suppliers.performance'),
  validated({ params: idParams, query: scorecardQuerySchema }, async ({ params, query }, req, res) => {
    const view = await supplierScorecard(params.id, query);
    if (req.query.format !== 'csv') return res.json(view);
    const name = `scorecard-${view.supplier.name.replace(/[^A-Za-z0-9]+/g, '-').toLowerCase()}-${view.period.from}-${view.period.to}.csv`;
    await sendCsv(res, name, scorecardCsvColumns(view), scorecardCsvRows(view));
  }),
);

supplierPerformanceRouter.get(
  '/:id/capability',
  authenticate,
  allow('suppliers.performance'),
  validated({ params: idParams, query: capabilityQuerySchema }, async ({ params, query }, _req, res) => {
    res.json(await supplierPartCapability(params.id, query));
  }),
);

/** Mounted at /supplier-scorecards: every supplier's figures over a period, ranked, with CSV. */
export const supplierScorecardsRouter = Router();

mountList(supplierScorecardsRouter, '/', 'suppliers.performance', supplierRankingQuerySchema, supplierRanking);
