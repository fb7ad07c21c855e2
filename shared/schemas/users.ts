import { z } from 'zod';
import { checkPasswordStrength, newPasswordSchema, passwordLengthSchema } from './password';
import { roleSchema } from './roles';

export const userCreateSchema = z
  .object({
    email: z.string().trim().toLowerCase().email('Enter a valid e-mail address'),
    name: z.string().trim().min(1, 'Name is required').max(120),
    password: passwordLengthSchema,
    roles: z.array(roleSchema).min(1, 'Give the user at least one role'),
  })
  // The strength check sees the name and e-mail, which a password must not be built from.
  .superRefine(checkPasswordStrength('password', ['email', 'name']));
export type UserCreateInput = z.infer<typeof userCreateSchema>;

export const userUpdateSchema = z
  .object({
    name: z.string().trim().min(1).max(120),
    roles: z.array(roleSchema).min(1, 'Give the user at least one role'),
    active: z.boolean(),
    password: newPasswordSchema,
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
  /** Signing is locked after too many wrong signature passwords until then (ISO time), or null. */
  signingLockedUntil: string | null;
};
