import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CarCloseInput, CarRaiseInput, CarReviewInput, CarRow, CarView, SupplierRequestView } from '@shared/schemas/correctiveActions';
import type { DeviationApprovalInput, DeviationInput, DeviationRow, DeviationView } from '@shared/schemas/deviations';
import type { ListResponse } from '@shared/schemas/paging';
import type { ListState } from '@/components/DataTable';
import { api } from '@/lib/api';
import { listPage } from '@/lib/lists';

type Filters = Record<string, string | number | undefined>;

export const supplierQualityKeys = {
  all: ['supplier-quality'] as const,
  deviations: (query: Filters) => [...supplierQualityKeys.all, 'deviations', query] as const,
  deviation: (id: number) => [...supplierQualityKeys.all, 'deviation', id] as const,
  requests: (query: Filters) => [...supplierQualityKeys.all, 'requests', query] as const,
  request: (id: number) => [...supplierQualityKeys.all, 'request', id] as const,
  options: (what: string, query: Filters) => [...supplierQualityKeys.all, 'options', what, query] as const,
  response: (token: string) => ['supplier-response', token] as const,
};

/** Writes of this area change its lists and records: they are all read again. */
function useChange<Input, Answer>(request: (input: Input) => Promise<Answer>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: request, onSuccess: () => queryClient.invalidateQueries({ queryKey: supplierQualityKeys.all }) });
}

export const useDeviations = (query: ListState & Filters) =>
  useQuery({ queryKey: supplierQualityKeys.deviations(query), queryFn: listPage<DeviationRow>('/deviations', query), placeholderData: keepPreviousData });

export const useDeviation = (id: number) => useQuery({ queryKey: supplierQualityKeys.deviation(id), queryFn: () => api<DeviationView>(`/deviations/${id}`) });

export const useSaveDeviation = (id?: number) =>
  useChange((input: DeviationInput) => api<DeviationView>(id ? `/deviations/${id}` : '/deviations', { method: id ? 'PUT' : 'POST', body: input }));

export const useApproveDeviation = (id: number) =>
  useChange((input: DeviationApprovalInput) => api<DeviationView>(`/deviations/${id}/approvals`, { body: input }));

export const useWithdrawDeviation = (id: number) =>
  useChange((input: { reason: string }) => api<DeviationView>(`/deviations/${id}/withdrawal`, { body: input }));

export type Option = { id: number; name?: string; number?: string; description?: string };

/** Active suppliers or parts to choose from (the first 500 by name or number). */
export const useOptions = (what: 'suppliers' | 'parts') =>
  useQuery({
    queryKey: supplierQualityKeys.options(what, {}),
    queryFn: () => api<ListResponse<Option>>(`/${what}`, { query: { active: 'true', pageSize: 500, sort: what === 'suppliers' ? 'name' : 'number' } }),
    staleTime: 60_000,
  });

export type NcrChoice = {
  id: number;
  number: string;
  status: string;
  supplierId: number;
  supplierName: string;
  partId: number;
  partNumber: string;
  lotId: number | null;
  pieces: number;
  defects: string[];
  openedAt: string;
};

/** NCRs a request may be raised from, newest first, of one supplier's part once one is known. */
export const useNcrChoices = (filter: { supplierId?: number; partId?: number }) =>
  useQuery({
    queryKey: supplierQualityKeys.options('ncrs', filter),
    queryFn: () => api<ListResponse<NcrChoice>>('/nonconformances', { query: { ...filter, pageSize: 200, sort: '-openedAt' } }),
  });

export const useCorrectiveActions = (query: ListState & Filters) =>
  useQuery({ queryKey: supplierQualityKeys.requests(query), queryFn: listPage<CarRow>('/corrective-actions', query), placeholderData: keepPreviousData });

export const useCorrectiveAction = (id: number) =>
  useQuery({ queryKey: supplierQualityKeys.request(id), queryFn: () => api<CarView>(`/corrective-actions/${id}`) });

export const useRaiseCorrectiveAction = () => useChange((input: CarRaiseInput) => api<CarView>('/corrective-actions', { body: input }));

export const useRevokeLink = (id: number) => useChange(() => api<CarView>(`/corrective-actions/${id}/link/revocation`, { method: 'POST' }));

export const useSendNewLink = (id: number) => useChange(() => api<CarView>(`/corrective-actions/${id}/link`, { method: 'POST' }));

export const useReviewResponse = (id: number) => useChange((input: CarReviewInput) => api<CarView>(`/corrective-actions/${id}/review`, { body: input }));

export const useCloseRequest = (id: number) => useChange((input: CarCloseInput) => api<CarView>(`/corrective-actions/${id}/closure`, { body: input }));

// The supplier's side: the link's token travels in a header, never in a URL.
const LINK_HEADER = 'X-Response-Link';

export const useSupplierRequest = (token: string) =>
  useQuery({
    queryKey: supplierQualityKeys.response(token),
    queryFn: () => api<SupplierRequestView>('/corrective-actions/respond', { headers: { [LINK_HEADER]: token } }),
    enabled: token !== '',
    retry: false,
  });

export const useSubmitResponse = (token: string) =>
  useMutation({
    mutationFn: (form: FormData) => api<{ submittedAt: string }>('/corrective-actions/respond', { body: form, headers: { [LINK_HEADER]: token } }),
  });
