import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { DispositionInput } from '@shared/inspection/lotVerdict';
import type { ListResponse } from '@shared/schemas/paging';
import { api } from '@/lib/api';
import { listPage } from '@/lib/lists';
import type { LineMessage } from '@shared/optics/types';
import {
  PREVIEW_PAGE_SIZE,
  type LotInspectionView,
  type MeasurementPreview,
  type PreviewList,
  type PreviewPiece,
  type QueueRow,
} from '@shared/schemas/inspection';
import type { DeviationRow } from '@shared/schemas/deviations';
import type { InstrumentOption } from './types';

export const inspectionKeys = {
  all: ['inspection'] as const,
  queue: (query: Record<string, string | number | undefined>) => [...inspectionKeys.all, 'queue', query] as const,
  lot: (id: number) => [...inspectionKeys.all, 'lot', id] as const,
  instruments: () => [...inspectionKeys.all, 'instruments'] as const,
};

export const useInspectionQueue = (query: Record<string, string | number | undefined>) =>
  useQuery({ queryKey: inspectionKeys.queue(query), queryFn: listPage<QueueRow>('/inspection/queue', query), placeholderData: keepPreviousData });

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
      api<MeasurementPreview>(`/inspection/lots/${lotId}/measurements/preview`, { body: uploadForm(files, instrumentId) }),
  });

export type PreviewEntry<L extends PreviewList> = L extends 'pieces' ? PreviewPiece : LineMessage;
export type PreviewPageQuery = { page: number; instrumentId?: number; verdict?: PreviewPiece['verdict'] };

/** A later page of a checked file's pieces, errors or warnings (the first came with the check). */
export const usePreviewPage = <L extends PreviewList>(lotId: number, sha256: string, list: L, query: PreviewPageQuery, enabled: boolean) =>
  useQuery({
    queryKey: [...inspectionKeys.all, 'preview', lotId, sha256, list, query] as const,
    queryFn: () =>
      api<ListResponse<PreviewEntry<L>>>(`/inspection/lots/${lotId}/measurements/preview/${sha256}/${list}`, {
        query: { ...query, pageSize: PREVIEW_PAGE_SIZE },
      }),
    enabled,
    placeholderData: keepPreviousData,
  });

export function useCommitMeasurements(lotId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ files, instrumentId }: { files: File[]; instrumentId?: number }) =>
      api<{ files: { fileId: number; name: string; sha256: string; pieces: number; rows: number }[] }>(`/inspection/lots/${lotId}/measurements`, {
        body: uploadForm(files, instrumentId),
      }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: inspectionKeys.all }),
  });
}

export function useSignDisposition(lotId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: DispositionInput) =>
      api<{ dispositionId: number; documents: { number: string; kind: string }[] }>(`/inspection/lots/${lotId}/dispositions`, { body: input }),
    onSettled: () => queryClient.invalidateQueries({ queryKey: inspectionKeys.all }),
  });
}
