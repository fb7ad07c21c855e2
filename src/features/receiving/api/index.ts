import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { NcrRow } from '@shared/schemas/nonconformance';
import type { ListResponse } from '@shared/schemas/paging';
import type { OpenLineView } from '@shared/schemas/purchasing';
import type { LotRow, LotView, ShipmentRow } from '@shared/schemas/receiving';
import type { ListState } from '@/components/DataTable';
import { api } from '@/lib/api';
import { listPage } from '@/lib/lists';

type Filters = Record<string, string | number | undefined>;
export type Receipt = { shipmentId: number; lotId: number; quantity: number; state: string };

export const receivingKeys = {
  all: ['receiving'] as const,
  shipments: (query: Filters) => [...receivingKeys.all, 'shipments', query] as const,
  openLines: () => [...receivingKeys.all, 'open-lines'] as const,
  lots: (query: Filters) => [...receivingKeys.all, 'lots', query] as const,
  lot: (id: number) => [...receivingKeys.all, 'lot', id] as const,
  replacementFor: () => [...receivingKeys.all, 'replacement-for'] as const,
};

export const useShipments = (query: ListState & Filters) =>
  useQuery({
    queryKey: receivingKeys.shipments(query),
    queryFn: listPage<ShipmentRow & { lotIds: number[] }>('/shipments', query),
    placeholderData: keepPreviousData,
  });

export const useLots = (query: ListState & Filters) =>
  useQuery({ queryKey: receivingKeys.lots(query), queryFn: listPage<LotRow>('/lots', query), placeholderData: keepPreviousData });

export const useLot = (id: number) => useQuery({ queryKey: receivingKeys.lot(id), queryFn: () => api<LotView>(`/lots/${id}`) });

/** NCRs still owed replacement pieces, which a shipment may be received against. */
export const useReplacementCandidates = () =>
  useQuery({
    queryKey: receivingKeys.replacementFor(),
    queryFn: () => api<ListResponse<NcrRow>>('/nonconformances', { query: { awaitingReplacement: true, pageSize: 500, sort: '-openedAt' } }),
  });

export const useOpenLines = () =>
  useQuery({ queryKey: receivingKeys.openLines(), queryFn: () => api<ListResponse<OpenLineView>>('/purchase-orders/open-lines') });

export function useReceiveShipment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (form: FormData) => api<Receipt>('/shipments', { body: form }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: receivingKeys.all }),
  });
}
