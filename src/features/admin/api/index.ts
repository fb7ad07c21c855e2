import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ListResponse } from '@shared/schemas/paging';
import type { UserCreateInput, UserUpdateInput, UserView } from '@shared/schemas/users';
import type { SiteSettings } from '@shared/schemas/settings';
import type { CaughtMessage } from '@shared/schemas/mail';
import { api } from '@/lib/api';

type OutboxEntry = {
  id: number;
  recipients: string[];
  subject: string;
  status: 'queued' | 'sent';
  attempts: number;
  nextAttemptAt: string | null;
  lastError: string | null;
  sentAt: string | null;
  createdAt: string;
};

export const adminKeys = {
  users: ['admin', 'users'] as const,
  caughtMail: ['admin', 'caught-mail'] as const,
  outbox: ['admin', 'outbox'] as const,
};

export const useUsers = () => useQuery({ queryKey: adminKeys.users, queryFn: () => api<ListResponse<UserView>>('/users') });

export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UserCreateInput) => api<UserView>('/users', { body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.users }),
  });
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: UserUpdateInput & { id: number }) => api<UserView>(`/users/${id}`, { method: 'PATCH', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.users }),
  });
}

export function useSendResetLink() {
  return useMutation({ mutationFn: (id: number) => api<{ message: string }>(`/users/${id}/password-reset-link`, { method: 'POST' }) });
}

export function useUnlockSigning() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<UserView>(`/users/${id}/signing-unlock`, { method: 'POST' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.users }),
  });
}

export const useCaughtMail = () =>
  useQuery({
    queryKey: adminKeys.caughtMail,
    queryFn: () => api<ListResponse<CaughtMessage> & { catcherEnabled: boolean }>('/mail/caught'),
    refetchInterval: 10_000,
  });

export const useOutbox = () => useQuery({ queryKey: adminKeys.outbox, queryFn: () => api<ListResponse<OutboxEntry>>('/mail/outbox'), refetchInterval: 10_000 });

export const settingsKeys = { site: ['settings', 'site'] as const };

export const useSiteSettings = () => useQuery({ queryKey: settingsKeys.site, queryFn: () => api<SiteSettings>('/settings') });

export function useSaveSiteSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SiteSettings) => api<SiteSettings>('/settings', { method: 'PUT', body: input }),
    onSuccess: (saved) => queryClient.setQueryData(settingsKeys.site, saved),
  });
}
