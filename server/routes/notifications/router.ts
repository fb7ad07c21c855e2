import { Router } from 'express';
import { allow, authenticate } from '../../auth/authenticate';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { markAllNotificationsRead, markNotificationRead, notificationsOf } from '../../notifications/inbox';

export const notificationsRouter = Router();

notificationsRouter.get('/', authenticate, allow('notifications.read'), async (req, res) => {
  res.json(await notificationsOf(req.user!));
});

notificationsRouter.post('/read-all', authenticate, allow('notifications.read'), async (req, res) => {
  res.json({ marked: await markAllNotificationsRead(req.user!) });
});

notificationsRouter.post(
  '/:id/read',
  authenticate,
  allow('notifications.read'),
  validated({ params: idParams }, async ({ params }, req, res) => {
    await markNotificationRead(req.user!, params.id);
    res.status(204).end();
  }),
);
