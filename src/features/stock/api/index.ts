import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ListResponse } from '@shared/schemas/paging';
import type { PartView } from '@shared/schemas/purchasing';
import type { PieceHistoryView } from '@shared/schemas/receiving';
import type { IssueInput, LocationView, MoveView, ReleaseInput, StockRow, TransferInput } from '@shared/schemas/stock';
import type { ListState } from '@/components/DataTable';
import { api } from '@/lib/api';
import { listPage } from '@/lib/lists';

type Filters = Record<string, string | number | undefined>;
type Moved = { moved: number; moveIds: number[] };

export const stockKeys = {
  all: ['stock'] as const,
  onHand: (query: Filters) => [...stockKeys.all, 'on-hand', query] as const,
  moves: (query: Filters) => [...stockKeys.all, 'moves', query] as const,
  locations: () => [...stockKeys.all, 'locations'] as const,
  parts: () => [...stockKeys.all, 'parts'] as const,
  piece: (serial: string) => [...stockKeys.all, 'piece', serial] as const,
};

export const useOnHand = (query: ListState & Filters) =>
  useQuery({ queryKey: stockKeys.onHand(query), queryFn: listPage<StockRow>('/stock', query), placeholderData: keepPreviousData });

export const useMoves = (query: ListState & Filters) =>
  useQuery({ queryKey: stockKeys.moves(query), queryFn: listPage<MoveView>('/stock/moves', query), placeholderData: keepPreviousData });

export const useLocations = () =>
  useQuery({ queryKey: stockKeys.locations(), queryFn: () => api<ListResponse<LocationView>>('/stock/locations'), staleTime: 60_000 });

/** Parts to choose from when naming serials (a serial is unique within its part). */
export const useStockParts = () =>
  useQuery({
    queryKey: stockKeys.parts(),
    queryFn: () => api<ListResponse<PartView>>('/parts', { query: { pageSize: 500, sort: 'number' } }),
    staleTime: 60_000,
  });

export const usePieceHistory = (serial: string) =>
  useQuery({
    queryKey: stockKeys.piece(serial),
    queryFn: () => api<ListResponse<PieceHistoryView>>(`/pieces/${encodeURIComponent(serial)}`),
    enabled: serial !== '',
  });

function useMove<Input>(path: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: Input) => api<Moved>(path, { body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: stockKeys.all }),
  });
}

export const useIssue = () => useMove<IssueInput>('/stock/issue');
export const useTransfer = () => useMove<TransferInput>('/stock/transfer');
export const useRelease = () => useMove<ReleaseInput>('/stock/release');
