import { useQuery } from '@tanstack/react-query';
import type { DashboardView } from '@shared/schemas/dashboard';
import { api } from '@/lib/api';

export const dashboardKeys = { all: ['dashboard'] as const };

/** The user's dashboard, read again each time the page is opened and every two minutes while open. */
export const useDashboard = () =>
  useQuery({ queryKey: dashboardKeys.all, queryFn: () => api<DashboardView>('/dashboard'), refetchInterval: 120_000, refetchOnMount: 'always' });
