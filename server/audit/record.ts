// Records who did what. Call it inside the same transaction as the change it describes, so the
// trail and the data never disagree.
import type { Request } from 'express';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import type { User } from '../../db/models';

export type AuditActor = { id: number | null; email: string | null; roles: string[]; requestId?: string; address?: string };

export type AuditEntry = {
  action: string;
  entityType: string;
  entityId?: string | number | null;
  before?: unknown;
  after?: unknown;
};

export const actorFromUser = (user: User): AuditActor => ({ id: user.id, email: user.email, roles: user.roles });

/** The actor of a request: its signed-in user (if any), request id and client address. */
export function actorOf(req: Request, user: User | undefined = req.user): AuditActor {
  return {
    id: user?.id ?? null,
    email: user?.email ?? null,
    roles: user?.roles ?? [],
    requestId: String(req.id ?? ''),
    address: req.ip,
  };
}

/** A system actor for work no person started (workers, seeds). */
export const SYSTEM_ACTOR: AuditActor = { id: null, email: 'system', roles: [] };

const json = (value: unknown) => (value === undefined || value === null ? null : JSON.stringify(value));

export async function recordAudit(actor: AuditActor, entry: AuditEntry, transaction?: Transaction) {
  await sequelize.query(
    `INSERT INTO audit_events (actor_id, actor_email, actor_roles, action, entity_type, entity_id, before, after, request_id, address)
     VALUES (:actorId, :actorEmail, :roles::varchar(20)[], :action, :entityType, :entityId, :before::jsonb, :after::jsonb, :requestId, :address)`,
    {
      type: QueryTypes.INSERT,
      transaction,
      replacements: {
        actorId: actor.id,
        actorEmail: actor.email,
        roles: `{${actor.roles.join(',')}}`,
        action: entry.action,
        entityType: entry.entityType,
        entityId: entry.entityId === undefined || entry.entityId === null ? null : String(entry.entityId),
        before: json(entry.before),
        after: json(entry.after),
        requestId: actor.requestId || null,
        address: actor.address ?? null,
      },
    },
  );
}
