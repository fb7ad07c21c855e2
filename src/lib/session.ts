import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { LoginInput, LoginResponse, SessionUser } from '@shared/schemas/auth';
import { api, ApiError } from '@/lib/api';

export const sessionKeys = { all: ['session'] as const };

/** The signed-in user, or null when nobody is signed in. */
export function useSession() {
  return useQuery({
    queryKey: sessionKeys.all,
    queryFn: async () => {
      try {
        return (await api<{ user: SessionUser }>('/auth/me')).user;
      } catch (error) {
        // This is the session check: any 401 here means nobody is signed in.
        if (error instanceof ApiError && error.status === 401) return null;
        throw error;
      }
    },
    staleTime: 5 * 60 * 1000,
  });
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: LoginInput) => api<LoginResponse>('/auth/login', { body: input }),
    onSuccess: (result) => {
      queryClient.clear();
      queryClient.setQueryData(sessionKeys.all, result.user);
    },
  });
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api<void>('/auth/logout', { method: 'POST' }),
    onSuccess: () => {
      queryClient.clear();
      queryClient.setQueryData(sessionKeys.all, null);
    },
  });
}
