// One user's notifications: the newest ones and the unread count the bell shows, read together, and
// marking them read. Only rows whose permission the user's roles grant today are listed or counted.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { permissionsOf } from '../../shared/policies';
import { UNREAD_COUNT_CAP, type NotificationKind, type NotificationsView } from '../../shared/schemas/notifications';
import type { Role } from '../../shared/schemas/roles';
import { notFound } from '../http/errors';

type Reader = { id: number; roles: readonly Role[] };

const LISTED = 20;

export async function notificationsOf(user: Reader): Promise<NotificationsView> {
  const [row] = await sequelize.query<{
    unread: string;
    rows: { id: number; kind: NotificationKind; title: string; link: string; created_at: string; read_at: string | null }[];
  }>(
    `SELECT (SELECT count(*) FROM (SELECT 1 FROM notifications
               WHERE user_id = :userId AND read_at IS NULL AND permission IN (:granted) LIMIT ${UNREAD_COUNT_CAP}) capped) AS unread,
            (SELECT coalesce(json_agg(n ORDER BY n.created_at DESC, n.id DESC), '[]') FROM (
               SELECT id, kind, title, link, created_at, read_at FROM notifications
                WHERE user_id = :userId AND permission IN (:granted) ORDER BY created_at DESC, id DESC LIMIT ${LISTED}) n) AS rows`,
    { type: QueryTypes.SELECT, replacements: { userId: user.id, granted: permissionsOf(user) } },
  );
  return {
    unread: Number(row.unread),
    data: row.rows.map((n) => ({
      id: n.id,
      kind: n.kind,
      title: n.title,
      link: n.link,
      createdAt: new Date(n.created_at).toISOString(),
      read: n.read_at !== null,
    })),
  };
}

/** Marks one of the user's notifications read (again is harmless); 404 for anyone else's. */
export async function markNotificationRead(user: Reader, id: number) {
  const rows = await sequelize.query<{ id: string }>(
    `UPDATE notifications SET read_at = coalesce(read_at, now()) WHERE id = :id AND user_id = :userId AND permission IN (:granted) RETURNING id`,
    { type: QueryTypes.SELECT, replacements: { id, userId: user.id, granted: permissionsOf(user) } },
  );
  if (rows.length === 0) throw notFound('Notification');
}

/** Marks every notification the user can see read; answers how many were unread. */
export async function markAllNotificationsRead(user: Reader): Promise<number> {
  const rows = await sequelize.query<{ id: string }>(
    `UPDATE notifications SET read_at = now() WHERE user_id = :userId AND read_at IS NULL AND permission IN (:granted) RETURNING id`,
    { type: QueryTypes.SELECT, replacements: { userId: user.id, granted: permissionsOf(user) } },
  );
  return rows.length;
}
