import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { CapabilityView, SupplierRankingRow, SupplierScorecardView } from '@shared/schemas/supplierPerformance';
import type { ListState } from '@/components/DataTable';
import { api } from '@/lib/api';
import { listPage } from '@/lib/lists';

type Period = { from?: string; to?: string };

export const performanceKeys = {
  all: ['supplier-performance'] as const,
  ranking: (query: ListState & Period) => [...performanceKeys.all, 'ranking', query] as const,
  scorecard: (supplierId: number, period: Period) => [...performanceKeys.all, 'scorecard', supplierId, period] as const,
  capability: (supplierId: number, partId: number, period: Period) => [...performanceKeys.all, 'capability', supplierId, partId, period] as const,
};

export const useSupplierRanking = (query: ListState & Period) =>
  useQuery({
    queryKey: performanceKeys.ranking(query),
    queryFn: listPage<SupplierRankingRow>('/supplier-scorecards', query),
    placeholderData: keepPreviousData,
  });

export const useScorecard = (supplierId: number, period: Period) =>
  useQuery({
    queryKey: performanceKeys.scorecard(supplierId, period),
    queryFn: () => api<SupplierScorecardView>(`/suppliers/${supplierId}/scorecard`, { query: period }),
    placeholderData: keepPreviousData,
  });

export const useCapability = (supplierId: number, partId: number | undefined, period: Period) =>
  useQuery({
    queryKey: performanceKeys.capability(supplierId, partId ?? 0, period),
    queryFn: () => api<CapabilityView>(`/suppliers/${supplierId}/capability`, { query: { partId, ...period } }),
    enabled: partId !== undefined,
    placeholderData: keepPreviousData,
  });
