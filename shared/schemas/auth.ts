import { z } from 'zod';
import { newPasswordSchema } from './password';
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

/** A signed-in user's own password change. */
export const passwordChangeSchema = z
  .object({
    currentPassword: z.string().min(1, 'Enter your current password').max(200),
    newPassword: newPasswordSchema,
  })
  .refine((v) => v.newPassword !== v.currentPassword, { path: ['newPassword'], message: 'Choose a password different from the current one' });
export type PasswordChangeInput = z.infer<typeof passwordChangeSchema>;

/** "Forgot password" on the sign-in page: the address a reset link goes to (if it has an account). */
export const passwordResetRequestSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter a valid e-mail address'),
});
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>;

/** Choosing a new password through a mailed link. */
export const passwordResetSchema = z.object({
  token: z.string().min(20, 'The reset link is incomplete: open it again from the mail').max(100),
  newPassword: newPasswordSchema,
});
export type PasswordResetInput = z.infer<typeof passwordResetSchema>;
