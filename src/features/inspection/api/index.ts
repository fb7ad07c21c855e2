import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { DispositionInput } from '@shared/inspection/lotVerdict';
import type { ListResponse } from '@shared/schemas/paging';
import { api } from '@/lib/api';
import type { FilePreview, LotInspectionView, QueueRow } from '@shared/schemas/inspection';
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
