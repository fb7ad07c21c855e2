import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ListResponse } from '@shared/schemas/paging';
import type { InstrumentInput, InstrumentView } from '@shared/schemas/instruments';
import { api } from '@/lib/api';

export const instrumentKeys = { all: ['instruments'] as const };

export const useInstruments = () => useQuery({ queryKey: instrumentKeys.all, queryFn: () => api<ListResponse<InstrumentView>>('/instruments') });

export function useSaveInstrument() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: InstrumentInput & { id?: number }) =>
      id ? api<InstrumentView>(`/instruments/${id}`, { method: 'PUT', body: input }) : api<InstrumentView>('/instruments', { body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: instrumentKeys.all }),
  });
}
