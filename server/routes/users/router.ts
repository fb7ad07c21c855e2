import { Router } from 'express';
import { z } from 'zod';
import { User } from '../../../db/models';
import { userCreateSchema, userUpdateSchema, type UserCreateInput, type UserUpdateInput } from '../../../shared/schemas/users';
import { allow, authenticate } from '../../auth/authenticate';
import { validate } from '../../http/validate';
import { actorOf } from '../../audit/record';
import { sendResetLink } from '../../auth/passwords';
import { unlockSigning } from '../../auth/signature';
import { createUser, updateUser } from './operations';
import { presentUser } from './presenter';

const idParams = z.object({ id: z.coerce.number().int().positive() });

export const usersRouter = Router();

usersRouter.get('/', authenticate, allow('users.manage'), async (_req, res) => {
  const users = await User.findAll({ order: [['name', 'ASC']] });
  res.json({ data: users.map(presentUser), total: users.length });
});

usersRouter.post('/', authenticate, allow('users.manage'), validate({ body: userCreateSchema }), async (req, res) => {
  const user = await createUser(actorOf(req), req.valid.body as UserCreateInput);
  res.status(201).json(presentUser(user));
});

usersRouter.patch('/:id', authenticate, allow('users.manage'), validate({ params: idParams, body: userUpdateSchema }), async (req, res) => {
  const { id } = req.valid.params as z.infer<typeof idParams>;
  const user = await updateUser(actorOf(req), id, req.valid.body as UserUpdateInput);
  res.json(presentUser(user));
});

/** Mails the user a one-time link to choose a new password. */
usersRouter.post('/:id/password-reset-link', authenticate, allow('users.manage'), validate({ params: idParams }), async (req, res) => {
  const { id } = req.valid.params as z.infer<typeof idParams>;
  await sendResetLink(actorOf(req), id);
  res.status(202).json({ message: 'A link to choose a new password was mailed to the user. It is valid for one hour.' });
});

/** Lifts the signing lock after too many wrong signature passwords. */
usersRouter.post('/:id/signing-unlock', authenticate, allow('users.manage'), validate({ params: idParams }), async (req, res) => {
  const { id } = req.valid.params as z.infer<typeof idParams>;
  res.json(presentUser(await unlockSigning(actorOf(req), id)));
});
