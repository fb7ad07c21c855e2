import { Router } from 'express';
import { userCreateSchema, userUpdateSchema } from '../../../shared/schemas/users';
import { actorOf } from '../../audit/record';
import { allow, authenticate } from '../../auth/authenticate';
import { sendResetLink } from '../../auth/passwords';
import { unlockSigning } from '../../auth/signature';
import { idParams } from '../../http/params';
import { validated } from '../../http/validate';
import { createUser, listUsers, updateUser } from '../../users/users';
import { presentUser } from '../../users/views';

export const usersRouter = Router();

usersRouter.get('/', authenticate, allow('users.manage'), async (_req, res) => {
  const users = await listUsers();
  res.json({ data: users.map(presentUser), total: users.length });
});

usersRouter.post(
  '/',
  authenticate,
  allow('users.manage'),
  validated({ body: userCreateSchema }, async ({ body }, req, res) => {
    res.status(201).json(presentUser(await createUser(actorOf(req), body)));
  }),
);

usersRouter.patch(
  '/:id',
  authenticate,
  allow('users.manage'),
  validated({ params: idParams, body: userUpdateSchema }, async ({ params, body }, req, res) => {
    res.json(presentUser(await updateUser(actorOf(req), params.id, body)));
  }),
);

/** Mails the user a one-time link to choose a new password. */
usersRouter.post(
  '/:id/password-reset-link',
  authenticate,
  allow('users.manage'),
  validated({ params: idParams }, async ({ params }, req, res) => {
    await sendResetLink(actorOf(req), params.id);
    res.status(202).json({ message: 'A link to choose a new password was mailed to the user. It is valid for one hour.' });
  }),
);

/** Lifts the signing lock after too many wrong signature passwords. */
usersRouter.post(
  '/:id/signing-unlock',
  authenticate,
  allow('users.manage'),
  validated({ params: idParams }, async ({ params }, req, res) => {
    res.json(presentUser(await unlockSigning(actorOf(req), params.id)));
  }),
);
