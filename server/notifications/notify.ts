// Writing notifications: called by an operation inside the transaction of the event it tells of, so a
// refused or rolled-back operation leaves none. A notification goes to the users it concerns (named,
// or holding a role) who are active, are not the one who acted, and whose roles grant the permission
// its subject needs to be read: nobody is told of what they may not open.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { POLICIES, type Permission } from '../../shared/policies';
import type { NotificationKind } from '../../shared/schemas/notifications';
import type { Role } from '../../shared/schemas/roles';

export type NotificationDraft = {
  kind: NotificationKind;
  /** What reading the subject needs: checked when writing and again when the list is read. */
  permission: Permission;
  title: string;
  link: string;
  entity: { type: string; id: number };
  users?: readonly number[];
  roles?: readonly Role[];
  /** The user whose act this is: they need no telling. */
  actorId?: number | null;
};

/** Writes one notification per recipient; answers how many were written. */
export async function notify(draft: NotificationDraft, transaction: Transaction): Promise<number> {
  const rows = await sequelize.query<{ id: string }>(
    `INSERT INTO notifications (user_id, kind, permission, title, link, entity_type, entity_id)
     SELECT u.id, :kind, :permission, :title, :link, :entityType, :entityId FROM users u
      WHERE u.active
        AND u.roles && ARRAY(SELECT jsonb_array_elements_text(CAST(:allowed AS jsonb)))::varchar(20)[]
        AND (u.id IN (SELECT (jsonb_array_elements_text(CAST(:users AS jsonb)))::int)
             OR u.roles && ARRAY(SELECT jsonb_array_elements_text(CAST(:roles AS jsonb)))::varchar(20)[])
        AND u.id IS DISTINCT FROM :actorId
     RETURNING id`,
    {
      type: QueryTypes.SELECT,
      transaction,
      replacements: {
        kind: draft.kind,
        permission: draft.permission,
        title: draft.title.slice(0, 300),
        link: draft.link,
        entityType: draft.entity.type,
        entityId: draft.entity.id,
        allowed: JSON.stringify(POLICIES[draft.permission]),
        users: JSON.stringify(draft.users ?? []),
        roles: JSON.stringify(draft.roles ?? []),
        actorId: draft.actorId ?? null,
      },
    },
  );
  return rows.length;
}

/** The buyer of the lot's PO; every buyer when the PO names none. */
export async function buyersOfLot(lotId: number, transaction: Transaction): Promise<Pick<NotificationDraft, 'users' | 'roles'>> {
  const [row] = await sequelize.query<{ buyer_id: number | null }>(
    `SELECT po.buyer_id FROM lots l JOIN purchase_order_lines pl ON pl.id = l.po_line_id JOIN purchase_orders po ON po.id = pl.purchase_order_id
      WHERE l.id = :lotId`,
    { type: QueryTypes.SELECT, transaction, replacements: { lotId } },
  );
  return row?.buyer_id ? { users: [row.buyer_id] } : { roles: ['buyer'] };
}

/** The buyer who owns the supplier; every buyer when the supplier has none. */
export async function buyersOfSupplier(supplierId: number, transaction: Transaction): Promise<Pick<NotificationDraft, 'users' | 'roles'>> {
  const [row] = await sequelize.query<{ owner_id: number | null }>('SELECT owner_id FROM suppliers WHERE id = :supplierId', {
    type: QueryTypes.SELECT,
    transaction,
    replacements: { supplierId },
  });
  return row?.owner_id ? { users: [row.owner_id] } : { roles: ['buyer'] };
}
