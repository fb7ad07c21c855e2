import { Router } from 'express';
import { auditAnchorSchema, auditQuerySchema } from '../../../shared/schemas/audit';
import { allow, authenticate } from '../../auth/authenticate';
import { actorOf, recordAudit } from '../../audit/record';
import { AUDIT_CSV_COLUMNS, auditChoices, listAuditEvents, streamAuditEvents } from '../../audit/query';
import { chainHead, checkAnchor, verifyAuditChain } from '../../audit/verify';
import { sendCsv } from '../../http/csv';
import { sendUnchangedAnswer } from '../../http/unchangedAnswers';
import { validated } from '../../http/validate';

export const auditRouter = Router();

auditRouter.get(
  '/',
  authenticate,
  allow('audit.read'),
  validated({ query: auditQuerySchema }, async ({ query }, req, res) => {
    await sendUnchangedAnswer(req, res, `audit ${JSON.stringify(query)}`, () => listAuditEvents(query));
  }),
);

auditRouter.get('/choices', authenticate, allow('audit.read'), async (_req, res) => {
  res.json(await auditChoices());
});

auditRouter.get('/verify', authenticate, allow('audit.read'), async (_req, res) => {
  res.json(await verifyAuditChain());
});

auditRouter.get('/head', authenticate, allow('audit.read'), async (_req, res) => {
  res.json(await chainHead());
});

auditRouter.get(
  '/anchor',
  authenticate,
  allow('audit.read'),
  validated({ query: auditAnchorSchema }, async ({ query }, _req, res) => {
    res.json(await checkAnchor(query));
  }),
);

auditRouter.get(
  '/export.csv',
  authenticate,
  allow('audit.read'),
  validated({ query: auditQuerySchema }, async ({ query }, req, res) => {
    await recordAudit(actorOf(req), { action: 'audit.export', entityType: 'audit', after: { filter: query } });
    await sendCsv(res, `audit-trail-${new Date().toISOString().slice(0, 10)}.csv`, AUDIT_CSV_COLUMNS, streamAuditEvents(query));
  }),
);
