import { useMutation } from '@tanstack/react-query';
import type { PasswordChangeInput, PasswordResetInput, PasswordResetRequestInput } from '@shared/schemas/auth';
import { api } from '@/lib/api';

export const useChangePassword = () => useMutation({ mutationFn: (input: PasswordChangeInput) => api<void>('/auth/password', { body: input }) });

export const useRequestPasswordReset = () =>
  useMutation({ mutationFn: (input: PasswordResetRequestInput) => api<{ message: string }>('/auth/password-reset/request', { body: input }) });

export const useResetPassword = () => useMutation({ mutationFn: (input: PasswordResetInput) => api<void>('/auth/password-reset', { body: input }) });
