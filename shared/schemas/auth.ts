import { z } from 'zod';
import { roleSchema } from './roles';

export const loginSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter a valid e-mail address'),
  password: z.string().min(1, 'Enter your password').max(200),
});
export type LoginInput = z.infer<typeof loginSchema>;

export const sessionUserSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  roles: z.array(roleSchema),
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

export type LoginResponse = { token: string; user: SessionUser };
