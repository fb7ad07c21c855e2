import { Router } from 'express';
import { z } from 'zod';
import { User } from '../../../db/models';
import { userCreateSchema, userUpdateSchema, type UserCreateInput, type UserUpdateInput } from '../../../shared/schemas/users';
import { allow, authenticate } from '../../auth/authenticate';
import { validate } from '../../http/validate';
import { actorOf } from '../../audit/record';
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
