import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { DispositionInput } from '@shared/inspection/lotVerdict';
import type { ListResponse } from '@shared/schemas/paging';
import { api } from '@/lib/api';
import type { FilePreview, LotInspectionView, QueueRow } from '@shared/schemas/inspection';
import type { DeviationRow } from '@shared/schemas/deviations';
import type { InstrumentOption } from './types';

export const inspectionKeys = {
  all: ['inspection'] as const,
  queue: () => [...inspectionKeys.all, 'queue'] as const,
  lot: (id: number) => [...inspectionKeys.all, 'lot', id] as const,
  instruments: () => [...inspectionKeys.all, 'instruments'] as const,
};

export const useInspectionQueue = () => useQuery({ queryKey: inspectionKeys.queue(), queryFn: () => api<ListResponse<QueueRow>>('/inspection/queue') });

export const useLotInspection = (lotId: number) =>
  useQuery({ queryKey: inspectionKeys.lot(lotId), queryFn: () => api<LotInspectionView>(`/inspection/lots/${lotId}`) });

/** The current deviations of a supplier's part: what a use-as-is decision may go under. */
export const useCurrentDeviations = (supplierId: number, partId: number, enabled: boolean) =>
  useQuery({
    queryKey: [...inspectionKeys.all, 'deviations', supplierId, partId] as const,
    queryFn: () => api<ListResponse<DeviationRow>>('/deviations', { query: { supplierId, partId, status: 'current', sort: 'expiresOn', pageSize: 100 } }),
    enabled,
  });

export const useBenchInstruments = () =>
  useQuery({ queryKey: inspectionKeys.instruments(), queryFn: () => api<ListResponse<InstrumentOption>>('/instruments') });

function uploadForm(files: File[], instrumentId?: number) {
  const form = new FormData();
  for (const file of files) form.append('files', file);
  if (instrumentId) form.append('instrumentId', String(instrumentId));
  return form;
}

export const usePreviewMeasurements = (lotId: number) =>
  useMutation({
    mutationFn: ({ files, instrumentId }: { files: File[]; instrumentId?: number }) =>
      api<{ files: FilePreview[] }>(`/inspection/lots/${lotId}/measurements/preview`, { body: uploadForm(files, instrumentId) }),
  });

export function useCommitMeasurements(lotId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ files, instrumentId }: { files: File[]; instrumentId?: number }) =>
      api<{ files: { fileId: number; name: string; sha256: string; pieces: number; rows: number }[] }>(`/inspection/lots/${lotId}/measurements`, { body: uploadForm(files, instrumentId) }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: inspectionKeys.all }),
  });
}

export function useSignDisposition(lotId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: DispositionInput) => api<{ dispositionId: number; documents: { number: string; kind: string }[] }>(`/inspection/lots/${lotId}/dispositions`, { body: input }),
    onSettled: () => queryClient.invalidateQueries({ queryKey: inspectionKeys.all }),
  });
}
