import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { DeviationRow } from '@shared/schemas/deviations';
import type {
  DefectCodeInput,
  DefectCodeView,
  NcrCloseInput,
  NcrDispositionInput,
  NcrOpenInput,
  NcrRow,
  NcrUpdateInput,
  NcrView,
  ReturnInput,
  ReturnRow,
  ReturnView,
  ReworkReleaseInput,
} from '@shared/schemas/nonconformance';
import type { ListResponse } from '@shared/schemas/paging';
import type { LocationView } from '@shared/schemas/stock';
import type { ListState } from '@/components/DataTable';
import { api } from '@/lib/api';
import { listPage } from '@/lib/lists';

type Filters = Record<string, string | number | undefined>;

export const ncrKeys = {
  all: ['nonconformance'] as const,
  list: (query: Filters) => [...ncrKeys.all, 'list', query] as const,
  one: (id: number) => [...ncrKeys.all, 'one', id] as const,
  returns: (query: Filters) => [...ncrKeys.all, 'returns', query] as const,
  defectCodes: () => [...ncrKeys.all, 'defect-codes'] as const,
  bins: () => [...ncrKeys.all, 'bins'] as const,
  deviations: (supplierId: number, partId: number) => [...ncrKeys.all, 'deviations', supplierId, partId] as const,
  parts: (q: string) => [...ncrKeys.all, 'parts', q] as const,
};

export const useNcrList = (query: ListState & Filters) =>
  useQuery({ queryKey: ncrKeys.list(query), queryFn: listPage<NcrRow>('/nonconformances', query), placeholderData: keepPreviousData });

export const useNcr = (id: number) => useQuery({ queryKey: ncrKeys.one(id), queryFn: () => api<NcrView>(`/nonconformances/${id}`) });

export const useReturnList = (query: ListState & Filters) =>
  useQuery({ queryKey: ncrKeys.returns(query), queryFn: listPage<ReturnRow>('/returns', query), placeholderData: keepPreviousData });

export const useDefectCodes = () =>
  useQuery({ queryKey: ncrKeys.defectCodes(), queryFn: () => api<ListResponse<DefectCodeView>>('/nonconformances/defect-codes'), staleTime: 60_000 });

/** The active stock bins a released piece may go to. */
export const useStockBins = () =>
  useQuery({
    queryKey: ncrKeys.bins(),
    queryFn: async () => (await api<ListResponse<LocationView>>('/stock/locations')).data.filter((l) => l.kind === 'stock' && l.active),
    staleTime: 60_000,
  });

/** Deviations of the register that may cover pieces of this supplier's part today. */
export const useCurrentDeviations = (supplierId: number, partId: number, enabled: boolean) =>
  useQuery({
    queryKey: ncrKeys.deviations(supplierId, partId),
    queryFn: () => api<ListResponse<DeviationRow>>('/deviations', { query: { supplierId, partId, status: 'current', pageSize: 100 } }),
    enabled,
  });

/** Parts whose number or description matches, for opening an NCR by hand. */
export const usePartChoices = (q: string) =>
  useQuery({
    queryKey: ncrKeys.parts(q),
    queryFn: () => api<ListResponse<{ id: number; number: string; description: string }>>('/parts', { query: { q, pageSize: 20, sort: 'number' } }),
    placeholderData: keepPreviousData,
  });

/** A change of NCRs: every NCR view and list, and the stock, lot and PO screens the moves touch, are stale after it. */
function useNcrChange<Input, Answer>(send: (input: Input) => Promise<Answer>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: send, onSuccess: () => queryClient.invalidateQueries() });
}

export const useOpenNcr = () => useNcrChange((input: NcrOpenInput) => api<NcrView>('/nonconformances', { body: input }));
export const useUpdateNcr = (id: number) => useNcrChange((input: NcrUpdateInput) => api<NcrView>(`/nonconformances/${id}`, { method: 'PUT', body: input }));
export const useSignNcrDisposition = (id: number) =>
  useNcrChange((input: NcrDispositionInput) => api<NcrView>(`/nonconformances/${id}/dispositions`, { body: input }));
export const useReleaseRework = (id: number) =>
  useNcrChange((input: ReworkReleaseInput) => api<NcrView>(`/nonconformances/${id}/rework-release`, { body: input }));
export const useCloseNcr = (id: number) => useNcrChange((input: NcrCloseInput) => api<NcrView>(`/nonconformances/${id}/close`, { body: input }));
export const useShipReturn = () => useNcrChange((input: ReturnInput) => api<ReturnView>('/returns', { body: input }));
export const useSaveDefectCode = () =>
  useNcrChange(({ id, ...input }: DefectCodeInput & { id?: number }) =>
    api<DefectCodeView>(id ? `/nonconformances/defect-codes/${id}` : '/nonconformances/defect-codes', { method: id ? 'PUT' : 'POST', body: input }),
  );
