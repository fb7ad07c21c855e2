import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ListResponse } from '@shared/schemas/paging';
import type { InstrumentDetailView, InstrumentFileView, InstrumentInput, InstrumentUpdate, InstrumentView } from '@shared/schemas/instruments';
import { api, apiUrl } from '@/lib/api';
import { listPage } from '@/lib/lists';

type FilesQuery = { page: number; pageSize: number; sort?: string };

export const instrumentKeys = {
  all: ['instruments'] as const,
  one: (id: number) => ['instruments', id] as const,
  files: (id: number, query: FilesQuery) => ['instruments', id, 'files', query] as const,
};

export const useInstruments = () => useQuery({ queryKey: instrumentKeys.all, queryFn: () => api<ListResponse<InstrumentView>>('/instruments') });

export const useInstrument = (id: number) => useQuery({ queryKey: instrumentKeys.one(id), queryFn: () => api<InstrumentDetailView>(`/instruments/${id}`) });

export const useInstrumentFiles = (id: number, query: FilesQuery) =>
  useQuery({
    queryKey: instrumentKeys.files(id, query),
    queryFn: listPage<InstrumentFileView>(`/instruments/${id}/files`, query),
    placeholderData: keepPreviousData,
  });

export function useSaveInstrument() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: (InstrumentInput | InstrumentUpdate) & { id?: number }) =>
      id ? api<InstrumentView>(`/instruments/${id}`, { method: 'PUT', body: input }) : api<InstrumentView>('/instruments', { body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: instrumentKeys.all }),
  });
}

/** Records a calibration (form fields and the certificate PDF, as multipart). */
export function useRecordCalibration(instrumentId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (form: FormData) => api<InstrumentDetailView>(`/instruments/${instrumentId}/calibrations`, { body: form }),
    onSuccess: (detail) => {
      queryClient.setQueryData(instrumentKeys.one(instrumentId), detail);
      return queryClient.invalidateQueries({ queryKey: instrumentKeys.all, exact: true });
    },
  });
}

/** Attaches the certificate PDF to a record that has none. */
export function useAttachCertificate(instrumentId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ calibrationId, file }: { calibrationId: number; file: File }) => {
      const form = new FormData();
      form.append('certificate', file);
      return api<InstrumentDetailView>(`/instruments/${instrumentId}/calibrations/${calibrationId}/certificate`, { body: form });
    },
    onSuccess: (detail) => queryClient.setQueryData(instrumentKeys.one(instrumentId), detail),
  });
}

export const certificateUrl = (instrumentId: number, calibrationId: number) => apiUrl(`/instruments/${instrumentId}/calibrations/${calibrationId}/certificate`);
