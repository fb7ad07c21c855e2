import { Router } from 'express';
import { auditAnchorSchema, auditQuerySchema, type AuditAnchor, type AuditQuery } from '../../../shared/schemas/audit';
import { allow, authenticate } from '../../auth/authenticate';
import { actorOf, recordAudit } from '../../audit/record';
import { AUDIT_CSV_COLUMNS, listAuditEvents, streamAuditEvents } from '../../audit/query';
import { chainHead, checkAnchor, verifyAuditChain } from '../../audit/verify';
import { sendCsv } from '../../http/csv';
import { validate } from '../../http/validate';

export const auditRouter = Router();

auditRouter.get('/', authenticate, allow('audit.read'), validate({ query: auditQuerySchema }), async (req, res) => {
  res.json(await listAuditEvents(req.valid.query as AuditQuery));
});

auditRouter.get('/verify', authenticate, allow('audit.read'), async (_req, res) => {
  res.json(await verifyAuditChain());
});

auditRouter.get('/head', authenticate, allow('audit.read'), async (_req, res) => {
  res.json(await chainHead());
});

auditRouter.get('/anchor', authenticate, allow('audit.read'), validate({ query: auditAnchorSchema }), async (req, res) => {
  res.json(await checkAnchor(req.valid.query as AuditAnchor));
});

auditRouter.get('/export.csv', authenticate, allow('audit.read'), validate({ query: auditQuerySchema }), async (req, res) => {
  const query = req.valid.query as AuditQuery;
  await recordAudit(actorOf(req), { action: 'audit.export', entityType: 'audit', after: { filter: query } });
  await sendCsv(res, `audit-trail-${new Date().toISOString().slice(0, 10)}.csv`, AUDIT_CSV_COLUMNS, streamAuditEvents(query));
});
