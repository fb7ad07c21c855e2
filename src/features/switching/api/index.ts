import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ResumeInspectionInput, SeverityOverrideInput, SwitchingRow, SwitchingView } from '@shared/schemas/switching';
import type { SwitchingState } from '@shared/sampling';
import type { CarRow } from '@shared/schemas/correctiveActions';
import type { ListResponse } from '@shared/schemas/paging';
import type { ListState } from '@/components/DataTable';
import { api } from '@/lib/api';
import { listPage } from '@/lib/lists';

type Filters = Record<string, string | number | undefined>;

export const switchingKeys = {
  all: ['switching'] as const,
  list: (query: Filters) => [...switchingKeys.all, 'list', query] as const,
  pair: (supplierId: number, partId: number) => [...switchingKeys.all, 'pair', supplierId, partId] as const,
};

export const useSwitchingList = (query: ListState & Filters) =>
  useQuery({ queryKey: switchingKeys.list(query), queryFn: listPage<SwitchingRow>('/switching', query), placeholderData: keepPreviousData });

export const useSwitching = (supplierId: number, partId: number) =>
  useQuery({ queryKey: switchingKeys.pair(supplierId, partId), queryFn: () => api<SwitchingView>(`/switching/${supplierId}/${partId}`) });

/** A signed change of the switching state; afterwards every switching view and lot list is stale. */
function useSignedChange<Input, Answer>(supplierId: number, partId: number, action: 'resume' | 'override') {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: Input) => api<Answer>(`/switching/${supplierId}/${partId}/${action}`, { body: input }),
    // Resuming draws plans for lots that waited: the lot and inspection screens change too.
    onSuccess: () => queryClient.invalidateQueries(),
  });
}

/** The supplier's accepted corrective-action requests for this part: what a resumption may rest on. */
export const useAcceptedRequests = (supplierId: number, partId: number) =>
  useQuery({
    queryKey: [...switchingKeys.pair(supplierId, partId), 'accepted-requests'] as const,
    queryFn: () => api<ListResponse<CarRow>>('/corrective-actions', { query: { supplierId, partId, status: 'accepted', sort: '-requestedAt', pageSize: 50 } }),
  });

export const useResumeInspection = (supplierId: number, partId: number) =>
  useSignedChange<ResumeInspectionInput, { state: SwitchingState; eventId: number; plansDrawnFor: number[] }>(supplierId, partId, 'resume');

export const useOverrideSeverity = (supplierId: number, partId: number) =>
  useSignedChange<SeverityOverrideInput, { state: SwitchingState; eventId: number }>(supplierId, partId, 'override');
