import { z } from 'zod';
import { roleSchema } from './roles';

const password = z.string().min(10, 'At least 10 characters').max(200);

export const userCreateSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter a valid e-mail address'),
  name: z.string().trim().min(1, 'Name is required').max(120),
  password,
  roles: z.array(roleSchema).min(1, 'Give the user at least one role'),
});
export type UserCreateInput = z.infer<typeof userCreateSchema>;

export const userUpdateSchema = z
  .object({
    name: z.string().trim().min(1).max(120),
    roles: z.array(roleSchema).min(1, 'Give the user at least one role'),
    active: z.boolean(),
    password,
  })
  .partial();
export type UserUpdateInput = z.infer<typeof userUpdateSchema>;

export type UserView = {
  id: number;
  email: string;
  name: string;
  roles: z.infer<typeof roleSchema>[];
  active: boolean;
  createdAt: string;
  lastSignInAt: string | null;
};
