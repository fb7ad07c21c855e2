import { z } from 'zod';
import { listQuerySchema } from './paging';

export const auditQuerySchema = listQuerySchema.extend({
  from: z.iso.date().optional(),
  to: z.iso.date().optional(),
  action: z.string().max(80).optional(),
  entityType: z.string().max(60).optional(),
  entityId: z.string().max(120).optional(),
  actor: z.string().max(254).optional(),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export type AuditEventView = {
  id: string;
  /** Position in the hash chain; rows link to the one at seq - 1. */
  seq: string;
  occurredAt: string;
  actorEmail: string | null;
  actorRoles: string[];
  action: string;
  entityType: string;
  entityId: string | null;
  before: unknown;
  after: unknown;
  requestId: string | null;
  address: string | null;
  prevHash: string | null;
  hash: string;
};

/** What the trail's filters offer: the record types on the trail and the people who may act, by name. */
export type AuditChoicesView = {
  recordTypes: string[];
  actors: { email: string; name: string }[];
};

/** The last link of the audit chain, for an outside copy to anchor. */
export type AuditChainHead = { seq: string; hash: string | null; occurredAt: string | null };

export type AuditChainProblem = 'content changed' | 'link broken' | 'rows missing before it' | 'head does not name the last row';

/** The chain re-computed: the events checked, the head it reached, and the first problems by position. */
export type AuditChainReport = {
  intact: boolean;
  checked: number;
  head: AuditChainHead;
  problems: { id: string | null; seq: string; problem: AuditChainProblem }[];
};

/** An anchor taken earlier (a chain position and the hash printed for it), to check against the trail. */
export const auditAnchorSchema = z.object({
  seq: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER),
  hash: z
    .string()
    .trim()
    .toLowerCase()
    .regex(/^[0-9a-f]{64}$/, 'The hash is the 64-character SHA-256 printed with the chain head'),
});
export type AuditAnchor = z.infer<typeof auditAnchorSchema>;
export type AuditAnchorCheck = { seq: string; matches: boolean; message: string };
